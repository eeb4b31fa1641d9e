//! The render layer: pure functions of the model's results into text,
//! JSON, CSV, event lines, HTML and SVG. It never calls the core and never
//! opens a file; the [`crate::commands`] layer writes what it returns.
//!
//! [`summary`] (the replay's text and JSON, with the what-if comparison),
//! [`headline`] (the night's story, first in the summary and the report),
//! [`whatif`] (the comparison table, and the report's what-if part),
//! [`assess`] (the assessment's text, JSON and HTML), [`weigh`] (the weighing's text and JSON), [`verdicts`] (the
//! verdict CSV), [`event_lines`] (the firmware example's event lines),
//! [`report`] (the HTML pages, with the chart pieces both pages share in
//! `night`) drawn with
//! [`html`] and [`svg`], in the
//! colours of [`palette`], on wall-clock axes from [`clock`].

pub mod assess;
pub mod bridge_lines;
pub mod clock;
pub mod decimal;
pub mod event_lines;
pub mod headline;
pub mod html;
mod night;
pub mod palette;
pub mod quantity;
pub mod report;
pub mod summary;
pub mod svg;
pub mod ticks;
pub mod verdicts;
pub mod weigh;
pub mod whatif;
