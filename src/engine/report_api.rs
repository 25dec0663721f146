//! Registration of the report functions: `show`, `table`, `plot`, `metric`, `save_report`
//! (and, through the print hook, `print`). Script values become plain report types here.
use super::value::{R, err};
use crate::engine::api;
use rhai::{Array, Dynamic, Engine, Map, NativeCallContext};

use super::session::Shared;
use super::value::to_f64;
use crate::num::Series;
use crate::report::plot::{self, Band, Event, Kind, Plot, RefLine};
use crate::report::{Cell, Column, Figure, Item, Metric, Spec, Table, format};

/// Reject option keys other than `allowed`, naming them all.
fn check_keys(what: &str, m: &Map, allowed: &[&str]) -> R<()> {
    if let Some(k) = m.keys().find(|k| !allowed.contains(&k.as_str())) {
        return err(format!("{what}: unknown key '{k}'; the keys are {}", allowed.join(", ")));
    }
    Ok(())
}

fn opt_str(what: &str, m: &Map, key: &str) -> R<String> {
    match m.get(key) {
        None => Ok(String::new()),
        Some(v) if v.is_string() => Ok(v.clone().into_string().unwrap_or_default()),
        Some(v) => err(format!("{what}: key '{key}' must be a string, found {}", v.type_name())),
    }
}

fn opt_bool(what: &str, m: &Map, key: &str) -> R<bool> {
    match m.get(key) {
        None => Ok(false),
        Some(v) => v.as_bool().map_err(|t| format!("{what}: key '{key}' must be true or false, found {t}").into()),
    }
}

fn opt_digits(what: &str, m: &Map) -> R<usize> {
    match m.get("digits") {
        None => Ok(format::DIGITS),
        Some(v) => match v.as_int() {
            Ok(d) if (1..=17).contains(&d) => Ok(d as usize),
            _ => err(format!("{what}: key 'digits' must be an integer in 1..=17, found {v:?}")),
        },
    }
}

/// A Series from a Series or an array of numbers; None for anything else.
fn as_series(v: &Dynamic) -> Option<Result<Series, String>> {
    if let Some(s) = v.clone().try_cast::<Series>() {
        return Some(Ok(s));
    }
    // A Monte Carlo run stands for its periods (a histogram of mc is the period histogram).
    if let Some(mc) = v.clone().try_cast::<crate::analysis::monte_carlo::MonteCarlo>() {
        return Some(Ok(Series::from(mc.period)));
    }
    let a = v.clone().try_cast::<Array>()?;
    Some(
        a.iter()
            .enumerate()
            .map(|(k, x)| to_f64(x).map_err(|_| format!("element {k} is a {}, not a number", x.type_name())))
            .collect(),
    )
}

/// Why a value is NaN, for the messages that refuse to show one.
const NAN_WHY: &str =
    "an undefined result upstream (0/0, ln or sqrt of a negative number, inf - inf, the mean of nothing)";
const NAN_VALUE: &str = "the value is NaN (not a number): an undefined result upstream (0/0, ln or sqrt of a negative number, inf - inf, the mean of nothing)";

/// Text of a shown value.
fn value_text(v: &Dynamic, unit: &str, full: bool, digits: usize) -> Result<String, String> {
    if let Some(x) = v.clone().try_cast::<f64>() {
        if x.is_nan() {
            return Err(NAN_VALUE.into());
        }
        return Ok(format::value(x, unit, digits));
    }
    if let Some(i) = v.clone().try_cast::<i64>() {
        return Ok(if unit.is_empty() { i.to_string() } else { format::value(i as f64, unit, digits) });
    }
    let is_numbers =
        v.is::<Series>() || v.clone().try_cast::<Array>().is_some_and(|a| a.iter().all(|x| x.is_float() || x.is_int()));
    if is_numbers {
        let s = as_series(v).unwrap_or(Ok(Series::default()))?;
        if s.is_empty() {
            return Ok("empty series".into());
        }
        if let Some(k) = s.as_slice().iter().position(|x| x.is_nan()) {
            return Err(format!("element {k} of the series is NaN; {}", NAN_WHY));
        }
        if full {
            let all: Vec<String> = s.as_slice().iter().map(|x| format::value(*x, unit, digits)).collect();
            return Ok(format!("[{}]", all.join(", ")));
        }
        return Ok(format!(
            "n = {}, min {}, mean {}, max {}",
            s.len(),
            format::value(s.min(), unit, digits),
            format::value(s.mean(), unit, digits),
            format::value(s.max(), unit, digits)
        ));
    }
    if v.is_string() {
        let t = v.clone().into_string().unwrap_or_default();
        return Ok(if unit.is_empty() { t } else { format!("{t} {unit}") });
    }
    Ok(v.to_string())
}

pub fn register(engine: &mut Engine, shared: &Shared) {
    // The plot font is registered when the engine starts; a failure shows at the first plot.
    let _ = plot::font::ensure();
    let s = shared.clone();
    api::fun(
        engine,
        "show(label: string, value)",
        "a result line in the report and on the terminal; a Series shows as n, min, mean, max",
        move |ctx: NativeCallContext, label: &str, v: Dynamic| -> R<()> {
            show(&s, label, &shown(&ctx, v), "", &Map::new())
        },
    );
    let s = shared.clone();
    api::fun(
        engine,
        "show(label: string, value: float|Series, unit: string)",
        "a result line, engineering-formatted with its unit: show(\"period\", 2.5e-7, \"s\") → 250 ns",
        move |ctx: NativeCallContext, label: &str, v: Dynamic, unit: &str| -> R<()> {
            show(&s, label, &shown(&ctx, v), unit, &Map::new())
        },
    );
    let s = shared.clone();
    api::fun(
        engine,
        "show(label: string, value, #{full: bool, digits: int})",
        "the same options for a value without a unit",
        move |ctx: NativeCallContext, label: &str, v: Dynamic, opts: Map| -> R<()> {
            show(&s, label, &shown(&ctx, v), "", &opts)
        },
    );
    let s = shared.clone();
    api::fun(
        engine,
        "show(label: string, value, unit: string, #{full: bool, digits: int})",
        "full: true lists every element of a Series; digits: 1..17 significant digits (default 3)",
        move |ctx: NativeCallContext, label: &str, v: Dynamic, unit: &str, opts: Map| -> R<()> {
            show(&s, label, &shown(&ctx, v), unit, &opts)
        },
    );

    let s = shared.clone();
    api::fun(
        engine,
        "table(data: map of Series/arrays | array of maps | MonteCarlo)",
        "a Markdown table; columns of a map come in name order, rows of an array of maps are its elements; a MonteCarlo gives the table of what it drew for which device (mc.drawn())",
        move |data: Dynamic| -> R<()> { table(&s, &data, &Map::new()) },
    );
    let s = shared.clone();
    api::fun(
        engine,
        "table(data, #{columns: [names], units: #{name: unit}, headers: #{name: text}, hide_zero_rows: bool, digits: int})",
        "columns: which columns in which order; units: unit of each column, shown in its header (cells get SI prefixes); headers: a column's header text, shown as given (the cells then carry the unit: 250 ns); hide_zero_rows: true leaves out rows whose numbers are all exactly 0 (a parasitic that is absent); digits: significant digits (default 3, as for show and metric)",
        move |data: Dynamic, opts: Map| -> R<()> { table(&s, &data, &opts) },
    );

    let s = shared.clone();
    api::fun(
        engine,
        "plot(#{title, x, y, kind, names, x_label, y_label, x_unit, y_unit, log_x, log_y, x_min, x_max, y_min, y_max, y2, y2_label, y2_unit, x_lines, y_lines, band, events, bins, stats, labels, waterfall, total_label}) -> string",
        "an SVG chart beside the report (fig-NN-<title>.svg), linked from it; kinds line (default), scatter, step, histogram (samples in x, or a MonteCarlo for its periods; bins; stats: true marks mean and ±σ and gives them in the legend), bar (labels + y; waterfall: true stacks them and adds a total); y may be an array of Series with names for the legend (y first, then y2); units go in x_unit/y_unit (ticks get SI prefixes); x_min..y_max: axis limits (data beyond are clipped); y2: Series on a right-hand axis (y2_label, y2_unit); x_lines, y_lines: labelled reference lines (a number, an array of numbers or #{at, label}, or a map label: value); band: a shaded y window #{min, max, label} (either end may be left out) or an array of them; events: markers, the events map of simulate (t, v, what) or times; every value must be finite; returns the file name",
        move |m: Map| -> R<String> { plot_fn(&s, &m) },
    );

    let s = shared.clone();
    api::fun(
        engine,
        "metric(name: string, value: float, unit: string)",
        "a named figure for results.json and the metrics history; name: lower-case a-z first, then a-z, 0-9, '_' or '.' (64 at most)",
        move |name: &str, v: Dynamic, unit: &str| -> R<()> { metric(&s, name, &v, unit, &Map::new()) },
    );
    let s = shared.clone();
    api::fun(
        engine,
        "metric(name: string, value: float, unit: string, #{min: float, max: float})",
        "a metric with a spec window (ends included, either may be left out); a failed spec is marked in the report and the run exits with code 3",
        move |name: &str, v: Dynamic, unit: &str, spec: Map| -> R<()> { metric(&s, name, &v, unit, &spec) },
    );

    let s = shared.clone();
    api::fun(
        engine,
        "save_report(dir: string) -> string",
        "write what the session showed (report.md, results.json, figures) into dir inside the output folder; returns the folder",
        move |dir: &str| -> R<String> { save_report(&s, dir) },
    );
}

/// Numbers and series stay values (`show` formats them with units and digits); anything else
/// becomes its text: an object as its own `to_string`, a map or array element by element.
fn shown(ctx: &NativeCallContext, v: Dynamic) -> Dynamic {
    let numbers = v.is_float()
        || v.is_int()
        || v.is_string()
        || v.is::<Series>()
        || v.clone().try_cast::<Array>().is_some_and(|a| a.iter().all(|x| x.is_float() || x.is_int()));
    if numbers {
        return v;
    }
    Dynamic::from(super::display::text_in(ctx, &v))
}

fn show(s: &Shared, label: &str, v: &Dynamic, unit: &str, opts: &Map) -> R<()> {
    check_keys("show", opts, &["full", "digits"])?;
    let full = opt_bool("show", opts, "full")?;
    let digits = opt_digits("show", opts)?;
    let value = value_text(v, unit, full, digits).map_err(|e| format!("show '{label}': {e}"))?;
    let mut g = s.lock();
    if g.echo {
        super::term::out(&format!("{label} = {value}"));
    }
    g.push(Item::Show { label: label.to_string(), value });
    Ok(())
}

/// Cells of one column from a Series or an array of numbers, strings and booleans.
fn cells(name: &str, v: &Dynamic) -> R<Vec<Cell>> {
    if let Some(s) = v.clone().try_cast::<Series>() {
        if let Some(k) = s.as_slice().iter().position(|x| x.is_nan()) {
            return err(format!("table: column '{name}', row {k} is NaN; {NAN_WHY}"));
        }
        return Ok(s.as_slice().iter().map(|x| Cell::Num(*x)).collect());
    }
    let Some(a) = v.clone().try_cast::<Array>() else {
        return err(format!("table: column '{name}' must be a Series or an array, found {}", v.type_name()));
    };
    a.iter()
        .enumerate()
        .map(|(k, x)| match cell(x) {
            Ok(Cell::Num(f)) if f.is_nan() => err(format!("table: column '{name}', row {k} is NaN; {NAN_WHY}")),
            Ok(c) => Ok(c),
            Err(t) => {
                err(format!("table: column '{name}', row {k} holds a {t}; cells are numbers, strings or booleans"))
            }
        })
        .collect()
}

fn cell(x: &Dynamic) -> Result<Cell, String> {
    if let Some(f) = x.clone().try_cast::<f64>() {
        Ok(Cell::Num(f))
    } else if let Some(i) = x.clone().try_cast::<i64>() {
        Ok(Cell::Int(i))
    } else if x.is_string() || x.is_bool() || x.is_char() {
        Ok(Cell::Text(x.to_string()))
    } else {
        Err(x.type_name().to_string())
    }
}

fn table(s: &Shared, data: &Dynamic, opts: &Map) -> R<()> {
    check_keys("table", opts, &["columns", "units", "headers", "hide_zero_rows", "digits"])?;
    let digits = opt_digits("table", opts)?;
    let hide_zero = opt_bool("table", opts, "hide_zero_rows")?;
    let headers: Map = match opts.get("headers") {
        None => Map::new(),
        Some(h) => h.clone().try_cast::<Map>().ok_or_else(|| {
            format!("table: key 'headers' must be a map of column name to header text, found {}", h.type_name())
        })?,
    };
    let units: Map = match opts.get("units") {
        None => Map::new(),
        Some(u) => u.clone().try_cast::<Map>().ok_or_else(|| {
            format!("table: key 'units' must be a map of column name to unit, found {}", u.type_name())
        })?,
    };
    // Columns by name, in name order (a script map is sorted by key) or as the rows give them.
    let mut cols: Vec<(String, Vec<Cell>)> = Vec::new();
    // A Monte Carlo run is shown as the table of what it drew, in the order of DRAWN_COLUMNS.
    let mut data = data.clone();
    let mut opts = opts.clone();
    if let Some(mc) = data.clone().try_cast::<crate::analysis::monte_carlo::MonteCarlo>() {
        data = Dynamic::from_array(super::monte_carlo_api::drawn_rows(&mc));
        if !opts.contains_key("columns") {
            let order = super::monte_carlo_api::DRAWN_COLUMNS.iter().map(|c| Dynamic::from(c.to_string())).collect();
            opts.insert("columns".into(), Dynamic::from_array(order));
        }
    }
    let (data, opts) = (&data, &opts);
    if let Some(m) = data.clone().try_cast::<Map>() {
        for (k, v) in &m {
            cols.push((k.to_string(), cells(k, v)?));
        }
    } else if let Some(rows) = data.clone().try_cast::<Array>() {
        let mut names: Vec<String> = Vec::new();
        for (r, row) in rows.iter().enumerate() {
            let Some(m) = row.clone().try_cast::<Map>() else {
                return err(format!("table: row {r} is a {}; an array table holds one map per row", row.type_name()));
            };
            if r == 0 {
                names = m.keys().map(|k| k.to_string()).collect();
                cols = names.iter().map(|n| (n.clone(), vec![])).collect();
            }
            if m.len() != names.len() || m.keys().any(|k| !names.contains(&k.to_string())) {
                let got: Vec<String> = m.keys().map(|k| k.to_string()).collect();
                return err(format!("table: row {r} has the keys {}; row 0 has {}", got.join(", "), names.join(", ")));
            }
            for (name, col) in cols.iter_mut() {
                let v = &m[name.as_str()];
                let c = cell(v).map_err(|t| {
                    format!("table: row {r}, key '{name}' holds a {t}; cells are numbers, strings or booleans")
                })?;
                if matches!(c, Cell::Num(f) if f.is_nan()) {
                    return err(format!("table: row {r}, key '{name}' is NaN; {NAN_WHY}"));
                }
                col.push(c);
            }
        }
    } else {
        return err(format!(
            "table: data must be a map of columns or an array of row maps, found {}",
            data.type_name()
        ));
    }
    if let Some(order) = opts.get("columns") {
        let Some(order) = order.clone().try_cast::<Array>() else {
            return err("table: key 'columns' must be an array of column names");
        };
        let mut picked = Vec::new();
        for o in &order {
            let name = o.to_string();
            let Some(k) = cols.iter().position(|(n, _)| *n == name) else {
                let have: Vec<&str> = cols.iter().map(|(n, _)| n.as_str()).collect();
                return err(format!(
                    "table: 'columns' names '{name}', which the data does not have; it has {}",
                    have.join(", ")
                ));
            };
            picked.push(cols[k].clone());
        }
        cols = picked;
    }
    for (what, m) in [("units", &units), ("headers", &headers)] {
        if let Some(k) = m.keys().find(|k| !cols.iter().any(|(n, _)| n == k.as_str())) {
            return err(format!("table: '{what}' names column '{k}', which the table does not have"));
        }
    }
    if let Some((k, _)) = headers.iter().find(|(_, h)| !h.is_string()) {
        return err(format!("table: 'headers' gives column '{k}' a value that is not a string; a header is text"));
    }
    let columns: Vec<Column> = cols
        .into_iter()
        .map(|(name, cells)| {
            let unit = units.get(name.as_str()).map(|u| u.to_string()).unwrap_or_default();
            let header = headers.get(name.as_str()).map(|h| h.to_string());
            Column { name, unit, cells, header }
        })
        .collect();
    let columns = if hide_zero { Table::zero_rows_hidden(&columns) } else { columns };
    let t = Table::from_columns(&columns, digits).map_err(|e| format!("table: {e}"))?;
    let mut g = s.lock();
    if g.echo {
        super::term::out(t.markdown().trim_end());
    }
    g.push(Item::Table(t));
    Ok(())
}

/// One series or several from a plot key: a Series, an array of numbers, or an array of those.
fn series_list(key: &str, v: &Dynamic) -> R<Vec<Vec<f64>>> {
    if let Some(a) = v.clone().try_cast::<Array>()
        && !a.is_empty()
        && a.iter().all(|x| x.is::<Series>() || x.is::<Array>())
    {
        return a
            .iter()
            .enumerate()
            .map(|(k, x)| match as_series(x) {
                Some(Ok(s)) => Ok(s.to_vec()),
                Some(Err(e)) => err(format!("plot: series {} of '{key}': {e}", k + 1)),
                None => err(format!("plot: series {} of '{key}' is not numbers", k + 1)),
            })
            .collect();
    }
    match as_series(v) {
        Some(Ok(s)) => Ok(vec![s.to_vec()]),
        Some(Err(e)) => err(format!("plot: key '{key}': {e}")),
        None => err(format!(
            "plot: key '{key}' must be a Series, an array of numbers or an array of Series, found {}",
            v.type_name()
        )),
    }
}

fn strings(key: &str, v: &Dynamic) -> R<Vec<String>> {
    let Some(a) = v.clone().try_cast::<Array>() else {
        return err(format!("plot: key '{key}' must be an array of strings, found {}", v.type_name()));
    };
    Ok(a.iter().map(|x| x.to_string()).collect())
}

/// A number from a plot key, or an error naming it.
fn plot_num(key: &str, v: &Dynamic) -> R<f64> {
    to_f64(v).map_err(|_| format!("plot: key '{key}' must be a number, found {}", v.type_name()).into())
}

fn opt_num(m: &Map, key: &str) -> R<Option<f64>> {
    m.get(key).map(|v| plot_num(key, v)).transpose()
}

/// One reference line from `#{at, label}`.
fn ref_line_map(key: &str, m: &Map) -> R<RefLine> {
    check_keys(&format!("plot: a line of '{key}'"), m, &["at", "label"])?;
    let at = m.get("at").ok_or_else(|| format!("plot: a line of '{key}' needs 'at' (the value it marks)"))?;
    Ok(RefLine { at: plot_num(key, at)?, label: opt_str("plot", m, "label")? })
}

/// Reference lines: a number, a Series, an array of numbers or of `#{at, label}` maps, or a
/// map of label to value.
fn ref_lines(key: &str, v: &Dynamic) -> R<Vec<RefLine>> {
    if let Some(m) = v.clone().try_cast::<Map>() {
        if m.contains_key("at") {
            return Ok(vec![ref_line_map(key, &m)?]);
        }
        return m.iter().map(|(k, x)| Ok(RefLine { at: plot_num(key, x)?, label: k.to_string() })).collect();
    }
    if let Some(a) = v.clone().try_cast::<Array>() {
        return a
            .iter()
            .map(|x| match x.clone().try_cast::<Map>() {
                Some(m) => ref_line_map(key, &m),
                None => Ok(RefLine { at: plot_num(key, x)?, label: String::new() }),
            })
            .collect();
    }
    if let Some(s) = v.clone().try_cast::<Series>() {
        return Ok(s.as_slice().iter().map(|&at| RefLine { at, label: String::new() }).collect());
    }
    Ok(vec![RefLine { at: plot_num(key, v)?, label: String::new() }])
}

/// A band from `#{min, max, label}`.
fn band_map(m: &Map) -> R<Band> {
    check_keys("plot: 'band'", m, &["min", "max", "label"])?;
    Ok(Band { min: opt_num(m, "min")?, max: opt_num(m, "max")?, label: opt_str("plot", m, "label")? })
}

fn bands(v: &Dynamic) -> R<Vec<Band>> {
    if let Some(m) = v.clone().try_cast::<Map>() {
        return Ok(vec![band_map(&m)?]);
    }
    let Some(a) = v.clone().try_cast::<Array>() else {
        return err(format!(
            "plot: key 'band' must be a map #{{min, max, label}} or an array of them, found {}",
            v.type_name()
        ));
    };
    a.iter()
        .map(|x| {
            x.clone()
                .try_cast::<Map>()
                .ok_or_else(|| "plot: each 'band' is a map #{min, max, label}".into())
                .and_then(|m| band_map(&m))
        })
        .collect()
}

/// The numbers of an event field: a Series or an array of numbers.
fn event_numbers(field: &str, v: &Dynamic) -> R<Vec<f64>> {
    match as_series(v) {
        Some(Ok(s)) => Ok(s.to_vec()),
        _ => err(format!("plot: 'events' field '{field}' must be a Series or an array of numbers")),
    }
}

/// Events: the `events` map of `simulate` (`t`, and `v` and `what` when present), an array
/// of times, or an array of `#{t, v, what}` maps.
fn events(v: &Dynamic) -> R<Vec<Event>> {
    let from_map = |m: &Map| -> R<Vec<Event>> {
        let t = m.get("t").ok_or("plot: 'events' needs 't', the times of the events")?;
        if let Ok(x) = to_f64(t) {
            let y = opt_num(m, "v")?;
            let kind = opt_str("plot", m, "what")?;
            return Ok(vec![Event { x, y, kind }]);
        }
        let t = event_numbers("t", t)?;
        let y = m.get("v").map(|v| event_numbers("v", v)).transpose()?;
        let what: Option<Vec<String>> = match m.get("what") {
            None => None,
            Some(w) => Some(strings("events.what", w)?),
        };
        for (name, n) in [("v", y.as_ref().map(Vec::len)), ("what", what.as_ref().map(Vec::len))] {
            if let Some(n) = n
                && n != t.len()
            {
                return err(format!("plot: 'events' has {} times but {n} values of '{name}'", t.len()));
            }
        }
        Ok((0..t.len())
            .map(|k| Event {
                x: t[k],
                y: y.as_ref().map(|y| y[k]),
                kind: what.as_ref().map(|w| w[k].clone()).unwrap_or_default(),
            })
            .collect())
    };
    if let Some(m) = v.clone().try_cast::<Map>() {
        return from_map(&m);
    }
    if let Some(a) = v.clone().try_cast::<Array>()
        && a.iter().all(|x| x.is_map())
    {
        let mut all = Vec::new();
        for x in &a {
            all.extend(from_map(&x.clone().cast::<Map>())?);
        }
        return Ok(all);
    }
    match as_series(v) {
        Some(Ok(s)) => Ok(s.as_slice().iter().map(|&x| Event { x, y: None, kind: String::new() }).collect()),
        _ => err(format!(
            "plot: key 'events' must be the events map of simulate, times (a Series or an array), or an array of #{{t, v, what}} maps, found {}",
            v.type_name()
        )),
    }
}

const PLOT_KEYS: &[&str] = &[
    "title",
    "kind",
    "x",
    "y",
    "names",
    "labels",
    "x_label",
    "y_label",
    "x_unit",
    "y_unit",
    "log_x",
    "log_y",
    "bins",
    "waterfall",
    "total_label",
    "stats",
    "x_lines",
    "y_lines",
    "band",
    "events",
    "x_min",
    "x_max",
    "y_min",
    "y_max",
    "y2",
    "y2_label",
    "y2_unit",
];

/// A [`Plot`] from the script's map; errors name the key.
pub fn plot_from_map(m: &Map) -> R<Plot> {
    check_keys("plot", m, PLOT_KEYS)?;
    let kind = match m.get("kind") {
        None => Kind::Line,
        Some(k) => Kind::parse(&k.to_string()).map_err(|e| format!("plot: {e}"))?,
    };
    let mut p = Plot::new(kind);
    p.title = opt_str("plot", m, "title")?;
    p.x_label = opt_str("plot", m, "x_label")?;
    p.y_label = opt_str("plot", m, "y_label")?;
    p.x_unit = opt_str("plot", m, "x_unit")?;
    p.y_unit = opt_str("plot", m, "y_unit")?;
    p.log_x = opt_bool("plot", m, "log_x")?;
    p.log_y = opt_bool("plot", m, "log_y")?;
    p.waterfall = opt_bool("plot", m, "waterfall")?;
    p.stats = opt_bool("plot", m, "stats")?;
    if p.stats && kind != Kind::Histogram {
        return err("plot: 'stats' is for histograms (kind: \"histogram\")");
    }
    if m.contains_key("total_label") {
        p.total_label = opt_str("plot", m, "total_label")?;
    }
    if let Some(b) = m.get("bins") {
        p.bins = Some(
            b.as_int()
                .ok()
                .filter(|b| *b > 0)
                .ok_or_else(|| format!("plot: key 'bins' must be an integer in 1..=1000, found {b:?}"))?
                as usize,
        );
    }
    if let Some(n) = m.get("names") {
        p.names = if n.is_string() { vec![n.to_string()] } else { strings("names", n)? };
    }
    if let Some(l) = m.get("labels") {
        p.labels = strings("labels", l)?;
    }
    if let Some(v) = m.get("x_lines") {
        p.x_lines = ref_lines("x_lines", v)?;
    }
    if let Some(v) = m.get("y_lines") {
        p.y_lines = ref_lines("y_lines", v)?;
    }
    if let Some(v) = m.get("band") {
        p.bands = bands(v)?;
    }
    if let Some(v) = m.get("events") {
        p.events = events(v)?;
    }
    (p.x_min, p.x_max, p.y_min, p.y_max) =
        (opt_num(m, "x_min")?, opt_num(m, "x_max")?, opt_num(m, "y_min")?, opt_num(m, "y_max")?);
    if let Some(v) = m.get("y2") {
        p.y2 = series_list("y2", v)?;
    }
    p.y2_label = opt_str("plot", m, "y2_label")?;
    p.y2_unit = opt_str("plot", m, "y2_unit")?;
    match kind {
        Kind::Histogram => {
            if m.contains_key("y") {
                return err("plot: a histogram takes its samples in 'x', not 'y'");
            }
            if let Some(x) = m.get("x") {
                p.ys = series_list("x", x)?;
            }
        }
        Kind::Bar => {
            if m.contains_key("x") {
                return err("plot: a bar chart takes 'labels' and 'y', not 'x'");
            }
            if let Some(y) = m.get("y") {
                p.ys = series_list("y", y)?;
            }
        }
        _ => {
            if let Some(x) = m.get("x") {
                let xs = series_list("x", x)?;
                if xs.len() != 1 {
                    return err("plot: key 'x' must be one Series; give several curves in 'y'");
                }
                p.x = xs.into_iter().next().unwrap_or_default();
            }
            if let Some(y) = m.get("y") {
                p.ys = series_list("y", y)?;
            }
        }
    }
    p.check()?;
    Ok(p)
}

fn plot_fn(s: &Shared, m: &Map) -> R<String> {
    let p = plot_from_map(m)?;
    let svg = plot::svg::render(&p)
        .map_err(|e| if e.starts_with("plot") { e } else { format!("plot '{}': {e}", p.title) })?;
    let mut g = s.lock();
    let n = g.report.figures().count() + 1;
    let file = format!("fig-{n:02}-{}.svg", plot::slug(&p.title));
    if g.echo {
        super::term::out(&format!("figure {n}: {} ({file})", if p.title.is_empty() { "untitled" } else { &p.title }));
    }
    g.push(Item::Figure(Figure { number: n, file: file.clone(), title: p.title, svg }));
    Ok(file)
}

fn metric(s: &Shared, name: &str, v: &Dynamic, unit: &str, spec: &Map) -> R<()> {
    check_keys(&format!("metric '{name}'"), spec, &["min", "max"])?;
    let value =
        to_f64(v).map_err(|_| format!("metric '{name}': the value must be a number, found {}", v.type_name()))?;
    let bound = |k: &str| -> R<Option<f64>> {
        spec.get(k)
            .map(|x| {
                to_f64(x).map_err(|_| {
                    format!("metric '{name}': spec key '{k}' must be a number, found {}", x.type_name()).into()
                })
            })
            .transpose()
    };
    let m = Metric::new(name, value, unit, Spec { min: bound("min")?, max: bound("max")? })?;
    let mut g = s.lock();
    if g.report.metrics().any(|x| x.name == m.name) {
        return err(format!("metric '{name}' is recorded twice; each metric name may be used once per run"));
    }
    if g.echo {
        let verdict = match m.pass() {
            None => String::new(),
            Some(p) => format!(" (spec {}: {})", m.spec.text(unit), if p { "pass" } else { "FAIL" }),
        };
        super::term::out(&format!("metric {name} = {}{verdict}", m.value_text()));
    }
    g.push(Item::Metric(m));
    Ok(())
}

fn save_report(s: &Shared, dir: &str) -> R<String> {
    let g = s.lock();
    let path = g.sandbox.writable(dir).map_err(|e| format!("save_report: {e}"))?;
    crate::report::output::write(&g.report, &g.provenance(), &path)
        .map_err(|e| format!("save_report: cannot write into {}: {e}", path.display()))?;
    let shown = path.display().to_string();
    if g.echo {
        super::term::out(&format!("report written to {shown}/report.md"));
    }
    Ok(shown)
}
