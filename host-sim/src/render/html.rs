//! A self-contained HTML page: inline CSS, inline SVG, no scripts and no
//! outside resources. The markup is written so that it is also well-formed
//! XML (every element closed, `<meta .../>` self-closed, text escaped), which
//! lets the tests check it with an XML parser.

use std::fmt::Write as _;

use super::svg::esc;

/// The page's style sheet (no `<` or `&` so that it stays XML text).
const CSS: &str = "
body { font-family: sans-serif; margin: 1.5em auto; max-width: 1100px; color: #1d232a; padding: 0 1em; }
h1 { font-size: 1.6em; margin-bottom: 0.2em; }
h2 { font-size: 1.3em; border-bottom: 1px solid #c8ccd2; padding-bottom: 0.2em; margin-top: 1.6em; }
h3 { font-size: 1.1em; margin-top: 1.2em; }
.cautions { border: 3px solid #b5321f; background: #fff3ef; padding: 0.6em 1.2em; margin: 1em 0; }
.cautions h2 { border: none; margin-top: 0.2em; color: #8c2412; }
.cautions li { margin: 0.25em 0; font-weight: bold; }
.note { color: #505862; font-size: 0.92em; }
.headline { border-left: 6px solid #1f4e79; background: #f2f6fa; padding: 0.4em 1.2em; margin: 1em 0; }
.headline h2 { border: none; margin-top: 0.2em; }
.headline li { margin: 0.5em 0; }
.headline .head { font-weight: bold; margin: 0; }
.headline .detail { margin: 0.1em 0 0 1em; }
table { border-collapse: collapse; margin: 0.6em 0; font-size: 0.92em; }
th, td { border: 1px solid #c8ccd2; padding: 0.25em 0.6em; text-align: left; vertical-align: top; }
th { background: #eef1f4; }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
pre { background: #f5f6f8; padding: 0.8em; overflow-x: auto; font-size: 0.85em; }
figure { margin: 1em 0; }
figcaption { color: #505862; font-size: 0.9em; max-width: 900px; }
svg.chart { display: block; background: #ffffff; border: 1px solid #dde1e6; max-width: 100%; height: auto; }
svg .chart-title { font-size: 14px; font-weight: bold; fill: #1d232a; }
svg .plot-area { fill: #fbfcfd; stroke: none; }
svg .grid { stroke: #e3e7eb; stroke-width: 1; }
svg .axis { stroke: #39424c; stroke-width: 1.2; }
svg .tick { stroke: #39424c; stroke-width: 1; }
svg .tick-label { font-size: 11px; fill: #39424c; }
svg .axis-label { font-size: 12px; fill: #1d232a; }
svg .legend { font-size: 11px; fill: #1d232a; }
svg .series { stroke-width: 1.6; }
svg .threshold { stroke-width: 1.2; stroke-dasharray: 7 4; }
svg .threshold-label { font-size: 11px; }
svg .event-mark { stroke-width: 1; stroke-opacity: 0.75; }
svg .mark-label { font-size: 10px; paint-order: stroke; stroke: #ffffff; stroke-width: 3px; stroke-linejoin: round; }
svg .gap-band { fill: #d9dde2; fill-opacity: 0.7; }
svg .ring { fill: none; stroke: #d4d9de; }
svg.polar-chart .tick-label { paint-order: stroke; stroke: #ffffff; stroke-width: 3px; stroke-linejoin: round; }
svg .spoke { stroke: #e3e7eb; }
svg .polar-trace { fill: none; stroke-width: 1.8; stroke-linejoin: round; }
svg .beyond { fill: #ffffff; stroke-width: 1.2; }
svg .polar-ring { fill: none; stroke: #2e2e2e; stroke-width: 1.4; stroke-dasharray: 6 3; }
svg .polar-bearing line, svg .polar-bearing polyline { fill: none; stroke: #2e2e2e; stroke-width: 2; }
svg .polar-marker { fill: #b5321f; stroke: #ffffff; stroke-width: 1.5; }
svg .cell { stroke: #ffffff; stroke-width: 0.5; }
svg .cell-value { font-size: 9px; }
svg .scale-bar { stroke: #8a9099; stroke-width: 0.5; }
svg .scale-key { stroke: #8a9099; stroke-width: 0.5; }
";

/// A page being built.
#[derive(Clone, Debug, Default)]
pub struct Page {
    title: String,
    body: String,
}

impl Page {
    /// A new page with a title (also its first heading).
    #[must_use]
    pub fn new(title: &str) -> Page {
        let mut p = Page {
            title: title.to_owned(),
            body: String::new(),
        };
        let _ = write!(p.body, "<h1>{}</h1>", esc(title));
        p
    }

    /// A section heading.
    pub fn h2(&mut self, text: &str) {
        let _ = write!(self.body, "<h2>{}</h2>", esc(text));
    }

    /// A sub-heading.
    pub fn h3(&mut self, text: &str) {
        let _ = write!(self.body, "<h3>{}</h3>", esc(text));
    }

    /// A paragraph of plain text.
    pub fn p(&mut self, text: &str) {
        let _ = write!(self.body, "<p>{}</p>", esc(text));
    }

    /// A paragraph of smaller explanatory text.
    pub fn note(&mut self, text: &str) {
        let _ = write!(self.body, r#"<p class="note">{}</p>"#, esc(text));
    }

    /// Preformatted text.
    pub fn pre(&mut self, text: &str) {
        let _ = write!(self.body, "<pre>{}</pre>", esc(text));
    }

    /// A figure: an SVG chart (trusted markup from [`super::svg`]) and a
    /// caption.
    pub fn figure(&mut self, svg: &str, caption: &str) {
        let _ = write!(
            self.body,
            "<figure>{svg}<figcaption>{}</figcaption></figure>",
            esc(caption)
        );
    }

    /// A table; cells that parse as numbers are right-aligned.
    pub fn table(&mut self, headers: &[&str], rows: &[Vec<String>]) {
        self.body.push_str("<table><thead><tr>");
        for h in headers {
            let _ = write!(self.body, "<th>{}</th>", esc(h));
        }
        self.body.push_str("</tr></thead><tbody>");
        for r in rows {
            self.body.push_str("<tr>");
            for c in r {
                let numeric = c
                    .split_whitespace()
                    .next()
                    .is_some_and(|w| w.trim_start_matches('+').parse::<f64>().is_ok());
                let _ = write!(
                    self.body,
                    "<td{}>{}</td>",
                    if numeric { r#" class="num""# } else { "" },
                    esc(c)
                );
            }
            self.body.push_str("</tr>");
        }
        self.body.push_str("</tbody></table>");
    }

    /// The headline: a section with a heading and an ordered list of
    /// items, each a head line in bold and its detail lines below.
    pub fn headline(&mut self, heading: &str, items: &[(String, Vec<String>)]) {
        let _ = write!(
            self.body,
            r#"<section class="headline"><h2>{}</h2><ol>"#,
            esc(heading)
        );
        for (head, details) in items {
            let _ = write!(self.body, r#"<li><p class="head">{}</p>"#, esc(head));
            for d in details {
                let _ = write!(self.body, r#"<p class="detail">{}</p>"#, esc(d));
            }
            self.body.push_str("</li>");
        }
        self.body.push_str("</ol></section>");
    }

    /// The cautions, in a box that stands out.
    pub fn cautions(&mut self, cautions: &[&str]) {
        self.body
            .push_str(r#"<section class="cautions"><h2>Cautions</h2><ul>"#);
        for c in cautions {
            let _ = write!(self.body, "<li>{}</li>", esc(c));
        }
        self.body.push_str("</ul></section>");
    }

    /// The finished document.
    #[must_use]
    pub fn finish(&self) -> String {
        format!(
            "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"/><meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/><title>{}</title><style>{CSS}</style></head><body>{}</body></html>\n",
            esc(&self.title),
            self.body
        )
    }
}
