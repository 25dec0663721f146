//! Process description: MOSFET, resistor and capacitor parameters and named corners, read from
//! a TOML file in our own schema (docs/process-format.md). Every key is checked: unknown keys,
//! missing keys and out-of-range values are errors naming the key and the file.
use std::collections::BTreeMap;

/// One MOSFET type (all values SI; PMOS values are magnitudes).
#[derive(Clone, Debug, PartialEq)]
pub struct MosParams {
    /// Threshold voltage at tnom, V.
    pub vth0: f64,
    /// dVth/dT, V/K.
    pub tc_vth: f64,
    /// Mobility × Cox at tnom, A/V².
    pub kp: f64,
    /// Mobility temperature exponent: µ ∝ (T/Tnom)^−mu_exp.
    pub mu_exp: f64,
    /// Subthreshold slope factor.
    pub n: f64,
    /// Channel-length modulation × L, m/V (λ = lambda_l / L).
    pub lambda_l: f64,
    /// Gate oxide capacitance, F/m².
    pub cox: f64,
    /// Gate–source and gate–drain overlap capacitance per width, F/m.
    pub cgso: f64,
    pub cgdo: f64,
    /// Junction capacitance at zero bias: bottom (F/m²) and sidewall (F/m).
    pub cj: f64,
    pub cjsw: f64,
    /// Built-in potentials of bottom and sidewall junctions, V.
    pub pb: f64,
    pub pbsw: f64,
    /// Grading exponents of bottom and sidewall junctions.
    pub mj: f64,
    pub mjsw: f64,
    /// Length of a source/drain diffusion, m (area = W·ldiff, perimeter = W + 2·ldiff).
    pub ldiff: f64,
    /// Pelgrom coefficients: σ(ΔVT) = avt/√(WL) in V·m, σ(Δβ/β) = abeta/√(WL) in m.
    pub avt: f64,
    pub abeta: f64,
    /// Smallest drawn length and width, m.
    pub lmin: f64,
    pub wmin: f64,
}

/// A resistor layer.
#[derive(Clone, Debug, PartialEq)]
pub struct ResLayer {
    /// Sheet resistance, Ω/□.
    pub rsh: f64,
    /// First and second order temperature coefficients, 1/K and 1/K².
    pub tc1: f64,
    pub tc2: f64,
    /// Voltage coefficient, 1/V (R = R0·(1 + vc·|V|)).
    pub vc: f64,
    /// Matching: σ(ΔR/R) = a_r/√(WL), m.
    pub a_r: f64,
    /// Smallest drawn width, m.
    pub wmin: f64,
}

/// A capacitor type (MIM, poly–poly, …).
#[derive(Clone, Debug, PartialEq)]
pub struct CapType {
    /// Area capacitance F/m² and perimeter (fringe) capacitance F/m.
    pub c_area: f64,
    pub c_perim: f64,
    /// Voltage coefficients 1/V, 1/V² and temperature coefficients 1/K, 1/K².
    pub vc1: f64,
    pub vc2: f64,
    pub tc1: f64,
    pub tc2: f64,
    /// Matching: σ(ΔC/C) = a_c/√(WL), m.
    pub a_c: f64,
}

/// A named corner: shifts of the device parameters plus a supply and temperature.
#[derive(Clone, Debug, PartialEq)]
pub struct Corner {
    /// Threshold shifts, V (added to the magnitude), and kp factors.
    pub nmos_dvth: f64,
    pub nmos_kp: f64,
    pub pmos_dvth: f64,
    pub pmos_kp: f64,
    /// Factors on every resistor and every capacitor.
    pub res: f64,
    pub cap: f64,
    /// Supply, V, and temperature, °C.
    pub vdd: f64,
    pub temp: f64,
}

/// A whole process.
#[derive(Clone, Debug, PartialEq)]
pub struct Process {
    pub name: String,
    pub note: String,
    /// Temperature at which parameters are given, °C.
    pub tnom: f64,
    /// Nominal supply, V.
    pub vdd: f64,
    /// Temperature of the applied corner (tnom when none), °C.
    pub temp: f64,
    pub nmos: MosParams,
    pub pmos: MosParams,
    pub resistors: BTreeMap<String, ResLayer>,
    pub capacitors: BTreeMap<String, CapType>,
    pub corners: BTreeMap<String, Corner>,
    /// The parasitic vertical bipolar (section `[bipolar]`), if the file describes one.
    pub bipolar: Option<super::reference::Bipolar>,
    /// Name of the applied corner ("" for the nominal parameters).
    pub corner: String,
    /// Factors applied by the corner to resistors and capacitors.
    pub res_scale: f64,
    pub cap_scale: f64,
}

/// The built-in demo process (invented numbers, see the file's header).
pub const DEMO180_TOML: &str = include_str!("demo180.toml");

impl Process {
    /// The built-in generic 180 nm, 1.8 V demo process; every number in it is invented.
    pub fn demo180() -> Process {
        Process::from_toml(DEMO180_TOML, "demo180 (built-in)").unwrap_or_else(|e| panic!("built-in demo process: {e}"))
    }

    /// A built-in process by name.
    pub fn builtin(name: &str) -> Result<Process, String> {
        match name {
            "demo180" => Ok(Process::demo180()),
            _ => Err(format!(
                "no built-in process '{name}'; built-in processes: demo180 (use process_file(path) for a TOML file)"
            )),
        }
    }

    /// Parse a process description; `file` names the source in error messages.
    pub fn from_toml(text: &str, file: &str) -> Result<Process, String> {
        // A UTF-8 byte-order mark, as some editors write one, is not part of the file.
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        Self::parse_toml(text, file).map_err(|e| locate(text, file, &e))
    }

    fn parse_toml(text: &str, file: &str) -> Result<Process, String> {
        let root: toml::Table = text.parse().map_err(|e: toml::de::Error| toml_error(text, file, &e))?;
        let mut top = Reader::new(&root, "", file);
        let p = top.table("process")?;
        let mut pr = Reader::new(p, "process", file);
        let name = pr.string("name")?;
        let note = pr.opt_string("note")?.unwrap_or_default();
        let tnom = pr.num("tnom", -100.0, 200.0, "°C")?;
        let vdd = pr.num("vdd", 0.3, 20.0, "V")?;
        pr.finish()?;
        let nmos = mos_params(top.table("nmos")?, "nmos", file)?;
        let pmos = mos_params(top.table("pmos")?, "pmos", file)?;
        let mut resistors = BTreeMap::new();
        if let Some(t) = top.opt_table("resistor")? {
            for (k, v) in t {
                let path = format!("resistor.{k}");
                resistors.insert(k.clone(), res_layer(as_table(v, &path, file)?, &path, file)?);
            }
        }
        let mut capacitors = BTreeMap::new();
        if let Some(t) = top.opt_table("capacitor")? {
            for (k, v) in t {
                let path = format!("capacitor.{k}");
                capacitors.insert(k.clone(), cap_type(as_table(v, &path, file)?, &path, file)?);
            }
        }
        let mut corners = BTreeMap::new();
        if let Some(t) = top.opt_table("corner")? {
            for (k, v) in t {
                let path = format!("corner.{k}");
                corners.insert(k.clone(), corner(as_table(v, &path, file)?, &path, file, vdd, tnom)?);
            }
        }
        let bipolar = match top.opt_table("bipolar")? {
            Some(t) => Some(bipolar(t, file, tnom)?),
            None => None,
        };
        top.finish()?;
        Ok(Process {
            bipolar,
            name,
            note,
            tnom,
            vdd,
            temp: tnom,
            nmos,
            pmos,
            resistors,
            capacitors,
            corners,
            corner: String::new(),
            res_scale: 1.0,
            cap_scale: 1.0,
        })
    }

    /// Names of the corners defined in the process.
    pub fn corner_names(&self) -> Vec<String> {
        self.corners.keys().cloned().collect()
    }

    /// The process with a named corner applied (shifts taken from the nominal parameters).
    pub fn at_corner(&self, name: &str) -> Result<Process, String> {
        let c = self.corners.get(name).ok_or_else(|| {
            format!("process '{}' has no corner '{name}'; corners: {}", self.name, self.corner_names().join(", "))
        })?;
        if !self.corner.is_empty() {
            return Err(format!("corner '{}' is already applied; apply corners to the nominal process", self.corner));
        }
        let mut p = self.clone();
        p.nmos.vth0 += c.nmos_dvth;
        p.nmos.kp *= c.nmos_kp;
        p.pmos.vth0 += c.pmos_dvth;
        p.pmos.kp *= c.pmos_kp;
        p.res_scale = c.res;
        p.cap_scale = c.cap;
        p.vdd = c.vdd;
        p.temp = c.temp;
        p.corner = name.to_string();
        Ok(p)
    }

    /// The process at another supply, V (devices made from it use it).
    pub fn with_vdd(&self, vdd: f64) -> Result<Process, String> {
        if !(vdd.is_finite() && (0.3..=20.0).contains(&vdd)) {
            return Err(format!("vdd must be in 0.3..20 V, got {vdd}"));
        }
        Ok(Process { vdd, ..self.clone() })
    }

    /// The process at another temperature, °C (devices made from it use it).
    pub fn with_temp(&self, temp: f64) -> Result<Process, String> {
        super::constants::check_temp(temp)?;
        Ok(Process { temp, ..self.clone() })
    }

    pub fn resistor(&self, layer: &str) -> Result<&ResLayer, String> {
        self.resistors.get(layer).ok_or_else(|| {
            format!("process '{}' has no resistor layer '{layer}'; layers: {}", self.name, keys(&self.resistors))
        })
    }

    pub fn capacitor(&self, kind: &str) -> Result<&CapType, String> {
        self.capacitors.get(kind).ok_or_else(|| {
            format!("process '{}' has no capacitor type '{kind}'; types: {}", self.name, keys(&self.capacitors))
        })
    }
}

fn keys<T>(m: &BTreeMap<String, T>) -> String {
    if m.is_empty() { "none".into() } else { m.keys().cloned().collect::<Vec<_>>().join(", ") }
}

/// Keys of a MOSFET table: (key, lowest, highest, unit), in the order of `MosParams::values`.
pub const MOS_KEYS: [(&str, f64, f64, &str); 20] = [
    ("vth0", 0.05, 2.0, "V"),
    ("tc_vth", -5e-3, 1e-3, "V/K"),
    ("kp", 1e-6, 1e-2, "A/V²"),
    ("mu_exp", 0.0, 3.0, ""),
    ("n", 1.0, 3.0, ""),
    ("lambda_l", 0.0, 1e-6, "m/V"),
    ("cox", 1e-4, 1e-1, "F/m²"),
    ("cgso", 0.0, 1e-8, "F/m"),
    ("cgdo", 0.0, 1e-8, "F/m"),
    ("cj", 0.0, 1e-1, "F/m²"),
    ("cjsw", 0.0, 1e-8, "F/m"),
    ("pb", 0.1, 1.5, "V"),
    ("pbsw", 0.1, 1.5, "V"),
    ("mj", 0.1, 1.0, ""),
    ("mjsw", 0.1, 1.0, ""),
    ("ldiff", 0.0, 1e-4, "m"),
    ("avt", 0.0, 1e-7, "V·m"),
    ("abeta", 0.0, 1e-6, "m"),
    ("lmin", 1e-9, 1e-4, "m"),
    ("wmin", 1e-9, 1e-4, "m"),
];

impl MosParams {
    /// The parameters in the order of `MOS_KEYS`.
    pub fn values(&self) -> [f64; 20] {
        [
            self.vth0,
            self.tc_vth,
            self.kp,
            self.mu_exp,
            self.n,
            self.lambda_l,
            self.cox,
            self.cgso,
            self.cgdo,
            self.cj,
            self.cjsw,
            self.pb,
            self.pbsw,
            self.mj,
            self.mjsw,
            self.ldiff,
            self.avt,
            self.abeta,
            self.lmin,
            self.wmin,
        ]
    }

    /// Parameters from values in the order of `MOS_KEYS`.
    pub fn from_values(v: [f64; 20]) -> MosParams {
        let [
            vth0,
            tc_vth,
            kp,
            mu_exp,
            n,
            lambda_l,
            cox,
            cgso,
            cgdo,
            cj,
            cjsw,
            pb,
            pbsw,
            mj,
            mjsw,
            ldiff,
            avt,
            abeta,
            lmin,
            wmin,
        ] = v;
        MosParams {
            vth0,
            tc_vth,
            kp,
            mu_exp,
            n,
            lambda_l,
            cox,
            cgso,
            cgdo,
            cj,
            cjsw,
            pb,
            pbsw,
            mj,
            mjsw,
            ldiff,
            avt,
            abeta,
            lmin,
            wmin,
        }
    }

    /// Check explicit parameters against the ranges a process file allows; errors name the key.
    pub fn check(&self) -> Result<(), String> {
        for ((key, lo, hi, unit), x) in MOS_KEYS.iter().zip(self.values()) {
            if !(x.is_finite() && x >= *lo && x <= *hi) {
                return Err(format!("MOSFET parameter {key} = {x} is out of range; allowed {lo}..{hi} {unit}"));
            }
        }
        Ok(())
    }
}

fn mos_params(t: &toml::Table, path: &str, file: &str) -> Result<MosParams, String> {
    let mut r = Reader::new(t, path, file);
    let mut v = [0.0; 20];
    for (x, (key, lo, hi, unit)) in v.iter_mut().zip(MOS_KEYS) {
        *x = r.num(key, lo, hi, unit)?;
    }
    r.finish()?;
    Ok(MosParams::from_values(v))
}

fn res_layer(t: &toml::Table, path: &str, file: &str) -> Result<ResLayer, String> {
    let mut r = Reader::new(t, path, file);
    let l = ResLayer {
        rsh: r.num("rsh", 1e-3, 1e6, "Ω/□")?,
        tc1: r.num("tc1", -1e-2, 1e-2, "1/K")?,
        tc2: r.num("tc2", -1e-4, 1e-4, "1/K²")?,
        vc: r.num("vc", -0.1, 0.1, "1/V")?,
        a_r: r.num("a_r", 0.0, 1e-6, "m")?,
        wmin: r.num("wmin", 1e-9, 1e-4, "m")?,
    };
    r.finish()?;
    Ok(l)
}

fn cap_type(t: &toml::Table, path: &str, file: &str) -> Result<CapType, String> {
    let mut r = Reader::new(t, path, file);
    let c = CapType {
        c_area: r.num("c_area", 1e-6, 1.0, "F/m²")?,
        c_perim: r.num("c_perim", 0.0, 1e-8, "F/m")?,
        vc1: r.num("vc1", -0.1, 0.1, "1/V")?,
        vc2: r.num("vc2", -0.1, 0.1, "1/V²")?,
        tc1: r.num("tc1", -1e-2, 1e-2, "1/K")?,
        tc2: r.num("tc2", -1e-4, 1e-4, "1/K²")?,
        a_c: r.num("a_c", 0.0, 1e-6, "m")?,
    };
    r.finish()?;
    Ok(c)
}

fn bipolar(t: &toml::Table, file: &str, tnom: f64) -> Result<super::reference::Bipolar, String> {
    let mut r = Reader::new(t, "bipolar", file);
    let vbe_ref = r.num("vbe", 0.2, 1.0, "V")?;
    let b = super::reference::Bipolar {
        vbe_ref,
        vg0: r.num("vg0", 0.9, 1.5, "V")?,
        eta: r.num("eta", 0.0, 6.0, "")?,
        t_ref: tnom,
    };
    r.finish()?;
    b.check(&format!("{file}: bipolar"))?;
    Ok(b)
}

fn corner(t: &toml::Table, path: &str, file: &str, vdd: f64, tnom: f64) -> Result<Corner, String> {
    let mut r = Reader::new(t, path, file);
    let c = Corner {
        nmos_dvth: r.opt_num("nmos_dvth", -0.5, 0.5, "V")?.unwrap_or(0.0),
        nmos_kp: r.opt_num("nmos_kp", 0.2, 5.0, "")?.unwrap_or(1.0),
        pmos_dvth: r.opt_num("pmos_dvth", -0.5, 0.5, "V")?.unwrap_or(0.0),
        pmos_kp: r.opt_num("pmos_kp", 0.2, 5.0, "")?.unwrap_or(1.0),
        res: r.opt_num("res", 0.2, 5.0, "")?.unwrap_or(1.0),
        cap: r.opt_num("cap", 0.2, 5.0, "")?.unwrap_or(1.0),
        vdd: r.opt_num("vdd", 0.3, 20.0, "V")?.unwrap_or(vdd),
        temp: r.opt_num("temp", -100.0, 200.0, "°C")?.unwrap_or(tnom),
    };
    r.finish()?;
    Ok(c)
}

fn as_table<'a>(v: &'a toml::Value, path: &str, file: &str) -> Result<&'a toml::Table, String> {
    v.as_table().ok_or_else(|| format!("{file}: '{path}' must be a table ([{path}]), found {}", a_type(v)))
}

/// A TOML syntax error as `file:line:col: not valid TOML: message`.
fn toml_error(text: &str, file: &str, e: &toml::de::Error) -> String {
    let msg = e.message().trim_end().replace('\n', "; ");
    match e.span() {
        Some(span) => {
            let before = &text[..span.start.min(text.len())];
            let line = before.matches('\n').count() + 1;
            let col = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
            format!("{file}:{line}:{col}: not valid TOML: {msg}")
        }
        None => format!("{file}: not valid TOML: {msg}"),
    }
}

/// A TOML value's type with its article: "an integer", "a string".
fn a_type(v: &toml::Value) -> String {
    let t = v.type_str();
    if t.starts_with(['a', 'e', 'i', 'o', 'u']) { format!("an {t}") } else { format!("a {t}") }
}

/// A number as a reader types it: `1e-6`, not `0.000001`.
fn short(x: f64) -> String {
    if x != 0.0 && x.is_finite() && (x.abs() < 1e-3 || x.abs() >= 1e6) { format!("{x:e}") } else { format!("{x}") }
}

/// `file:line:col: ` for the key that a message of the process reader names (`key 'nmos.kp'`),
/// found by reading the text: the key's own line, or the header of its table when the key is
/// missing. Messages that name no key, or keys written in inline tables, stay as they are.
fn locate(text: &str, file: &str, msg: &str) -> String {
    let Some(rest) = msg.strip_prefix(&format!("{file}: ")) else { return msg.to_string() };
    let Some(k) = rest.find("key '").map(|k| k + 5) else { return msg.to_string() };
    let Some(path) = rest[k..].split('\'').next() else { return msg.to_string() };
    let (table, key) = path.rsplit_once('.').unwrap_or(("", path));
    let mut current = String::new();
    let mut header = if table.is_empty() { Some((1, 1)) } else { None };
    for (n, line) in text.lines().enumerate() {
        let t = line.trim_start();
        let col = line.len() - t.len() + 1;
        if let Some(h) = t.strip_prefix('[') {
            current = h.split(']').next().unwrap_or("").trim().to_string();
            if current == table {
                header = Some((n + 1, col));
            }
            continue;
        }
        if current == table {
            let name = t.split(['=', ' ', '\t']).next().unwrap_or("").trim_matches('"');
            if name == key && t.contains('=') {
                return format!("{file}:{}:{col}: {rest}", n + 1);
            }
        }
    }
    match header {
        Some((l, c)) if rest.starts_with("missing key") => format!("{file}:{l}:{c}: {rest}"),
        _ => msg.to_string(),
    }
}

/// Reads the keys of one table, remembering which were used so leftovers are reported.
struct Reader<'a> {
    t: &'a toml::Table,
    path: String,
    file: &'a str,
    used: Vec<&'static str>,
}

impl<'a> Reader<'a> {
    fn new(t: &'a toml::Table, path: &str, file: &'a str) -> Self {
        Reader { t, path: path.to_string(), file, used: Vec::new() }
    }
    fn full(&self, key: &str) -> String {
        if self.path.is_empty() { key.to_string() } else { format!("{}.{key}", self.path) }
    }
    fn table(&mut self, key: &'static str) -> Result<&'a toml::Table, String> {
        self.opt_table(key)?.ok_or_else(|| format!("{}: missing table [{}]", self.file, self.full(key)))
    }
    fn opt_table(&mut self, key: &'static str) -> Result<Option<&'a toml::Table>, String> {
        self.used.push(key);
        match self.t.get(key) {
            None => Ok(None),
            Some(v) => as_table(v, &self.full(key), self.file).map(Some),
        }
    }
    fn string(&mut self, key: &'static str) -> Result<String, String> {
        self.opt_string(key)?.ok_or_else(|| format!("{}: missing key '{}' (a string)", self.file, self.full(key)))
    }
    fn opt_string(&mut self, key: &'static str) -> Result<Option<String>, String> {
        self.used.push(key);
        match self.t.get(key) {
            None => Ok(None),
            Some(toml::Value::String(s)) => Ok(Some(s.clone())),
            Some(v) => Err(format!("{}: key '{}' must be a string, found {}", self.file, self.full(key), a_type(v))),
        }
    }
    fn num(&mut self, key: &'static str, lo: f64, hi: f64, unit: &str) -> Result<f64, String> {
        self.opt_num(key, lo, hi, unit)?.ok_or_else(|| {
            format!("{}: missing key '{}' (a number in {}..{} {unit})", self.file, self.full(key), short(lo), short(hi))
        })
    }
    /// A number: a TOML float or integer, or a string with an SI prefix ("5n", "8.5m").
    fn opt_num(&mut self, key: &'static str, lo: f64, hi: f64, unit: &str) -> Result<Option<f64>, String> {
        self.used.push(key);
        let full = self.full(key);
        let x = match self.t.get(key) {
            None => return Ok(None),
            Some(toml::Value::Float(x)) => *x,
            Some(toml::Value::Integer(i)) => *i as f64,
            Some(toml::Value::String(s)) => {
                crate::num::si::parse_number(s).map_err(|e| format!("{}: key '{full}': {e}", self.file))?
            }
            Some(v) => return Err(format!("{}: key '{full}' must be a number, found {}", self.file, a_type(v))),
        };
        if !(x.is_finite() && x >= lo && x <= hi) {
            return Err(format!(
                "{}: key '{full}' = {} is out of range; allowed {}..{} {unit}",
                self.file,
                short(x),
                short(lo),
                short(hi)
            ));
        }
        Ok(Some(x))
    }
    fn finish(&self) -> Result<(), String> {
        let unknown: Vec<&String> = self.t.keys().filter(|k| !self.used.contains(&k.as_str())).collect();
        match unknown.first() {
            None => Ok(()),
            Some(k) => {
                let where_ =
                    if self.path.is_empty() { "at the top level".to_string() } else { format!("in [{}]", self.path) };
                Err(format!(
                    "{}: unknown key '{}' {where_}; known keys: {}",
                    self.file,
                    self.full(k),
                    self.used.join(", ")
                ))
            }
        }
    }
}
