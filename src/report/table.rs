//! Tables: columns of numbers or text, formatted once, rendered as GitHub-flavoured Markdown.
use super::format;

/// One cell value before formatting.
#[derive(Clone, Debug, PartialEq)]
pub enum Cell {
    Num(f64),
    Int(i64),
    Text(String),
}

/// A column as given: name, unit (may be empty) and values.
#[derive(Clone, Debug, PartialEq)]
pub struct Column {
    pub name: String,
    pub unit: String,
    pub cells: Vec<Cell>,
}

/// A formatted table: header texts, right-alignment of numeric columns, rows of cell texts.
#[derive(Clone, Debug, PartialEq)]
pub struct Table {
    pub headers: Vec<String>,
    pub numeric: Vec<bool>,
    pub rows: Vec<Vec<String>>,
}

impl Table {
    /// Format columns of equal length; numbers get `digits` significant digits and an SI
    /// prefix, the unit goes in the header: `period (s)` over `3.33µ`.
    pub fn from_columns(cols: &[Column], digits: usize) -> Result<Table, String> {
        let Some(first) = cols.first() else { return Err("a table needs at least one column".into()) };
        let n = first.cells.len();
        if let Some(c) = cols.iter().find(|c| c.cells.len() != n) {
            return Err(format!(
                "columns differ in length: '{}' has {} values, '{}' has {}",
                first.name,
                n,
                c.name,
                c.cells.len()
            ));
        }
        let headers = cols
            .iter()
            .map(|c| if c.unit.is_empty() { c.name.clone() } else { format!("{} ({})", c.name, c.unit) })
            .collect();
        let numeric = cols.iter().map(|c| c.cells.iter().all(|x| !matches!(x, Cell::Text(_)))).collect();
        let rows = (0..n)
            .map(|r| {
                cols.iter()
                    .map(|c| match &c.cells[r] {
                        Cell::Num(x) => format::bare(*x, &c.unit, digits),
                        Cell::Int(i) if c.unit.is_empty() || format::plain_unit(&c.unit) => i.to_string(),
                        Cell::Int(i) => format::bare(*i as f64, &c.unit, digits),
                        Cell::Text(t) => t.clone(),
                    })
                    .collect()
            })
            .collect();
        Ok(Table { headers, numeric, rows })
    }

    /// GitHub-flavoured Markdown: header row, delimiter row (numbers right-aligned), rows.
    pub fn markdown(&self) -> String {
        let line = |cells: &[String]| {
            let inner: Vec<String> = cells.iter().map(|c| escape_cell(c)).collect();
            format!("| {} |\n", inner.join(" | "))
        };
        let mut s = line(&self.headers);
        let delim: Vec<String> =
            self.numeric.iter().map(|&n| if n { "---:".to_string() } else { "---".to_string() }).collect();
        s.push_str(&format!("| {} |\n", delim.join(" | ")));
        for r in &self.rows {
            s.push_str(&line(r));
        }
        s
    }
}

/// A cell's text made safe inside a table row: pipes escaped, line breaks as spaces.
fn escape_cell(s: &str) -> String {
    let t = s.replace('\\', "\\\\").replace('|', "\\|").replace(['\n', '\r'], " ");
    if t.is_empty() { " ".into() } else { t }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn renders_gfm() {
        let cols = vec![
            Column {
                name: "corner".into(),
                unit: String::new(),
                cells: vec![Cell::Text("ss|cold".into()), Cell::Text("ff".into())],
            },
            Column { name: "period".into(), unit: "s".into(), cells: vec![Cell::Num(2.5e-7), Cell::Num(2.4e-7)] },
        ];
        let t = Table::from_columns(&cols, 3).unwrap();
        assert_eq!(t.markdown(), "| corner | period (s) |\n| --- | ---: |\n| ss\\|cold | 250n |\n| ff | 240n |\n");
        let bad = vec![cols[0].clone(), Column { name: "x".into(), unit: String::new(), cells: vec![Cell::Int(1)] }];
        assert!(Table::from_columns(&bad, 3).unwrap_err().contains("'x' has 1"));
    }
}
