//! Rendering a report as Markdown.
use super::model::{Item, Report};

pub fn render(r: &Report) -> String {
    let mut s = format!("# {}\n", r.title);
    for sec in &r.sections {
        if !sec.prose.is_empty() {
            s.push('\n');
            s.push_str(&sec.prose);
            s.push('\n');
        }
        if !sec.items.is_empty() {
            s.push('\n');
        }
        for it in &sec.items {
            match it {
                Item::Show { label, value } => s.push_str(&format!("- **{label}**: {value}\n")),
                Item::Text(t) => s.push_str(&format!("    {t}\n")),
            }
        }
    }
    s
}
