//! A small SVG writer for the reports: line charts with axes, ticks, labels,
//! horizontal threshold lines and event marks; a band timeline; a polar
//! chart; a heat map with its colour scale.
//!
//! The output is well-formed XML (every element closed, text escaped) so it
//! can sit inline in an HTML page and be checked by an XML parser. No
//! namespace declaration is written: inline SVG in HTML needs none, and the
//! page then holds no address at all. Coordinates are SVG user units
//! (pixels), y down; chart values are mapped linearly.
//!
//! Polar charts follow the compass: 0° (north) up, angles clockwise, so a
//! point at angle θ and radius r sits at `(cx + r·sin θ, cy − r·cos θ)`.

use std::fmt::Write as _;

use crate::render::decimal::push_f64;

pub use super::ticks::ticks_with_step;

/// Escapes text for XML character data and double-quoted attribute values.
#[must_use]
pub fn esc(s: &str) -> String {
    let mut o = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => o.push_str("&amp;"),
            '<' => o.push_str("&lt;"),
            '>' => o.push_str("&gt;"),
            '"' => o.push_str("&quot;"),
            _ => o.push(c),
        }
    }
    o
}

/// A number for an SVG attribute: two decimals, no `-0.00` (the text of
/// `format!("{v:.2}")`, written by [`push_f64`]: a chart writes thousands).
fn n(v: f64) -> String {
    let mut b = Vec::with_capacity(16);
    push_f64(&mut b, v, 2);
    if b == b"-0.00" {
        "0.00".to_owned()
    } else {
        String::from_utf8(b).unwrap_or_default()
    }
}

/// The tick step nearest `range / target` among 1, 2 and 5 times a power of
/// ten ("nice numbers" for axis labels).
#[must_use]
pub fn nice_step(range: f64, target: usize) -> f64 {
    #[allow(clippy::cast_precision_loss)] // small counts
    let raw = range.abs() / target.max(1) as f64;
    if !raw.is_finite() || raw <= 0.0 {
        return 1.0;
    }
    let mag = 10f64.powf(raw.log10().floor());
    let f = raw / mag;
    let nice = if f < 1.5 {
        1.0
    } else if f < 3.0 {
        2.0
    } else if f < 7.0 {
        5.0
    } else {
        10.0
    };
    nice * mag
}

/// "Nice" ticks covering `min..=max`, about `target` of them.
#[must_use]
pub fn ticks(min: f64, max: f64, target: usize) -> Vec<f64> {
    ticks_with_step(min, max, nice_step(max - min, target))
}

/// Steps for elapsed-time axes, seconds: whole seconds, minutes and hours.
const TIME_STEPS_S: [f64; 17] = [
    1.0, 2.0, 5.0, 10.0, 15.0, 30.0, 60.0, 120.0, 300.0, 600.0, 900.0, 1800.0, 3600.0, 7200.0,
    10800.0, 21600.0, 43200.0,
];

/// A step for an elapsed-time axis of `span_s` seconds with about `target`
/// ticks: the smallest of `TIME_STEPS_S` giving at most `target` steps
/// (whole days beyond).
#[must_use]
pub fn time_step_s(span_s: f64, target: usize) -> f64 {
    #[allow(clippy::cast_precision_loss)]
    let t = target.max(1) as f64;
    TIME_STEPS_S
        .iter()
        .copied()
        .find(|s| span_s / s <= t)
        .unwrap_or_else(|| (span_s / t / 86400.0).ceil().max(1.0) * 86400.0)
}

/// An elapsed time as `h:mm` (or `m:ss` when `step_s` is under a minute).
#[must_use]
pub fn time_label(t_s: f64, step_s: f64) -> String {
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let s = t_s.max(0.0).round() as u64;
    if step_s < 60.0 {
        format!("{}:{:02}", s / 60, s % 60)
    } else {
        format!("{}:{:02}", s / 3600, (s / 60) % 60)
    }
}

/// A label for a tick value at a given step.
#[must_use]
pub fn value_label(v: f64, step: f64) -> String {
    let digits = if step >= 1.0 {
        0
    } else {
        #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
        let d = (-step.log10()).ceil().max(0.0) as usize;
        d.min(6)
    };
    let s = format!("{v:.digits$}");
    if s.starts_with('-') && s.trim_start_matches(['-', '0', '.']).is_empty() {
        s.trim_start_matches('-').to_owned()
    } else {
        s
    }
}

/// A linear map from data values to pixels.
#[derive(Clone, Copy, Debug)]
pub struct Scale {
    /// Data value at the first pixel.
    pub d0: f64,
    /// Data value at the second pixel.
    pub d1: f64,
    /// First pixel.
    pub p0: f64,
    /// Second pixel.
    pub p1: f64,
}

impl Scale {
    /// The pixel of data value `v`.
    #[must_use]
    pub fn at(&self, v: f64) -> f64 {
        let span = self.d1 - self.d0;
        if span.abs() < f64::EPSILON {
            return self.p0;
        }
        self.p0 + (v - self.d0) / span * (self.p1 - self.p0)
    }
}

/// The stroke pattern of a chart line: with the colour it tells lines
/// apart (a what-if page gives each rig its own colour and pattern, so the
/// rigs stay apart in grey print and for colour-blind readers too).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Stroke {
    /// A solid line.
    Solid,
    /// Long dashes.
    Dashed,
    /// Dots.
    Dotted,
    /// Dash and dot.
    DashDot,
}

impl Stroke {
    /// The patterns in the order the rigs of a what-if page take them.
    pub const ALL: [Stroke; 4] = [
        Stroke::Solid,
        Stroke::Dashed,
        Stroke::Dotted,
        Stroke::DashDot,
    ];

    /// The SVG `stroke-dasharray` of the pattern (`None`: solid), pixels.
    #[must_use]
    pub fn dasharray(self) -> Option<&'static str> {
        match self {
            Stroke::Solid => None,
            Stroke::Dashed => Some("6 3"),
            Stroke::Dotted => Some("1.5 3"),
            Stroke::DashDot => Some("8 3 1.5 3"),
        }
    }

    /// The ` stroke-dasharray="…"` attribute (empty for solid).
    fn attr(self) -> String {
        self.dasharray()
            .map_or_else(String::new, |d| format!(r#" stroke-dasharray="{d}""#))
    }
}

/// One line of a line chart.
#[derive(Clone, Debug)]
pub struct Line {
    /// Legend name.
    pub name: String,
    /// Stroke colour (CSS colour).
    pub colour: String,
    /// `(x, y)` points; `None` breaks the line.
    pub points: Vec<(f64, Option<f64>)>,
    /// Stroke pattern.
    pub stroke: Stroke,
    /// Draw dots only (for directions, which wrap at 360°).
    pub dots: bool,
}

/// A horizontal threshold line across the plot.
#[derive(Clone, Debug)]
pub struct HLine {
    /// Its y value.
    pub value: f64,
    /// Its label, written at the right end.
    pub label: String,
    /// Stroke colour.
    pub colour: String,
}

/// A vertical event mark at an x value, labelled with its number in a
/// strip above the plot (the page lists the numbers in a table).
#[derive(Clone, Debug)]
pub struct Mark {
    /// Its x value.
    pub x: f64,
    /// Its number in the page's event table (1 = first).
    pub number: usize,
    /// What happened (the line's tooltip).
    pub label: String,
    /// Stroke colour.
    pub colour: String,
}

/// A shaded interval across the plot (for example a gap in the data).
#[derive(Clone, Debug)]
pub struct Band {
    /// Start, x units.
    pub x0: f64,
    /// End, x units.
    pub x1: f64,
    /// What it is (the band's tooltip).
    pub label: String,
}

/// Estimated width of a character of the charts' 10–11 px labels, pixels
/// (generous for the common sans-serif fonts, so that estimated boxes are
/// never narrower than drawn ones).
pub const CHAR_W_PX: f64 = 6.8;

/// Numbered labels for event marks at pixel positions `px` (sorted): marks
/// too close to the previous label join it (`3–5`), so labels never
/// overlap. Returns `(first pixel, first index, last index)` per label.
#[must_use]
pub fn mark_clusters(px: &[f64], numbers: &[usize]) -> Vec<(f64, usize, usize)> {
    let mut out: Vec<(f64, usize, usize)> = Vec::new();
    let text_w = |a: usize, b: usize| {
        let t = mark_text(numbers.get(a).copied(), numbers.get(b).copied());
        #[allow(clippy::cast_precision_loss)]
        let w = t.chars().count() as f64 * CHAR_W_PX;
        w
    };
    for (k, &x) in px.iter().enumerate() {
        match out.last_mut() {
            Some((x0, a, b)) if x < *x0 + 2.0 + text_w(*a, *b) + 6.0 => *b = k,
            _ => out.push((x, k, k)),
        }
    }
    out
}

/// The text of a mark label: `3`, or `3–5` for a run.
#[must_use]
pub fn mark_text(first: Option<usize>, last: Option<usize>) -> String {
    match (first, last) {
        (Some(a), Some(b)) if a != b => format!("{a}–{b}"),
        (Some(a), _) => a.to_string(),
        _ => String::new(),
    }
}

/// Places legend entries (a 14 px key and the name) left to right from
/// `left`, wrapping before `right`: `(x, row)` per entry.
#[must_use]
pub fn legend_layout<'a>(
    names: impl Iterator<Item = &'a str>,
    left: f64,
    right: f64,
) -> Vec<(f64, usize)> {
    let mut out = Vec::new();
    let (mut x, mut row) = (left, 0_usize);
    for name in names {
        #[allow(clippy::cast_precision_loss)]
        let w = 18.0 + name.chars().count() as f64 * CHAR_W_PX + 16.0;
        if x > left && x + w > right {
            x = left;
            row += 1;
        }
        out.push((x, row));
        x += w;
    }
    out
}

/// A line chart over elapsed time (or any x).
#[derive(Clone, Debug)]
pub struct LineChart {
    /// Title above the plot.
    pub title: String,
    /// Label of the x axis.
    pub x_label: String,
    /// Label of the y axis.
    pub y_label: String,
    /// The x axis is elapsed seconds, labelled `h:mm`, or local wall
    /// time when `clock` is set.
    pub x_time: bool,
    /// Wall clock for a time axis (`None`: time since the first record).
    pub clock: Option<super::clock::Clock>,
    /// X range.
    pub x_range: (f64, f64),
    /// Y range; `None` fits the data (from 0 when all data are ≥ 0).
    pub y_range: Option<(f64, f64)>,
    /// Fixed y tick step; `None` picks a nice one.
    pub y_step: Option<f64>,
    /// The lines.
    pub lines: Vec<Line>,
    /// Horizontal threshold lines.
    pub hlines: Vec<HLine>,
    /// Vertical event marks.
    pub marks: Vec<Mark>,
    /// Shaded intervals behind the lines.
    pub bands: Vec<Band>,
    /// Width, pixels.
    pub width: f64,
    /// Height, pixels.
    pub height: f64,
}

/// The geometry of a line chart's plot: size and margins (px), data
/// ranges, and the scales from data to pixels.
#[derive(Clone, Copy, Debug)]
struct Frame {
    w: f64,
    h: f64,
    ml: f64,
    mr: f64,
    mt: f64,
    mb: f64,
    x0: f64,
    x1: f64,
    y0: f64,
    y1: f64,
    xs: Scale,
    ys: Scale,
}

impl LineChart {
    /// An empty chart 900 × 260 px.
    #[must_use]
    pub fn new(title: &str, x_label: &str, y_label: &str) -> LineChart {
        LineChart {
            title: title.to_owned(),
            x_label: x_label.to_owned(),
            y_label: y_label.to_owned(),
            x_time: true,
            clock: None,
            x_range: (0.0, 1.0),
            y_range: None,
            y_step: None,
            lines: Vec::new(),
            hlines: Vec::new(),
            marks: Vec::new(),
            bands: Vec::new(),
            width: 900.0,
            height: 260.0,
        }
    }

    fn y_extent(&self) -> (f64, f64) {
        if let Some(r) = self.y_range {
            return r;
        }
        let vals = self
            .lines
            .iter()
            .flat_map(|l| l.points.iter().filter_map(|p| p.1))
            .chain(self.hlines.iter().map(|h| h.value))
            .filter(|v| v.is_finite());
        let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
        for v in vals {
            lo = lo.min(v);
            hi = hi.max(v);
        }
        if !lo.is_finite() {
            return (0.0, 1.0);
        }
        if lo >= 0.0 {
            lo = 0.0;
        }
        if hi - lo < 1e-9 {
            hi = lo + 1.0;
        }
        let step = nice_step(hi - lo, 5);
        ((lo / step).floor() * step, (hi / step).ceil() * step)
    }

    /// The chart as an `<svg>` element.
    #[must_use]
    pub fn to_svg(&self) -> String {
        let (w, h) = (self.width, self.height);
        let (ml, mr, mb) = (64.0, 96.0, 44.0);
        // Legend rows under the title, then a strip for the event numbers.
        let legend = legend_layout(
            self.lines.iter().map(|l| l.name.as_str()),
            ml,
            w - mr + 60.0,
        );
        let legend_rows = legend.iter().map(|p| p.1).max().map_or(0, |r| r + 1);
        #[allow(clippy::cast_precision_loss)]
        let mt = 30.0 + legend_rows as f64 * 16.0 + if self.marks.is_empty() { 4.0 } else { 18.0 };
        let h = h + mt - 34.0;
        let (x0, x1) = self.x_range;
        let x1 = if x1 - x0 < 1e-9 { x0 + 1.0 } else { x1 };
        let (y0, y1) = self.y_extent();
        let xs = Scale {
            d0: x0,
            d1: x1,
            p0: ml,
            p1: w - mr,
        };
        let ys = Scale {
            d0: y0,
            d1: y1,
            p0: h - mb,
            p1: mt,
        };
        let f = Frame {
            w,
            h,
            ml,
            mr,
            mt,
            mb,
            x0,
            x1,
            y0,
            y1,
            xs,
            ys,
        };
        let mut s = String::new();
        let _ = write!(
            s,
            r#"<svg class="chart line-chart" width="{}" height="{}" viewBox="0 0 {} {}" role="img" aria-label="{}">"#,
            n(w),
            n(h),
            n(w),
            n(h),
            esc(&self.title)
        );
        let _ = write!(
            s,
            r#"<text class="chart-title" x="{}" y="20">{}</text>"#,
            n(ml),
            esc(&self.title)
        );
        // Plot frame.
        let _ = write!(
            s,
            r#"<rect class="plot-area" x="{}" y="{}" width="{}" height="{}"/>"#,
            n(ml),
            n(mt),
            n(w - ml - mr),
            n(h - mt - mb)
        );
        self.bands_svg(&mut s, &f);
        self.axes_svg(&mut s, &f);
        self.marks_svg(&mut s, &f);
        self.hlines_svg(&mut s, &f);
        self.lines_svg(&mut s, &f);
        self.legend_svg(&mut s, &legend);
        s.push_str("</svg>");
        s
    }

    /// Shaded bands, behind everything else in the plot.
    fn bands_svg(&self, s: &mut String, f: &Frame) {
        let Frame {
            h,
            mt,
            mb,
            x0,
            x1,
            xs,
            ..
        } = *f;
        for b in &self.bands {
            let a = xs.at(b.x0.max(x0));
            let e = xs.at(b.x1.min(x1));
            if e <= a {
                continue;
            }
            let _ = write!(
                *s,
                r#"<rect class="gap-band" x="{}" y="{}" width="{}" height="{}"><title>{}</title></rect>"#,
                n(a),
                n(mt),
                n((e - a).max(1.5)),
                n(h - mt - mb),
                esc(&b.label)
            );
        }
    }

    /// The y ticks and grid, the x ticks, the axes and their labels.
    fn axes_svg(&self, s: &mut String, f: &Frame) {
        let Frame {
            w,
            h,
            ml,
            mr,
            mt,
            mb,
            x0,
            x1,
            y0,
            y1,
            xs,
            ys,
            ..
        } = *f;
        // Y ticks and grid.
        let y_step = self.y_step.unwrap_or_else(|| nice_step(y1 - y0, 5));
        for t in ticks_with_step(y0, y1, y_step) {
            let py = ys.at(t);
            let _ = write!(
                *s,
                r#"<line class="grid" x1="{}" y1="{}" x2="{}" y2="{}"/><text class="tick-label" x="{}" y="{}" text-anchor="end">{}</text>"#,
                n(ml),
                n(py),
                n(w - mr),
                n(py),
                n(ml - 6.0),
                n(py + 4.0),
                esc(&value_label(t, y_step))
            );
        }
        // X ticks.
        let clock = self.clock.filter(|_| self.x_time);
        let (x_step, label_of): (f64, Box<dyn Fn(f64, f64) -> String>) = match clock {
            Some(c) => (
                time_step_s(x1 - x0, 8),
                Box::new(move |t, st| c.label(t, st)),
            ),
            None if self.x_time => (time_step_s(x1 - x0, 8), Box::new(time_label)),
            None => (nice_step(x1 - x0, 8), Box::new(value_label)),
        };
        let x_ticks = match clock {
            Some(c) => c.ticks(x0, x1, x_step),
            None => ticks_with_step(x0, x1, x_step),
        };
        for t in x_ticks {
            let px = xs.at(t);
            let _ = write!(
                *s,
                r#"<line class="tick" x1="{}" y1="{}" x2="{}" y2="{}"/><text class="tick-label" x="{}" y="{}" text-anchor="middle">{}</text>"#,
                n(px),
                n(h - mb),
                n(px),
                n(h - mb + 5.0),
                n(px),
                n(h - mb + 18.0),
                esc(&label_of(t, x_step))
            );
        }
        // Axes and their labels.
        let _ = write!(
            *s,
            r#"<line class="axis" x1="{}" y1="{}" x2="{}" y2="{}"/><line class="axis" x1="{}" y1="{}" x2="{}" y2="{}"/>"#,
            n(ml),
            n(h - mb),
            n(w - mr),
            n(h - mb),
            n(ml),
            n(mt),
            n(ml),
            n(h - mb)
        );
        let _ = write!(
            *s,
            r#"<text class="axis-label" x="{}" y="{}" text-anchor="middle">{}</text>"#,
            n((ml + w - mr) / 2.0),
            n(h - 8.0),
            esc(&self.x_label)
        );
        let _ = write!(
            *s,
            r#"<text class="axis-label" x="14" y="{}" text-anchor="middle" transform="rotate(-90 14 {})">{}</text>"#,
            n((mt + h - mb) / 2.0),
            n((mt + h - mb) / 2.0),
            esc(&self.y_label)
        );
    }

    /// The event marks: a line across the plot, and its number in the
    /// strip above the plot (marks too close together share one label).
    fn marks_svg(&self, s: &mut String, f: &Frame) {
        let Frame {
            h,
            mt,
            mb,
            x0,
            x1,
            xs,
            ..
        } = *f;
        let shown: Vec<&Mark> = self
            .marks
            .iter()
            .filter(|m| m.x >= x0 && m.x <= x1)
            .collect();
        for m in &shown {
            let px = xs.at(m.x);
            let _ = write!(
                *s,
                r#"<line class="event-mark" data-event="{}" x1="{}" y1="{}" x2="{}" y2="{}" stroke="{}"><title>{}: {}</title></line>"#,
                m.number,
                n(px),
                n(mt),
                n(px),
                n(h - mb),
                esc(&m.colour),
                m.number,
                esc(&m.label)
            );
        }
        let px: Vec<f64> = shown.iter().map(|m| xs.at(m.x)).collect();
        let numbers: Vec<usize> = shown.iter().map(|m| m.number).collect();
        for (x, a, b) in mark_clusters(&px, &numbers) {
            let events: Vec<String> = numbers
                .get(a..=b)
                .unwrap_or(&[])
                .iter()
                .map(ToString::to_string)
                .collect();
            // The number in ink (pale level colours would not read); the line
            // carries the level colour.
            let _ = write!(
                *s,
                r#"<text class="mark-label" data-events="{}" x="{}" y="{}" fill="{}">{}</text>"#,
                events.join(" "),
                n(x + 2.0),
                n(mt - 5.0),
                super::palette::INK,
                esc(&mark_text(numbers.get(a).copied(), numbers.get(b).copied()))
            );
        }
    }

    /// The threshold lines.
    fn hlines_svg(&self, s: &mut String, f: &Frame) {
        let Frame {
            w,
            ml,
            mr,
            y0,
            y1,
            ys,
            ..
        } = *f;
        // Threshold lines.
        let mut last_label_y = f64::NEG_INFINITY;
        let mut hl: Vec<&HLine> = self
            .hlines
            .iter()
            .filter(|t| t.value >= y0 && t.value <= y1)
            .collect();
        hl.sort_by(|a, b| b.value.total_cmp(&a.value));
        for t in hl {
            let py = ys.at(t.value);
            // Labels one line apart at least, top to bottom.
            let ly = (py + 4.0).max(last_label_y + 13.0);
            last_label_y = ly;
            let _ = write!(
                *s,
                r#"<line class="threshold" data-value="{}" x1="{}" y1="{}" x2="{}" y2="{}" stroke="{}"/><text class="threshold-label" x="{}" y="{}" fill="{}">{}</text>"#,
                t.value,
                n(ml),
                n(py),
                n(w - mr),
                n(py),
                esc(&t.colour),
                n(w - mr + 4.0),
                n(ly),
                esc(&t.colour),
                esc(&t.label)
            );
        }
    }

    /// The data lines (paths, or dots).
    fn lines_svg(&self, s: &mut String, f: &Frame) {
        let Frame { y0, y1, xs, ys, .. } = *f;
        // Lines.
        for l in &self.lines {
            let clamp = |v: f64| ys.at(v.clamp(y0, y1));
            if l.dots {
                let _ = write!(
                    *s,
                    r#"<g class="series dots" fill="{}"><title>{}</title>"#,
                    esc(&l.colour),
                    esc(&l.name)
                );
                for &(x, y) in &l.points {
                    if let Some(y) = y.filter(|v| v.is_finite()) {
                        let _ = write!(
                            *s,
                            r#"<circle cx="{}" cy="{}" r="1.6"/>"#,
                            n(xs.at(x)),
                            n(clamp(y))
                        );
                    }
                }
                s.push_str("</g>");
                continue;
            }
            let mut d = String::new();
            let mut pen_down = false;
            for &(x, y) in &l.points {
                match y.filter(|v| v.is_finite()) {
                    Some(y) => {
                        let _ = write!(
                            d,
                            "{}{} {} ",
                            if pen_down { "L" } else { "M" },
                            n(xs.at(x)),
                            n(clamp(y))
                        );
                        pen_down = true;
                    }
                    None => pen_down = false,
                }
            }
            let _ = write!(
                *s,
                r#"<path class="series" d="{}" stroke="{}" fill="none"{}><title>{}</title></path>"#,
                d.trim_end(),
                esc(&l.colour),
                l.stroke.attr(),
                esc(&l.name)
            );
        }
    }

    /// The legend, in rows under the title (placed by [`legend_layout`]).
    fn legend_svg(&self, s: &mut String, legend: &[(f64, usize)]) {
        for (l, &(lx, row)) in self.lines.iter().zip(legend) {
            #[allow(clippy::cast_precision_loss)]
            let ly = 40.0 + row as f64 * 16.0;
            // The key is a short stretch of the line itself, in its colour
            // and pattern (dots for a dot series).
            let key = if l.dots {
                format!(
                    r#"<circle class="legend-key" cx="{}" cy="{}" r="2.5" fill="{}"/>"#,
                    n(lx + 7.0),
                    n(ly - 4.0),
                    esc(&l.colour)
                )
            } else {
                format!(
                    r#"<line class="legend-key" x1="{}" y1="{}" x2="{}" y2="{}" stroke="{}" stroke-width="2.5"{}/>"#,
                    n(lx),
                    n(ly - 4.0),
                    n(lx + 14.0),
                    n(ly - 4.0),
                    esc(&l.colour),
                    l.stroke.attr()
                )
            };
            let _ = write!(
                *s,
                r#"{key}<text class="legend" x="{}" y="{}">{}</text>"#,
                n(lx + 18.0),
                n(ly),
                esc(&l.name)
            );
        }
    }
}

/// A span of a band timeline: `[t0, t1)` in category `cat`.
#[derive(Clone, Copy, Debug)]
pub struct Span {
    /// Start.
    pub t0: f64,
    /// End.
    pub t1: f64,
    /// Index into the timeline's categories.
    pub cat: usize,
}

/// A band timeline (one row of coloured spans) over elapsed time, with a
/// legend of its categories `(name, colour)`; the axis shows wall time
/// when `clock` is given, else time since the first record, and is
/// labelled `x_label`.
#[must_use]
pub fn timeline(
    title: &str,
    x_range: (f64, f64),
    spans: &[Span],
    categories: &[(&str, &str)],
    clock: Option<&super::clock::Clock>,
    x_label: &str,
) -> String {
    timeline_rows(title, x_range, &[("", spans)], categories, clock, x_label)
}

/// A band timeline with one row per `(row label, spans)` (the label is
/// written left of its row; a what-if page has a row per rig), one time
/// axis under the last row, and the legend of the categories above the
/// first.
#[must_use]
pub fn timeline_rows(
    title: &str,
    x_range: (f64, f64),
    rows: &[(&str, &[Span])],
    categories: &[(&str, &str)],
    clock: Option<&super::clock::Clock>,
    x_label: &str,
) -> String {
    let (w, ml, mr) = (900.0, 64.0, 96.0);
    let (x0, x1) = x_range;
    let x1 = if x1 - x0 < 1e-9 { x0 + 1.0 } else { x1 };
    let xs = Scale {
        d0: x0,
        d1: x1,
        p0: ml,
        p1: w - mr,
    };
    let (by, bh, gap) = (30.0, 28.0, 6.0);
    #[allow(clippy::cast_precision_loss)] // a few rows
    let n_rows = rows.len().max(1) as f64;
    let bottom = by + n_rows * bh + (n_rows - 1.0) * gap;
    let h = bottom + 52.0;
    let mut s = String::new();
    let _ = write!(
        s,
        r#"<svg class="chart timeline" width="{}" height="{}" viewBox="0 0 {} {}" role="img" aria-label="{}"><text class="chart-title" x="{}" y="20">{}</text>"#,
        n(w),
        n(h),
        n(w),
        n(h),
        esc(title),
        n(ml),
        esc(title)
    );
    for (i, (label, spans)) in rows.iter().enumerate() {
        #[allow(clippy::cast_precision_loss)]
        let ry = by + i as f64 * (bh + gap);
        for sp in *spans {
            let Some((name, colour)) = categories.get(sp.cat) else {
                continue;
            };
            let a = xs.at(sp.t0.max(x0));
            let b = xs.at(sp.t1.min(x1));
            let _ = write!(
                s,
                r#"<rect class="band" x="{}" y="{}" width="{}" height="{}" fill="{}"><title>{}</title></rect>"#,
                n(a),
                n(ry),
                n((b - a).max(0.5)),
                n(bh),
                esc(colour),
                esc(name)
            );
        }
        if !label.is_empty() {
            let _ = write!(
                s,
                r#"<text class="axis-label" x="{}" y="{}" text-anchor="end">{}</text>"#,
                n(ml - 6.0),
                n(ry + bh / 2.0 + 4.0),
                esc(label)
            );
        }
    }
    let step = time_step_s(x1 - x0, 8);
    let x_ticks = match clock {
        Some(c) => c.ticks(x0, x1, step),
        None => ticks_with_step(x0, x1, step),
    };
    for t in x_ticks {
        let px = xs.at(t);
        let _ = write!(
            s,
            r#"<line class="tick" x1="{}" y1="{}" x2="{}" y2="{}"/><text class="tick-label" x="{}" y="{}" text-anchor="middle">{}</text>"#,
            n(px),
            n(bottom),
            n(px),
            n(bottom + 5.0),
            n(px),
            n(bottom + 18.0),
            esc(&clock.map_or_else(|| time_label(t, step), |c| c.label(t, step)))
        );
    }
    let _ = write!(
        s,
        r#"<text class="axis-label" x="{}" y="{}" text-anchor="middle">{}</text>"#,
        n((ml + w - mr) / 2.0),
        n(bottom + 34.0),
        esc(x_label)
    );
    for (i, (name, colour)) in categories.iter().enumerate() {
        #[allow(clippy::cast_precision_loss)]
        let lx = ml + 260.0 + i as f64 * 100.0;
        let _ = write!(
            s,
            r#"<rect class="legend-key" x="{}" y="10" width="10" height="10" fill="{}"/><text class="legend" x="{}" y="19">{}</text>"#,
            n(lx),
            esc(colour),
            n(lx + 14.0),
            esc(name)
        );
    }
    s.push_str("</svg>");
    s
}

/// One trace of a polar chart: `(direction in degrees, value)`; `None`
/// values are drawn on the outer ring with an open marker.
#[derive(Clone, Debug)]
pub struct PolarTrace {
    /// Legend name.
    pub name: String,
    /// Stroke colour.
    pub colour: String,
    /// Points in direction order.
    pub points: Vec<(f64, Option<f64>)>,
    /// Stroke pattern.
    pub stroke: Stroke,
}

/// A circle of one radius value on a polar chart (e.g. the design gust),
/// drawn dashed in ink and named in the legend, not on the plot.
#[derive(Clone, Debug)]
pub struct PolarRing {
    /// Radius value.
    pub value: f64,
    /// Legend text.
    pub label: String,
}

/// A direction drawn as an arrow from the outer ring to the centre on a
/// polar chart (e.g. the storm direction: the wind blows from there),
/// named in the legend, not on the plot.
#[derive(Clone, Debug)]
pub struct PolarBearing {
    /// Direction, degrees clockwise from north.
    pub deg: f64,
    /// Legend text.
    pub label: String,
}

/// A marked point on a polar chart (e.g. the gust at the closest approach).
#[derive(Clone, Debug)]
pub struct PolarMarker {
    /// Direction, degrees clockwise from north.
    pub deg: f64,
    /// Radius value.
    pub value: f64,
    /// Label.
    pub label: String,
}

/// A polar chart over compass directions.
#[derive(Clone, Debug)]
pub struct PolarChart {
    /// Title.
    pub title: String,
    /// What the radius is (with unit).
    pub r_label: String,
    /// The traces.
    pub traces: Vec<PolarTrace>,
    /// An optional marked point.
    pub marker: Option<PolarMarker>,
    /// Circles of given radius values (named in the legend).
    pub rings: Vec<PolarRing>,
    /// Directions drawn as arrows toward the centre (named in the legend).
    pub bearings: Vec<PolarBearing>,
    /// Size of the square chart, pixels.
    pub size: f64,
}

/// The pixel of compass direction `deg` at radius `r_px` around `(cx, cy)`:
/// north up, clockwise.
#[must_use]
pub fn polar_xy(cx: f64, cy: f64, deg: f64, r_px: f64) -> (f64, f64) {
    let a = deg.to_radians();
    (cx + r_px * a.sin(), cy - r_px * a.cos())
}

/// Where a polar chart is drawn: centre and radius in pixels, the value at
/// the outer ring, the square's size.
#[derive(Clone, Copy)]
struct PolarFrame {
    cx: f64,
    cy: f64,
    r_px: f64,
    r_max: f64,
    step: f64,
    size: f64,
}

impl PolarFrame {
    /// Radius in pixels of value `v` (clamped to the chart).
    fn rs(&self, v: f64) -> f64 {
        v.clamp(0.0, self.r_max) / self.r_max * self.r_px
    }

    /// The point of direction `deg` and value `v`.
    fn at(&self, deg: f64, v: f64) -> (f64, f64) {
        polar_xy(self.cx, self.cy, deg, self.rs(v))
    }
}

impl PolarChart {
    /// The chart as an `<svg>` element.
    #[must_use]
    pub fn to_svg(&self) -> String {
        let f = self.frame();
        let legend_w = self.legend_width();
        let size = f.size;
        let mut s = String::new();
        let _ = write!(
            s,
            r#"<svg class="chart polar-chart" width="{}" height="{}" viewBox="0 0 {} {}" role="img" aria-label="{}"><text class="chart-title" x="8" y="18">{}</text>"#,
            n(size + legend_w),
            n(size + 28.0),
            n(size + legend_w),
            n(size + 28.0),
            esc(&self.title),
            esc(&self.title)
        );
        for t in ticks_with_step(f.step, f.r_max, f.step) {
            // Ring labels along the 15° bearing, clear of the spokes.
            let (lx, ly) = f.at(15.0, t);
            let _ = write!(
                s,
                r#"<circle class="ring" cx="{}" cy="{}" r="{}"/><text class="tick-label" x="{}" y="{}">{}</text>"#,
                n(f.cx),
                n(f.cy),
                n(f.rs(t)),
                n(lx + 2.0),
                n(ly - 2.0),
                esc(&value_label(t, f.step))
            );
        }
        polar_spokes(&mut s, f.cx, f.cy, f.r_px);
        let _ = write!(
            s,
            r#"<text class="axis-label" x="{}" y="{}">radius: {}</text>"#,
            n(size + 4.0),
            n(size + 20.0),
            esc(&self.r_label)
        );
        for (i, t) in self.traces.iter().enumerate() {
            trace_svg(&mut s, &f, i, t);
        }
        let mut row = self.traces.len();
        for ring in &self.rings {
            let _ = write!(
                s,
                r#"<circle class="polar-ring" cx="{}" cy="{}" r="{}"><title>{}</title></circle><line class="legend-key polar-ring" x1="{}" y1="{}" x2="{}" y2="{}"/>"#,
                n(f.cx),
                n(f.cy),
                n(f.rs(ring.value)),
                esc(&ring.label),
                n(size + 2.0),
                n(legend_y(row) - 4.0),
                n(size + 16.0),
                n(legend_y(row) - 4.0)
            );
            legend_text(&mut s, size + 20.0, legend_y(row), &ring.label);
            row += 1;
        }
        for b in &self.bearings {
            bearing_svg(&mut s, &f, row, b);
            row += 1;
        }
        if let Some(m) = &self.marker {
            // The dot on the plot, its words in the legend: no label on the
            // plot can meet a ring, spoke or trace label.
            let (x, y) = f.at(m.deg, m.value);
            let _ = write!(
                s,
                r#"<circle class="polar-marker" cx="{}" cy="{}" r="5"><title>{}</title></circle><circle class="polar-marker legend-key" cx="{}" cy="{}" r="4"/>"#,
                n(x),
                n(y),
                esc(&m.label),
                n(size + 9.0),
                n(legend_y(row) - 4.0)
            );
            legend_text(&mut s, size + 20.0, legend_y(row), &m.label);
        }
        s.push_str("</svg>");
        s
    }

    /// Centre, radius and scale: the outer ring a whole number of steps
    /// at or above the largest finite value (1 at least).
    fn frame(&self) -> PolarFrame {
        let size = self.size;
        let max = self
            .traces
            .iter()
            .flat_map(|t| t.points.iter().filter_map(|p| p.1))
            .chain(self.marker.iter().map(|m| m.value))
            .chain(self.rings.iter().map(|r| r.value))
            .filter(|v| v.is_finite())
            .fold(0.0_f64, f64::max);
        let step = nice_step(max.max(1.0), 4);
        PolarFrame {
            cx: size / 2.0,
            cy: size / 2.0 + 14.0,
            r_px: size / 2.0 - 52.0,
            r_max: ((max.max(1.0) / step).ceil() * step).max(step),
            step,
            size,
        }
    }

    /// The legend's column right of the plot: as wide as its longest entry
    /// (150 px at least).
    fn legend_width(&self) -> f64 {
        #[allow(clippy::cast_precision_loss)] // short labels
        self.traces
            .iter()
            .map(|t| t.name.chars().count())
            .chain(self.rings.iter().map(|r| r.label.chars().count()))
            .chain(self.bearings.iter().map(|b| b.label.chars().count()))
            .chain(self.marker.iter().map(|m| m.label.chars().count()))
            .chain(std::iter::once(self.r_label.chars().count() + 8))
            .map(|c| 28.0 + c as f64 * CHAR_W_PX)
            .fold(150.0_f64, f64::max)
    }
}

/// One trace of a polar chart (a closed polygon; a direction without a
/// value drawn at the rim with an open circle) and its legend row `i`.
fn trace_svg(s: &mut String, f: &PolarFrame, i: usize, t: &PolarTrace) {
    let mut pts = String::new();
    let mut open = String::new();
    for &(deg, v) in &t.points {
        let (x, y) = match v.filter(|v| v.is_finite()) {
            Some(v) => f.at(deg, v),
            None => {
                let (x, y) = polar_xy(f.cx, f.cy, deg, f.r_px);
                let _ = write!(
                    open,
                    r#"<circle class="beyond" cx="{}" cy="{}" r="3" stroke="{}"/>"#,
                    n(x),
                    n(y),
                    esc(&t.colour)
                );
                (x, y)
            }
        };
        let _ = write!(pts, "{},{} ", n(x), n(y));
    }
    let _ = write!(
        s,
        r#"<polygon class="polar-trace" data-points="{}" points="{}" stroke="{}"{}><title>{}</title></polygon>{}"#,
        t.points.len(),
        pts.trim_end(),
        esc(&t.colour),
        t.stroke.attr(),
        esc(&t.name),
        open
    );
    let _ = write!(
        s,
        r#"<line class="legend-key" x1="{}" y1="{}" x2="{}" y2="{}" stroke="{}" stroke-width="2.5"{}/>"#,
        n(f.size + 2.0),
        n(legend_y(i) - 4.0),
        n(f.size + 16.0),
        n(legend_y(i) - 4.0),
        esc(&t.colour),
        t.stroke.attr()
    );
    legend_text(s, f.size + 20.0, legend_y(i), &t.name);
}

/// A direction of a polar chart drawn as an arrow from the rim toward the
/// centre (the wind blows toward it), and its legend row.
fn bearing_svg(s: &mut String, f: &PolarFrame, row: usize, b: &PolarBearing) {
    let (x, y) = polar_xy(f.cx, f.cy, b.deg, f.r_px);
    let (hx, hy) = polar_xy(f.cx, f.cy, b.deg, f.r_px * 0.55);
    // The arrow head at the inner end.
    let (l1x, l1y) = polar_xy(hx, hy, b.deg + 20.0, 10.0);
    let (l2x, l2y) = polar_xy(hx, hy, b.deg - 20.0, 10.0);
    let _ = write!(
        s,
        r#"<g class="polar-bearing"><title>{}</title><line x1="{}" y1="{}" x2="{}" y2="{}"/><polyline points="{},{} {},{} {},{}"/></g><g class="polar-bearing legend-key"><line x1="{}" y1="{}" x2="{}" y2="{}"/></g>"#,
        esc(&b.label),
        n(x),
        n(y),
        n(hx),
        n(hy),
        n(l1x),
        n(l1y),
        n(hx),
        n(hy),
        n(l2x),
        n(l2y),
        n(f.size + 2.0),
        n(legend_y(row) - 4.0),
        n(f.size + 16.0),
        n(legend_y(row) - 4.0)
    );
    legend_text(s, f.size + 20.0, legend_y(row), &b.label);
}

/// The baseline of the polar chart's legend row `i`, pixels.
fn legend_y(i: usize) -> f64 {
    #[allow(clippy::cast_precision_loss)] // a few rows
    let y = 40.0 + i as f64 * 16.0;
    y
}

/// A legend entry's text at (`x`, `y`).
fn legend_text(s: &mut String, x: f64, y: f64, text: &str) {
    let _ = write!(
        *s,
        r#"<text class="legend" x="{}" y="{}">{}</text>"#,
        n(x),
        n(y),
        esc(text)
    );
}

/// The twelve spokes of a polar chart every 30°, labelled with N, E, S, W
/// and degrees, around the centre (`cx`, `cy`) out to `r_px`.
fn polar_spokes(s: &mut String, cx: f64, cy: f64, r_px: f64) {
    for k in 0..12_u32 {
        let deg = f64::from(k) * 30.0;
        let (x, y) = polar_xy(cx, cy, deg, r_px);
        let (lx, ly) = polar_xy(cx, cy, deg, r_px + 16.0);
        let name = match k {
            0 => "N".to_owned(),
            3 => "E".to_owned(),
            6 => "S".to_owned(),
            9 => "W".to_owned(),
            _ => format!("{deg:.0}°"),
        };
        let _ = write!(
            *s,
            r#"<line class="spoke" x1="{}" y1="{}" x2="{}" y2="{}"/><text class="tick-label" x="{}" y="{}" text-anchor="middle">{}</text>"#,
            n(cx),
            n(cy),
            n(x),
            n(y),
            n(lx),
            n(ly + 4.0),
            esc(&name)
        );
    }
}

/// The heat maps' continuous colour scale: `(value, sRGB)` stops, linear
/// between them, from a pale cream at 0 through amber and brick to a deep
/// plum at 1 (100 % of the rating). Lightness falls all the way, so the
/// order reads without colour vision and in grey print.
pub const HEAT_STOPS: [(f64, [u8; 3]); 4] = [
    (0.0, [0xfb, 0xf3, 0xc4]),
    (1.0 / 3.0, [0xee, 0xa9, 0x4e]),
    (2.0 / 3.0, [0xc0, 0x4f, 0x3c]),
    (1.0, [0x52, 0x17, 0x45]),
];

/// Colour of cells over 1 (beyond the rating): near black.
pub const HEAT_OVER: &str = "#161616";

/// Colour of cells without a value.
pub const HEAT_NONE: &str = "#c9ccd1";

/// Colour of a utilisation on the heat maps' continuous scale
/// ([`HEAT_STOPS`]): 0 to 1 interpolated, over 1 [`HEAT_OVER`], `None` or
/// not finite [`HEAT_NONE`].
#[must_use]
pub fn heat_colour(v: Option<f64>) -> String {
    let Some(v) = v.filter(|v| v.is_finite()) else {
        return HEAT_NONE.to_owned();
    };
    if v > 1.0 {
        return HEAT_OVER.to_owned();
    }
    let v = v.max(0.0);
    let mut c = HEAT_STOPS[0].1;
    for w in HEAT_STOPS.windows(2) {
        let ((a, ca), (b, cb)) = (w[0], w[1]);
        if v >= a && v <= b {
            let f = (v - a) / (b - a);
            for (k, slot) in c.iter_mut().enumerate() {
                let x = f64::from(ca[k]) + (f64::from(cb[k]) - f64::from(ca[k])) * f;
                #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
                let x = x.round().clamp(0.0, 255.0) as u8;
                *slot = x;
            }
            break;
        }
    }
    format!("#{:02x}{:02x}{:02x}", c[0], c[1], c[2])
}

/// Whether a cell's value is written in white (on the dark end of the
/// scale) rather than in ink.
#[must_use]
pub fn heat_text_is_white(v: Option<f64>) -> bool {
    v.is_some_and(|v| v.is_finite() && v > 0.55)
}

/// A heat map: rows (`y_labels`, top to bottom) × columns (`x_labels`) of
/// values coloured by [`heat_colour`], each cell with its value in % written
/// in it, and a continuous colour-scale legend (a gradient with tick
/// values).
#[derive(Clone, Debug)]
pub struct HeatMap {
    /// Title.
    pub title: String,
    /// Id of the map's gradient (unique on the page; letters, digits, `-`).
    pub id: String,
    /// Label of the x axis.
    pub x_label: String,
    /// Label of the y axis.
    pub y_label: String,
    /// Column labels.
    pub x_labels: Vec<String>,
    /// Row labels, top row first.
    pub y_labels: Vec<String>,
    /// `values[row][column]`, fractions (1 = 100 %).
    pub values: Vec<Vec<Option<f64>>>,
    /// What a value is (for cell tooltips and the legend).
    pub value_label: String,
}

impl HeatMap {
    /// The map as an `<svg>` element.
    #[must_use]
    pub fn to_svg(&self) -> String {
        let (cw, ch) = (26.0, 18.0);
        let (ml, mt) = (64.0, 34.0);
        #[allow(clippy::cast_precision_loss)]
        let (cols, rows) = (self.x_labels.len() as f64, self.y_labels.len() as f64);
        let w = ml + cols * cw + 150.0;
        let h = (mt + rows * ch + 58.0).max(mt + 250.0);
        let id: String = self
            .id
            .chars()
            .filter(|c| c.is_ascii_alphanumeric() || *c == '-')
            .collect();
        let mut s = String::new();
        let _ = write!(
            s,
            r#"<svg class="chart heat-map" width="{}" height="{}" viewBox="0 0 {} {}" role="img" aria-label="{}"><text class="chart-title" x="{}" y="20">{}</text>"#,
            n(w),
            n(h),
            n(w),
            n(h),
            esc(&self.title),
            n(ml),
            esc(&self.title)
        );
        for (r, row) in self.values.iter().enumerate() {
            for (c, v) in row.iter().enumerate() {
                #[allow(clippy::cast_precision_loss)]
                let (x, y) = (ml + c as f64 * cw, mt + r as f64 * ch);
                let value = v.filter(|v| v.is_finite());
                let tip = format!(
                    "{} {}, {} {}: {}",
                    self.x_label,
                    self.x_labels.get(c).map_or("", String::as_str),
                    self.y_label,
                    self.y_labels.get(r).map_or("", String::as_str),
                    value.map_or_else(|| "n/a".to_owned(), |v| format!("{:.0} %", v * 100.0))
                );
                let _ = write!(
                    s,
                    r#"<rect class="cell" x="{}" y="{}" width="{}" height="{}" fill="{}"><title>{}</title></rect>"#,
                    n(x),
                    n(y),
                    n(cw),
                    n(ch),
                    heat_colour(value),
                    esc(&tip)
                );
                if let Some(v) = value {
                    let _ = write!(
                        s,
                        r#"<text class="cell-value" x="{}" y="{}" text-anchor="middle" fill="{}">{:.0}</text>"#,
                        n(x + cw / 2.0),
                        n(y + ch / 2.0 + 3.5),
                        if heat_text_is_white(value) {
                            "#ffffff"
                        } else {
                            super::palette::INK
                        },
                        v * 100.0
                    );
                }
            }
        }
        for (r, l) in self.y_labels.iter().enumerate() {
            #[allow(clippy::cast_precision_loss)]
            let y = mt + r as f64 * ch + ch / 2.0 + 4.0;
            let _ = write!(
                s,
                r#"<text class="tick-label" x="{}" y="{}" text-anchor="end">{}</text>"#,
                n(ml - 4.0),
                n(y),
                esc(l)
            );
        }
        for (c, l) in self.x_labels.iter().enumerate() {
            if c % 2 == 1 {
                continue;
            }
            #[allow(clippy::cast_precision_loss)]
            let x = ml + c as f64 * cw + cw / 2.0;
            let _ = write!(
                s,
                r#"<text class="tick-label" x="{}" y="{}" text-anchor="middle">{}</text>"#,
                n(x),
                n(mt + rows * ch + 14.0),
                esc(l)
            );
        }
        let _ = write!(
            s,
            r#"<text class="axis-label" x="{}" y="{}" text-anchor="middle">{}</text><text class="axis-label" x="14" y="{}" text-anchor="middle" transform="rotate(-90 14 {})">{}</text>"#,
            n(ml + cols * cw / 2.0),
            n(mt + rows * ch + 32.0),
            esc(&self.x_label),
            n(mt + rows * ch / 2.0),
            n(mt + rows * ch / 2.0),
            esc(&self.y_label)
        );
        self.scale_svg(&mut s, ml + cols * cw + 24.0, mt, &id);
        s.push_str("</svg>");
        s
    }

    /// The continuous colour scale at (`lx`, `top`): a vertical gradient
    /// bar, 100 % at the top, ticks every 25 %, then swatches for over
    /// 100 % and for no value.
    fn scale_svg(&self, s: &mut String, lx: f64, top: f64, id: &str) {
        let bar_h = 160.0;
        let _ = write!(
            *s,
            r#"<defs><linearGradient id="{id}" x1="0" y1="1" x2="0" y2="0">"#
        );
        for (v, c) in HEAT_STOPS {
            let _ = write!(
                *s,
                r##"<stop offset="{}" stop-color="#{:02x}{:02x}{:02x}"/>"##,
                n(v),
                c[0],
                c[1],
                c[2]
            );
        }
        let _ = write!(
            *s,
            r#"</linearGradient></defs><text class="legend" x="{}" y="{}">{} (%)</text><rect class="scale-bar" x="{}" y="{}" width="16" height="{}" fill="url(#{id})"/>"#,
            n(lx),
            n(top + 4.0),
            esc(&self.value_label),
            n(lx),
            n(top + 14.0),
            n(bar_h)
        );
        for k in 0..=4_u32 {
            let v = f64::from(k) * 0.25;
            let y = top + 14.0 + bar_h * (1.0 - v);
            let _ = write!(
                *s,
                r#"<line class="tick" x1="{}" y1="{}" x2="{}" y2="{}"/><text class="legend" x="{}" y="{}">{:.0}</text>"#,
                n(lx + 16.0),
                n(y),
                n(lx + 21.0),
                n(y),
                n(lx + 24.0),
                n(y + 4.0),
                v * 100.0
            );
        }
        let y = top + 14.0 + bar_h + 14.0;
        let _ = write!(
            *s,
            r#"<rect class="scale-key" x="{}" y="{}" width="16" height="14" fill="{HEAT_OVER}"/><text class="legend" x="{}" y="{}">over 100</text><rect class="scale-key" x="{}" y="{}" width="16" height="14" fill="{HEAT_NONE}"/><text class="legend" x="{}" y="{}">no value</text>"#,
            n(lx),
            n(y),
            n(lx + 20.0),
            n(y + 11.0),
            n(lx),
            n(y + 20.0),
            n(lx + 20.0),
            n(y + 31.0)
        );
    }
}
