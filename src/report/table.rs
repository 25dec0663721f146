//! Tables: columns of numbers or text, formatted once, rendered as GitHub-flavoured Markdown.
//! The unit of a column is written once: in its header (`period (s)` over `250n`), or, when
//! the script gives the header its own text, in every cell (`period` over `250 ns`).
use super::format;

/// One cell value before formatting.
#[derive(Clone, Debug, PartialEq)]
pub enum Cell {
    Num(f64),
    Int(i64),
    Text(String),
}

/// A column as given: name, unit (may be empty), values and the header text, if set.
#[derive(Clone, Debug, PartialEq)]
pub struct Column {
    pub name: String,
    pub unit: String,
    pub cells: Vec<Cell>,
    /// Header shown instead of `name (unit)`; the cells then carry the unit.
    pub header: Option<String>,
}

impl Column {
    pub fn new(name: &str, unit: &str, cells: Vec<Cell>) -> Column {
        Column { name: name.into(), unit: unit.into(), cells, header: None }
    }
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
            .map(|c| match &c.header {
                Some(h) => h.clone(),
                None if c.unit.is_empty() => c.name.clone(),
                None => format!("{} ({})", c.name, c.unit),
            })
            .collect();
        let numeric = cols.iter().map(|c| c.cells.iter().all(|x| !matches!(x, Cell::Text(_)))).collect();
        let rows = (0..n)
            .map(|r| {
                cols.iter()
                    .map(|c| {
                        let in_cell = c.header.is_some() && !c.unit.is_empty();
                        match &c.cells[r] {
                            Cell::Num(x) if in_cell => format::value(*x, &c.unit, digits),
                            Cell::Num(x) => format::bare(*x, &c.unit, digits),
                            Cell::Int(i) if c.unit.is_empty() => i.to_string(),
                            Cell::Int(i) if format::plain_unit(&c.unit) && in_cell => format!("{i} {}", c.unit),
                            Cell::Int(i) if format::plain_unit(&c.unit) => i.to_string(),
                            Cell::Int(i) if in_cell => format::value(*i as f64, &c.unit, digits),
                            Cell::Int(i) => format::bare(*i as f64, &c.unit, digits),
                            Cell::Text(t) => t.clone(),
                        }
                    })
                    .collect()
            })
            .collect();
        Ok(Table { headers, numeric, rows })
    }

    /// Rows whose numbers are all exactly zero left out (a parasitic that is absent); a row
    /// without numbers stays.
    pub fn zero_rows_hidden(cols: &[Column]) -> Vec<Column> {
        let n = cols.first().map_or(0, |c| c.cells.len());
        let zero = |c: &Cell| matches!(c, Cell::Num(x) if *x == 0.0) || matches!(c, Cell::Int(0));
        let keep: Vec<bool> = (0..n)
            .map(|r| {
                let nums: Vec<&Cell> =
                    cols.iter().map(|c| &c.cells[r]).filter(|c| !matches!(c, Cell::Text(_))).collect();
                nums.is_empty() || !nums.iter().all(|c| zero(c))
            })
            .collect();
        cols.iter()
            .map(|c| Column {
                cells: c.cells.iter().zip(&keep).filter(|(_, k)| **k).map(|(x, _)| x.clone()).collect(),
                ..c.clone()
            })
            .collect()
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
            Column::new("corner", "", vec![Cell::Text("ss|cold".into()), Cell::Text("ff".into())]),
            Column::new("period", "s", vec![Cell::Num(2.5e-7), Cell::Num(2.4e-7)]),
        ];
        let t = Table::from_columns(&cols, 3).unwrap();
        assert_eq!(t.markdown(), "| corner | period (s) |\n| --- | ---: |\n| ss\\|cold | 250n |\n| ff | 240n |\n");
        let bad = vec![cols[0].clone(), Column::new("x", "", vec![Cell::Int(1)])];
        assert!(Table::from_columns(&bad, 3).unwrap_err().contains("'x' has 1"));
    }
    #[test]
    fn header_text_moves_the_unit_into_the_cells() {
        let mut c = Column::new("period", "s", vec![Cell::Num(2.5e-7), Cell::Int(0)]);
        c.header = Some("T".into());
        let t = Table::from_columns(&[c], 3).unwrap();
        assert_eq!(t.markdown(), "| T |\n| ---: |\n| 250 ns |\n| 0 s |\n");
    }
    #[test]
    fn exactly_zero_rows_hide() {
        let cols = vec![
            Column::new(
                "parasitic",
                "",
                vec![Cell::Text("leak".into()), Cell::Text("delay".into()), Cell::Text("none".into())],
            ),
            Column::new("alone", "s", vec![Cell::Num(0.0), Cell::Num(1e-9), Cell::Num(0.0)]),
            Column::new("pct", "%", vec![Cell::Int(0), Cell::Num(-0.0), Cell::Num(1e-300)]),
        ];
        let kept = Table::zero_rows_hidden(&cols);
        // Row 0 is all zero; row 1 has 1 ns; row 2 has a tiny value that is not zero.
        assert_eq!(kept[0].cells, vec![Cell::Text("delay".into()), Cell::Text("none".into())]);
    }
}
