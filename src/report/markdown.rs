//! Rendering a report as Markdown (GitHub-flavoured): title, provenance, the estimates note,
//! the metrics summary, then each section's prose followed by its outputs in order.
use super::format;
use super::metric::Metric;
use super::model::{Item, Report};
use super::provenance::Provenance;

/// The note every report with design figures carries (house rule: results that could lead
/// someone to build hardware are marked as estimates).
pub const ESTIMATES_NOTE: &str = "> **Estimates.** The figures in this report come from behavioural models and are \
estimates. Confirm them by transistor-level simulation and on silicon, under your own design rules \
and sign-off practice, before building on them.";

pub fn render(r: &Report, prov: &Provenance) -> String {
    let mut s = format!("# {}\n\n", escape(&r.title));
    s.push_str(&prov.markdown());
    if r.has_design_figures() {
        s.push('\n');
        s.push_str(ESTIMATES_NOTE);
        s.push('\n');
    }
    let metrics: Vec<&Metric> = r.metrics().collect();
    if !metrics.is_empty() {
        s.push_str("\n**Metrics**\n\n");
        s.push_str(&metrics_table(&metrics));
        let failed = r.failed().len();
        if failed > 0 {
            let what = if failed == 1 { "metric fails its spec" } else { "metrics fail their specs" };
            s.push_str(&format!("\n**{failed} {what}.**\n"));
        }
    }
    for sec in &r.sections {
        if !sec.prose.is_empty() {
            s.push('\n');
            s.push_str(sec.prose.trim_end());
            s.push('\n');
        }
        for group in groups(&sec.items) {
            s.push('\n');
            match group {
                Group::List(items) => {
                    for it in items {
                        match it {
                            Item::Show { label, value } => {
                                s.push_str(&format!("- **{}**: {}\n", escape(label), escape(value)))
                            }
                            Item::Metric(m) => s.push_str(&format!("- {}\n", metric_line(m))),
                            _ => {}
                        }
                    }
                }
                Group::Text(lines) => {
                    let all = lines.join("\n");
                    let fence = fence_for(&all);
                    s.push_str(&format!("{fence}text\n{all}\n{fence}\n"));
                }
                Group::Block(Item::Table(t)) => s.push_str(&t.markdown()),
                Group::Block(Item::Figure(f)) => {
                    let alt = if f.title.is_empty() { format!("Figure {}", f.number) } else { escape(&f.title) };
                    s.push_str(&format!("![{alt}]({})\n\n", f.file));
                    if f.title.is_empty() {
                        s.push_str(&format!("*Figure {}*\n", f.number));
                    } else {
                        s.push_str(&format!("*Figure {}: {}*\n", f.number, escape(&f.title)));
                    }
                }
                Group::Block(_) => {}
            }
        }
    }
    s
}

/// Consecutive outputs that render as one Markdown block.
enum Group<'a> {
    /// Result lines and metrics: one bullet list.
    List(Vec<&'a Item>),
    /// Printed text: one fenced block.
    Text(Vec<&'a str>),
    /// A table or a figure.
    Block(&'a Item),
}

fn groups(items: &[Item]) -> Vec<Group<'_>> {
    let mut v: Vec<Group> = Vec::new();
    for it in items {
        match (it, v.last_mut()) {
            (Item::Show { .. } | Item::Metric(_), Some(Group::List(l))) => l.push(it),
            (Item::Show { .. } | Item::Metric(_), _) => v.push(Group::List(vec![it])),
            (Item::Text(t), Some(Group::Text(l))) => l.push(t),
            (Item::Text(t), _) => v.push(Group::Text(vec![t])),
            _ => v.push(Group::Block(it)),
        }
    }
    v
}

/// A code fence longer than any run of backticks inside the text (CommonMark 4.5).
fn fence_for(t: &str) -> String {
    let longest = t.split(|c| c != '`').map(str::len).max().unwrap_or(0);
    "`".repeat(longest.max(2) + 1)
}

/// `metric` line: name, value, spec and verdict.
fn metric_line(m: &Metric) -> String {
    let v = format::value(m.value, &m.unit, 4);
    match m.pass() {
        None => format!("metric `{}` = {v}", m.name),
        Some(p) => format!("metric `{}` = {v}, spec {}: {}", m.name, m.spec.text(&m.unit), verdict(p)),
    }
}

/// The result cell of a metric with a spec.
pub fn verdict(pass: bool) -> &'static str {
    if pass { "pass" } else { "**FAIL**" }
}

fn metrics_table(ms: &[&Metric]) -> String {
    let mut s = String::from("| metric | value | spec | result |\n| --- | ---: | --- | --- |\n");
    for m in ms {
        s.push_str(&format!("| `{}` | {} |\n", m.name, metric_cells(m)));
    }
    s
}

/// The value, spec and result cells of a metric's table row: `3.30 µs | ≤ 3.40 µs | pass`.
pub fn metric_cells(m: &Metric) -> String {
    let spec = if m.spec.is_open() { "—".to_string() } else { m.spec.text(&m.unit) };
    let res = m.pass().map(verdict).unwrap_or("—");
    format!("{} | {spec} | {res}", format::value(m.value, &m.unit, 4))
}

/// Backslash-escape the characters that would turn plain text into Markdown markup.
pub fn escape(t: &str) -> String {
    let mut s = String::with_capacity(t.len());
    for c in t.chars() {
        if matches!(c, '\\' | '*' | '_' | '`' | '[' | ']' | '<' | '>' | '|' | '#') {
            s.push('\\');
        }
        if c == '\n' { s.push(' ') } else { s.push(c) }
    }
    s
}
