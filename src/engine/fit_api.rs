//! Registration of data reading and fitting: `read_csv` (through the session's sandbox, the
//! file recorded in the provenance), `fit_linear` and `fit_curve`.
use rhai::{Array, Dynamic, Engine, FnPtr, Map, NativeCallContext};

use super::api;
use super::session::Shared;
use super::value::{R, lift, to_f64};
use crate::analysis::fit_curve::fit_curve;
use crate::analysis::fit_linear::{Fit, fit_linear};
use crate::num::Series;

/// A column name or data cell as the user wrote it, for messages.
fn quoted(s: &str) -> String {
    format!("'{}'", s.trim())
}

/// Parse CSV text into columns, with errors naming the file, line and column.
pub fn parse_csv(text: &str, file: &str) -> Result<Vec<(String, Vec<f64>)>, String> {
    let mut rd = csv::ReaderBuilder::new()
        .has_headers(true)
        .comment(Some(b'#'))
        .trim(csv::Trim::All)
        .flexible(false)
        .from_reader(text.as_bytes());
    let headers = rd.headers().map_err(|e| csv_error(file, &e))?.clone();
    if headers.is_empty() || headers.iter().all(|h| h.is_empty()) {
        return Err(format!("read_csv: '{file}' is empty: it needs a header line and at least one row of numbers"));
    }
    let mut names: Vec<String> = Vec::new();
    for (k, h) in headers.iter().enumerate() {
        if h.is_empty() {
            return Err(format!("read_csv: '{file}': column {} has no name in the header line", k + 1));
        }
        if names.iter().any(|n| n == h) {
            return Err(format!("read_csv: '{file}': the header names column {} twice", quoted(h)));
        }
        names.push(h.to_string());
    }
    let mut cols: Vec<Vec<f64>> = vec![Vec::new(); names.len()];
    for rec in rd.records() {
        let rec = rec.map_err(|e| csv_error(file, &e))?;
        let line = rec.position().map(|p| p.line()).unwrap_or(0);
        for (k, cell) in rec.iter().enumerate() {
            let col = &names[k];
            if cell.is_empty() {
                return Err(format!(
                    "read_csv: '{file}' line {line}, column {} ({}): the cell is empty",
                    quoted(col),
                    k + 1
                ));
            }
            let v: f64 = cell.parse().map_err(|_| {
                format!(
                    "read_csv: '{file}' line {line}, column {} ({}): {} is not a number",
                    quoted(col),
                    k + 1,
                    quoted(cell)
                )
            })?;
            if !v.is_finite() {
                return Err(format!(
                    "read_csv: '{file}' line {line}, column {} ({}): {} is not a finite number",
                    quoted(col),
                    k + 1,
                    quoted(cell)
                ));
            }
            cols[k].push(v);
        }
    }
    if cols[0].is_empty() {
        return Err(format!("read_csv: '{file}' has a header line but no rows of data"));
    }
    Ok(names.into_iter().zip(cols).collect())
}

fn csv_error(file: &str, e: &csv::Error) -> String {
    match e.kind() {
        csv::ErrorKind::UnequalLengths { pos, expected_len, len } => format!(
            "read_csv: '{file}' line {}: {len} cells where the header has {expected_len} columns",
            pos.as_ref().map(|p| p.line()).unwrap_or(0)
        ),
        csv::ErrorKind::Utf8 { pos, .. } => {
            format!("read_csv: '{file}' line {}: the text is not UTF-8", pos.as_ref().map(|p| p.line()).unwrap_or(0))
        }
        _ => format!("read_csv: '{file}': {e}"),
    }
}

fn series_of(v: &Dynamic, what: &str) -> R<Series> {
    if let Some(s) = v.clone().try_cast::<Series>() {
        return Ok(s);
    }
    if let Some(a) = v.clone().try_cast::<Array>() {
        return a
            .iter()
            .map(|x| to_f64(x).map_err(|_| format!("{what} must hold numbers, found {}", x.type_name()).into()))
            .collect();
    }
    Err(format!("{what} must be a Series (or an array of numbers), found {}", v.type_name()).into())
}

fn f(x: f64) -> Dynamic {
    Dynamic::from_float(x)
}

fn rows(fit: &Fit) -> Array {
    (0..fit.coef.len())
        .map(|j| {
            let mut q = Map::new();
            q.insert("name".into(), Dynamic::from(fit.names[j].clone()));
            q.insert("coef".into(), f(fit.coef[j]));
            q.insert("stderr".into(), f(fit.stderr[j]));
            q.insert("lo".into(), f(fit.lo[j]));
            q.insert("hi".into(), f(fit.hi[j]));
            Dynamic::from_map(q)
        })
        .collect()
}

fn summary(fit: &Fit, m: &mut Map) {
    m.insert("residuals".into(), Dynamic::from(Series::from(fit.residuals.clone())));
    m.insert("r2".into(), f(fit.r2));
    m.insert("sigma".into(), f(fit.sigma));
    m.insert("dof".into(), Dynamic::from_int(fit.dof as i64));
    m.insert("rows".into(), Dynamic::from_array(rows(fit)));
}

fn linear_map(fit: &Fit) -> Map {
    let by_name = |v: &[f64]| -> Dynamic {
        Dynamic::from_map(fit.names.iter().zip(v).map(|(n, x)| (n.as_str().into(), f(*x))).collect())
    };
    let mut m = Map::new();
    m.insert("names".into(), Dynamic::from_array(fit.names.iter().map(|n| Dynamic::from(n.clone())).collect()));
    m.insert("coef".into(), by_name(&fit.coef));
    m.insert("stderr".into(), by_name(&fit.stderr));
    m.insert("lo".into(), by_name(&fit.lo));
    m.insert("hi".into(), by_name(&fit.hi));
    summary(fit, &mut m);
    m
}

fn curve_map(fit: &Fit) -> Map {
    let arr = |v: &[f64]| Dynamic::from_array(v.iter().map(|x| f(*x)).collect());
    let mut m = Map::new();
    m.insert("p".into(), arr(&fit.coef));
    m.insert("stderr".into(), arr(&fit.stderr));
    m.insert("lo".into(), arr(&fit.lo));
    m.insert("hi".into(), arr(&fit.hi));
    m.insert("iterations".into(), Dynamic::from_int(fit.iterations as i64));
    summary(fit, &mut m);
    m
}

fn linear(y: &Dynamic, opts: &Map) -> R<Map> {
    let y = series_of(y, "fit_linear: y")?;
    let mut intercept = true;
    let mut terms: Vec<(String, Vec<f64>)> = Vec::new();
    for (k, v) in opts {
        match k.as_str() {
            "terms" => {
                let t = v.clone().try_cast::<Map>().ok_or_else(|| {
                    format!("fit_linear: 'terms' must be a map #{{name: Series}}, found {}", v.type_name())
                })?;
                for (name, s) in t {
                    terms.push((name.to_string(), series_of(&s, &format!("fit_linear: term '{name}'"))?.to_vec()));
                }
            }
            "intercept" => {
                intercept = v
                    .as_bool()
                    .map_err(|_| format!("fit_linear: 'intercept' must be true or false, found {}", v.type_name()))?
            }
            other => {
                return Err(format!("fit_linear: unknown option '{other}'; the options are terms, intercept").into());
            }
        }
    }
    if intercept && terms.iter().any(|(n, _)| n == "intercept") {
        return Err(
            "fit_linear: a term is named 'intercept', which names the constant term; rename it or set intercept: false"
                .into(),
        );
    }
    Ok(linear_map(&lift(fit_linear(y.as_slice(), &terms, intercept))?))
}

fn curve(ctx: &NativeCallContext, fp: &FnPtr, x: &Dynamic, y: &Dynamic, p0: &Array) -> R<Map> {
    let x = series_of(x, "fit_curve: x")?;
    let y = series_of(y, "fit_curve: y")?;
    let p0: Vec<f64> = p0
        .iter()
        .enumerate()
        .map(|(j, v)| to_f64(v).map_err(|_| format!("fit_curve: p0[{j}] must be a number, found {}", v.type_name())))
        .collect::<Result<_, _>>()?;
    let xd = Dynamic::from(x.clone());
    let mut model = |p: &[f64]| -> Result<Vec<f64>, String> {
        let pa: Array = p.iter().map(|v| f(*v)).collect();
        let out: Dynamic = fp
            .call_within_context(ctx, (xd.clone(), Dynamic::from_array(pa)))
            .map_err(|e| format!("fit_curve: the model function failed: {e}"))?;
        if let Some(s) = out.clone().try_cast::<Series>() {
            Ok(s.to_vec())
        } else {
            let what = if out.is_float() || out.is_int() {
                "a single number".to_string()
            } else {
                format!("a {}", out.type_name())
            };
            Err(format!("fit_curve: the model function must return a Series (one value per x), returned {what}"))
        }
    };
    Ok(curve_map(&lift(fit_curve(&mut model, x.as_slice(), y.as_slice(), &p0))?))
}

pub fn register(engine: &mut Engine, session: &Shared) {
    let s = session.clone();
    api::fun(
        engine,
        "read_csv(path: string) -> map",
        "a CSV file with a header line (path relative to the script, below the project root; lines starting with # are comments): one Series per column, by header name; every cell must be a number; recorded in the report's provenance",
        move |path: &str| -> R<Map> {
            let text = s.lock().read_input(path).map_err(|e| format!("read_csv: {e}"))?;
            let cols = lift(parse_csv(&text, path))?;
            Ok(cols.into_iter().map(|(n, v)| (n.into(), Dynamic::from(Series::from(v)))).collect())
        },
    );
    api::fun(
        engine,
        "fit_linear(y: Series, #{terms: map, intercept: bool}) -> map",
        "linear least squares y ≈ intercept + Σ coef·term (SVD; intercept true by default): #{names, coef, stderr, lo, hi (95 % intervals; maps by name), residuals (Series), r2, sigma (residual σ), dof, rows (array of #{name, coef, stderr, lo, hi} for table)} Model y ≈ intercept + Σ coef·term with terms #{name: Series}.",
        |y: Dynamic, opts: Map| linear(&y, &opts),
    );
    api::fun(
        engine,
        "fit_curve(f: fn, x: Series, y: Series, p0: array) -> map",
        "nonlinear least squares of a script model by Levenberg–Marquardt from the start p0: #{p (array), stderr, lo, hi (95 % intervals from the Jacobian at the optimum; arrays), residuals (Series), r2, sigma, dof, iterations, rows (for table)} The model f(x: Series, p: array) returns a Series.",
        |ctx: NativeCallContext, fp: FnPtr, x: Dynamic, y: Dynamic, p0: Array| curve(&ctx, &fp, &x, &y, &p0),
    );
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn malformed_cells_are_named_by_line_and_column() {
        let e = parse_csv("i,period\n1e-6,2e-7\n2e-6,abc\n", "d.csv").unwrap_err();
        assert!(e.contains("'d.csv' line 3, column 'period' (2): 'abc' is not a number"), "{e}");
        let e = parse_csv("i,period\n1e-6,\n", "d.csv").unwrap_err();
        assert!(e.contains("line 2, column 'period' (2): the cell is empty"), "{e}");
        let e = parse_csv("i,period\n1e-6,2e-7,5\n", "d.csv").unwrap_err();
        assert!(e.contains("line 2: 3 cells where the header has 2 columns"), "{e}");
        let e = parse_csv("", "d.csv").unwrap_err();
        assert!(e.contains("is empty"), "{e}");
    }

    #[test]
    fn comments_and_spaces_are_allowed() {
        let c = parse_csv("# invented numbers\ni, period\n1e-6, 2e-7\n2e-6, 1e-7\n", "d.csv").unwrap();
        assert_eq!(c[1].0, "period");
        assert_eq!(c[1].1, vec![2e-7, 1e-7]);
    }
}
