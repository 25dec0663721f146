//! What a run shows, in order: sections of prose, each followed by its outputs.

/// One output placed under a section.
#[derive(Clone, Debug, PartialEq)]
pub enum Item {
    /// A `show(label, value)` result line, already formatted.
    Show { label: String, value: String },
    /// Text from `print`.
    Text(String),
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
}
