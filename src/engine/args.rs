//! Reading the arguments of script functions: numbers (int or float, finite) and option maps
//! read strictly, so that an unknown key is an error that names the function and lists the
//! keys it knows. Every registration module reads its option maps through [`Opts`].
use rhai::{Dynamic, Map};

use super::value::{R, err, to_f64};

/// A finite number argument, named in the error.
pub fn num(v: &Dynamic, what: &str) -> R<f64> {
    let x = to_f64(v).map_err(|_| format!("{what} must be a number, found {}", v.type_name()))?;
    if !x.is_finite() {
        return err(format!("{what} must be finite, got {x}"));
    }
    Ok(x)
}

/// Strict reading of an option map: each read records the key, and [`Opts::finish`] rejects
/// any other key, naming the function and the keys it reads.
pub struct Opts<'a> {
    m: &'a Map,
    f: &'static str,
    used: Vec<&'static str>,
}

impl<'a> Opts<'a> {
    /// The option map `m` of the script function `f` (the name used in errors).
    pub fn new(m: &'a Map, f: &'static str) -> Self {
        Opts { m, f, used: Vec::new() }
    }

    /// The function name errors use.
    pub fn name(&self) -> &'static str {
        self.f
    }

    /// The raw value of `key`, if given.
    pub fn get(&mut self, key: &'static str) -> Option<&'a Dynamic> {
        self.used.push(key);
        self.m.get(key)
    }

    /// A required finite number.
    pub fn req(&mut self, key: &'static str) -> R<f64> {
        let f = self.f;
        match self.get(key) {
            Some(v) => num(v, &format!("{f}: key '{key}'")),
            None => err(format!("{f}: key '{key}' is required")),
        }
    }

    /// A finite number, `default` when absent.
    pub fn or(&mut self, key: &'static str, default: f64) -> R<f64> {
        let f = self.f;
        match self.get(key) {
            Some(v) => num(v, &format!("{f}: key '{key}'")),
            None => Ok(default),
        }
    }

    /// A finite number in `unit`, `default` when absent; the unit is named in the error.
    pub fn or_in(&mut self, key: &'static str, unit: &str, default: f64) -> R<f64> {
        let f = self.f;
        match self.get(key) {
            Some(v) => num(v, &format!("{f}: key '{key}' ({unit})")),
            None => Ok(default),
        }
    }

    /// An integer in `lo..=hi`, `default` when absent.
    pub fn int_in(&mut self, key: &'static str, lo: i64, hi: i64, default: i64) -> R<i64> {
        let f = self.f;
        match self.get(key) {
            None => Ok(default),
            Some(v) => match v.as_int() {
                Ok(n) if (lo..=hi).contains(&n) => Ok(n),
                _ => err(format!("{f}: key '{key}' must be an integer in {lo}..={hi}, got {v}")),
            },
        }
    }

    /// A string, `default` when absent.
    pub fn text(&mut self, key: &'static str, default: &str) -> R<String> {
        let f = self.f;
        match self.get(key) {
            None => Ok(default.to_string()),
            Some(v) => {
                v.clone().into_string().map_err(|t| format!("{f}: key '{key}' must be a string, found {t}").into())
            }
        }
    }

    /// `true` or `false`, `default` when absent.
    pub fn flag(&mut self, key: &'static str, default: bool) -> R<bool> {
        let f = self.f;
        match self.get(key) {
            None => Ok(default),
            Some(v) => v.as_bool().map_err(|t| format!("{f}: key '{key}' must be true or false, found {t}").into()),
        }
    }

    /// Marks keys as known without reading them (read elsewhere, e.g. as a Series).
    pub fn known(&mut self, keys: &[&'static str]) {
        self.used.extend_from_slice(keys);
    }

    /// An error for any key that was not read.
    pub fn finish(&self) -> R<()> {
        for k in self.m.keys() {
            if !self.used.contains(&k.as_str()) {
                return err(format!("{}: unknown key '{k}'; known keys: {}", self.f, self.used.join(", ")));
            }
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn map(pairs: &[(&str, Dynamic)]) -> Map {
        pairs.iter().map(|(k, v)| ((*k).into(), v.clone())).collect()
    }

    #[test]
    fn reads_numbers_ints_and_rejects_unknown_keys() {
        let m = map(&[("a", Dynamic::from_int(2)), ("b", Dynamic::from_float(0.5)), ("zz", Dynamic::TRUE)]);
        let mut o = Opts::new(&m, "f");
        assert_eq!(o.req("a").unwrap(), 2.0);
        assert_eq!(o.or("b", 9.0).unwrap(), 0.5);
        assert_eq!(o.or("c", 9.0).unwrap(), 9.0);
        let e = o.finish().unwrap_err().to_string();
        assert!(e.contains("f: unknown key 'zz'; known keys: a, b, c"), "{e}");
    }

    #[test]
    fn errors_name_the_function_the_key_and_the_range() {
        let m = map(&[("n", Dynamic::from_int(1)), ("s", Dynamic::from_float(1.0))]);
        let mut o = Opts::new(&m, "tempco");
        let e = o.int_in("n", 2, 10, 5).unwrap_err().to_string();
        assert!(e.contains("tempco: key 'n' must be an integer in 2..=10, got 1"), "{e}");
        let e = o.text("s", "").unwrap_err().to_string();
        assert!(e.contains("tempco: key 's' must be a string"), "{e}");
        let e = o.req("x").unwrap_err().to_string();
        assert!(e.contains("tempco: key 'x' is required"), "{e}");
        assert!(num(&Dynamic::from_float(f64::NAN), "v").is_err());
    }
}
