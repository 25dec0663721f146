//! What a run shows, in order: sections of prose, each followed by its outputs.
use super::metric::Metric;
use super::table::Table;

/// One output placed under a section.
#[derive(Clone, Debug, PartialEq)]
pub enum Item {
    /// A `show(label, value)` result line, already formatted.
    Show { label: String, value: String },
    /// Text from `print`.
    Text(String),
    /// A table, cells already formatted.
    Table(Table),
    /// A plot, rendered to SVG text when it was made.
    Figure(Figure),
    /// A named figure of merit with its optional spec.
    Metric(Metric),
}

/// A rendered plot and the file it goes to, beside `report.md`.
#[derive(Clone, Debug, PartialEq)]
pub struct Figure {
    /// 1-based number in the report, the NN of the file name.
    pub number: usize,
    /// File name, `fig-NN-<slug>.svg`.
    pub file: String,
    pub title: String,
    pub svg: String,
}

/// A run of `///` prose and what the code after it showed.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Section {
    /// Markdown prose; empty for the preamble (outputs before the first prose block).
    pub prose: String,
    /// 1-based line of the prose in the script (0 for the preamble).
    pub line: usize,
    pub items: Vec<Item>,
}

/// The whole report of one script run (or one REPL session).
#[derive(Clone, Debug, PartialEq)]
pub struct Report {
    pub title: String,
    pub sections: Vec<Section>,
}

impl Report {
    /// A report with the preamble section in place.
    pub fn new(title: &str) -> Self {
        Report { title: title.to_string(), sections: vec![Section::default()] }
    }

    /// Every item, in report order.
    pub fn items(&self) -> impl Iterator<Item = &Item> {
        self.sections.iter().flat_map(|s| s.items.iter())
    }

    /// Every metric, in the order the script recorded them.
    pub fn metrics(&self) -> impl Iterator<Item = &Metric> {
        self.items().filter_map(|i| if let Item::Metric(m) = i { Some(m) } else { None })
    }

    /// Every figure, in order.
    pub fn figures(&self) -> impl Iterator<Item = &Figure> {
        self.items().filter_map(|i| if let Item::Figure(f) = i { Some(f) } else { None })
    }

    /// Metrics that failed their spec.
    pub fn failed(&self) -> Vec<&Metric> {
        self.metrics().filter(|m| m.pass() == Some(false)).collect()
    }

    /// True when the report shows numbers a designer might build on (results, tables,
    /// plots, metrics), so it must carry the estimates note.
    pub fn has_design_figures(&self) -> bool {
        self.items().any(|i| !matches!(i, Item::Text(_)))
    }
}
