//! Topology kinds and the parameter keys: units, defaults, ranges, and which parasitic each
//! key belongs to. A map with only the basic keys is the ideal circuit.
use crate::num::si::eng_exact;
use std::collections::BTreeMap;

use super::parasitic::Parasitic;
use super::reference::{Quantity, Reference};
use super::topology::{ALL, Topology};

/// A topology, by its script-level name. What it does is its `Topology` in the list
/// `topology::ALL`; the constants below name the built-in ones for Rust callers.
#[derive(Clone, Copy, PartialEq, Eq)]
pub struct Kind(&'static str);

#[allow(non_upper_case_globals)]
impl Kind {
    pub const RcInverter: Kind = Kind("rc-inverter");
    pub const Schmitt: Kind = Kind("schmitt");
    pub const Window: Kind = Kind("window");
    pub const Reset: Kind = Kind("reset");
    pub const PingPong: Kind = Kind("pingpong");
}

impl std::fmt::Debug for Kind {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "Kind({})", self.0)
    }
}

/// Where the parts come from: explicit numbers (`osc`) or the devices of a process (`osc_from`).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Mode {
    Explicit,
    Process,
}

impl Kind {
    /// Every topology, in the order of the list.
    pub fn all() -> impl Iterator<Item = Kind> {
        ALL.iter().map(|t| Kind(t.name()))
    }

    /// The behaviour of this topology.
    pub fn topology(self) -> &'static dyn Topology {
        // A `Kind` is made only by `parse` (from the list) or by the constants above, which a
        // unit test finds in the list.
        ALL.iter().copied().find(|t| t.name() == self.0).expect("every Kind is in topology::ALL")
    }

    /// How a script names this oscillator in messages: `osc("window")` for explicit numbers,
    /// `osc_from("window")` for process devices.
    pub fn caller(self, mode: Mode) -> String {
        match mode {
            Mode::Explicit => format!("osc(\"{}\")", self.name()),
            Mode::Process => format!("osc_from(\"{}\")", self.name()),
        }
    }

    /// Keys this kind accepts in `mode`.
    pub fn keys_for(self, mode: Mode) -> &'static [&'static str] {
        match mode {
            Mode::Explicit => self.keys(),
            Mode::Process => self.topology().process_keys(),
        }
    }

    pub fn name(self) -> &'static str {
        self.0
    }
    pub fn parse(s: &str) -> Result<Kind, String> {
        ALL.iter().find(|t| t.name() == s).map(|t| Kind(t.name())).ok_or_else(|| {
            let names: Vec<&str> = ALL.iter().map(|t| t.name()).collect();
            format!("unknown oscillator kind '{s}'; kinds are: {}", names.join(", "))
        })
    }
    /// Keys this kind accepts, basic keys first.
    pub fn keys(self) -> &'static [&'static str] {
        self.topology().keys()
    }
    /// The parasitics of this kind, in the order of the sequential build-up of the budget
    /// (parts of the ramp first, then the comparator and delay chain).
    pub fn parasitics(self) -> Vec<Parasitic> {
        let mut v: Vec<Parasitic> = super::parasitic::ALL
            .iter()
            .copied()
            .filter(|p| {
                self.keys().iter().any(|k| def(k).is_some_and(|d| d.group == Some(*p)))
                    || p.reference_keys().iter().any(|k| self.keys().contains(k))
            })
            .collect();
        v.sort();
        v
    }
}

/// Default of a key.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Dflt {
    /// Must be given (or, where the kind says so, derived from other keys).
    Required,
    /// Derived from other keys when absent (documented per key).
    Derived,
    Value(f64),
}

/// One key: name, unit, default, allowed range [min, max] (`open_min`: min itself excluded),
/// the parasitic it belongs to (None for basic keys) and what it means.
#[derive(Clone, Copy, Debug)]
pub struct KeyDef {
    pub name: &'static str,
    pub unit: &'static str,
    pub default: Dflt,
    pub min: f64,
    pub max: f64,
    pub open_min: bool,
    pub group: Option<Parasitic>,
    pub what: &'static str,
}

const INF: f64 = f64::INFINITY;

macro_rules! k {
    ($n:literal, $u:literal, $d:expr, $lo:expr, $hi:expr, $open:expr, $g:expr, $w:literal) => {
        KeyDef { name: $n, unit: $u, default: $d, min: $lo, max: $hi, open_min: $open, group: $g, what: $w }
    };
}

use Dflt::{Derived, Required, Value};
use Parasitic as P;

/// Every key of every kind.
pub const KEYS: &[KeyDef] = &[
    k!("c", "F", Required, 0.0, 1e-3, true, None, "timing capacitance"),
    k!("i", "A", Required, 0.0, 1.0, true, None, "charging current (reference of the mirrors)"),
    k!("r", "Ω", Required, 0.0, 1e12, true, None, "timing resistance (RC kinds)"),
    k!("v_lo", "V", Required, 0.0, 100.0, false, None, "low threshold / reset level (reset, pingpong: default 0)"),
    k!("v_hi", "V", Required, 0.0, 100.0, true, None, "high threshold / reference voltage"),
    k!("vdd", "V", Value(1.8), 0.0, 100.0, true, None, "supply voltage"),
    k!("temp", "°C", Value(27.0), -273.15, 500.0, true, None, "temperature"),
    k!("v_th", "V", Derived, 0.0, 100.0, true, None, "inverter switching threshold (default vdd/2)"),
    k!("vtn", "V", Derived, 0.0, 10.0, true, None, "NMOS threshold of the Schmitt trigger (derives v_hi)"),
    k!("vtp", "V", Derived, 0.0, 10.0, true, None, "|PMOS threshold| of the Schmitt trigger (derives v_lo)"),
    k!("ratio_pn", "1", Value(1.0), 0.0, 1e4, true, None, "inverter βp/βn (derives v_th with vtn, vtp)"),
    k!("ratio_n", "1", Value(1.0), 0.0, 1e4, true, None, "Schmitt trigger β1/β3 (NMOS stack / NMOS feedback)"),
    k!("ratio_p", "1", Value(1.0), 0.0, 1e4, true, None, "Schmitt trigger β5/β6 (PMOS stack / PMOS feedback)"),
    k!("tc_vt", "V/K", Value(0.0), -0.1, 0.1, false, None, "temperature coefficient of vtn and vtp"),
    k!("tc_i", "1/K", Value(0.0), -0.1, 0.1, false, None, "linear tempco of the current i about 27 °C"),
    k!("tc_r", "1/K", Value(0.0), -0.01, 0.01, false, None, "linear tempco of the resistor r about 27 °C"),
    k!("tc_c", "1/K", Value(0.0), -0.01, 0.01, false, None, "linear tempco of the capacitor c about 27 °C"),
    k!("r_vc", "1/V", Value(0.0), -0.1, 0.1, false, Some(P::ResVc), "resistor R(V) = r·(1 + r_vc·|V|), V across it"),
    k!("c_vc1", "1/V", Value(0.0), -0.1, 0.1, false, Some(P::CapVc), "capacitor C(V) = c·(1 + c_vc1·V + c_vc2·V²)"),
    k!("c_vc2", "1/V²", Value(0.0), -0.1, 0.1, false, Some(P::CapVc), "second-order capacitor voltage coefficient"),
    k!(
        "c_swn",
        "F",
        Value(0.0),
        0.0,
        1e-6,
        false,
        Some(P::SwitchCap),
        "zero-bias n-junction capacitance of the switches on the node (reverse bias V)"
    ),
    k!(
        "c_swp",
        "F",
        Value(0.0),
        0.0,
        1e-6,
        false,
        Some(P::SwitchCap),
        "zero-bias p-junction capacitance of the switches on the node (reverse bias vdd − V)"
    ),
    k!("sw_phi", "V", Value(0.8), 0.0, 5.0, true, Some(P::SwitchCap), "junction built-in potential"),
    k!("sw_m", "1", Value(0.5), 0.0, 1.0, true, Some(P::SwitchCap), "junction grading exponent"),
    k!(
        "c_in",
        "F",
        Value(0.0),
        0.0,
        1e-6,
        false,
        Some(P::InputCap),
        "input capacitance of each comparator (trigger, inverter) on the node"
    ),
    k!("r_out", "Ω", Value(INF), 0.0, INF, true, Some(P::MirrorRout), "output resistance of each current mirror"),
    k!(
        "v_ds_ref",
        "V",
        Value(0.6),
        0.0,
        100.0,
        false,
        Some(P::MirrorRout),
        "|Vds| at which a mirror gives exactly its nominal current"
    ),
    k!("i_mismatch", "1", Value(0.0), -0.9, 0.9, false, Some(P::Mismatch), "discharge current = i·(1 + i_mismatch)"),
    k!("c_mismatch", "1", Value(0.0), -0.9, 0.9, false, Some(P::CapMismatch), "second capacitor = c·(1 + c_mismatch)"),
    k!("vos_hi", "V", Value(0.0), -1.0, 1.0, false, Some(P::Offset), "offset of the high comparator (moves v_hi)"),
    k!("vos_lo", "V", Value(0.0), -1.0, 1.0, false, Some(P::Offset), "offset of the low comparator (moves v_lo)"),
    k!("vos", "V", Value(0.0), -1.0, 1.0, false, Some(P::Offset), "comparator offset / threshold shift"),
    k!("t_cmp", "s", Value(0.0), 0.0, 1.0, false, Some(P::CmpDelay), "fixed part of the comparator delay"),
    k!(
        "cmp_gbw",
        "Hz",
        Value(INF),
        0.0,
        INF,
        true,
        Some(P::CmpDelay),
        "comparator gain-bandwidth (ramp-slope dependent delay)"
    ),
    k!("cmp_a0", "1", Value(1e4), 1.0, 1e12, true, Some(P::CmpDelay), "comparator DC gain (V/V)"),
    k!("cmp_slew", "V/s", Value(INF), 0.0, INF, true, Some(P::CmpDelay), "comparator output slew rate"),
    k!(
        "cmp_vsw",
        "V",
        Derived,
        0.0,
        100.0,
        true,
        Some(P::CmpDelay),
        "comparator output swing to switch the latch (default vdd/2)"
    ),
    k!("t_latch", "s", Value(0.0), 0.0, 1.0, false, Some(P::LogicDelay), "latch (flip-flop) delay"),
    k!("t_logic", "s", Value(0.0), 0.0, 1.0, false, Some(P::LogicDelay), "logic (inverter, driver) delay"),
    k!("t_sw", "s", Value(0.0), 0.0, 1.0, false, Some(P::SwitchDelay), "switch turn-over time"),
    k!("t_reset", "s", Value(0.0), 0.0, 1.0, false, Some(P::Reset), "reset pulse width"),
    // Noise sources (no effect on the period; read by o.jitter() and simulate(…, #{noise: true})).
    k!(
        "i_noise",
        "A/√Hz",
        Value(0.0),
        0.0,
        1.0,
        false,
        None,
        "white noise density of each charging current (one-sided)"
    ),
    k!("i_flicker_fc", "Hz", Value(0.0), 0.0, 1e12, false, None, "flicker corner of the current noise (0: white only)"),
    k!("vn_cmp", "V/√Hz", Value(0.0), 0.0, 1.0, false, None, "input-referred white noise density of each comparator"),
    k!(
        "cmp_nbw",
        "Hz",
        Value(0.0),
        0.0,
        1e15,
        false,
        None,
        "noise bandwidth of the comparator input (default (π/2)·cmp_gbw/cmp_a0)"
    ),
    k!("vn_ref", "V", Value(0.0), 0.0, 1.0, false, None, "rms noise of each threshold reference at a decision"),
    k!("r_reset", "Ω", Value(0.0), 0.0, 1e12, false, Some(P::Reset), "on-resistance of the reset switch"),
    // Device sizes of oscillators built from a process (osc_from).
    k!("mirror_w", "m", Value(4e-6), 0.0, 1e-3, true, None, "width of the unit mirror device (process models)"),
    k!("mirror_l", "m", Value(2e-6), 0.0, 1e-3, true, None, "length of the mirror devices (process models)"),
    k!(
        "sw_w",
        "m",
        Value(1e-6),
        0.0,
        1e-3,
        true,
        None,
        "width of the NMOS switches; PMOS switches are twice as wide (process models)"
    ),
    k!("sw_l", "m", Value(0.18e-6), 0.0, 1e-3, true, None, "length of the switches (process models)"),
    k!("inv_wn", "m", Value(1e-6), 0.0, 1e-3, true, None, "NMOS width of the inverters (process models)"),
    k!("inv_wp", "m", Value(2e-6), 0.0, 1e-3, true, None, "PMOS width of the inverters (process models)"),
    k!("inv_l", "m", Value(0.18e-6), 0.0, 1e-3, true, None, "length of the inverter devices (process models)"),
    k!("cmp_w", "m", Value(4e-6), 0.0, 1e-3, true, None, "width of each comparator input device (process models)"),
    k!("cmp_l", "m", Value(1e-6), 0.0, 1e-3, true, None, "length of the comparator input devices (process models)"),
    k!("cmp_itail", "A", Value(2e-6), 0.0, 1.0, true, None, "comparator tail current (process models)"),
    k!(
        "cmp_cload",
        "F",
        Value(20e-15),
        0.0,
        1e-9,
        true,
        None,
        "load capacitance of the comparator's first stage (process models)"
    ),
];

pub fn def(name: &str) -> Option<&'static KeyDef> {
    KEYS.iter().find(|d| d.name == name)
}

/// Checked parameter values of one oscillator (only the keys given; defaults come from the
/// key table).
#[derive(Clone, Debug, PartialEq)]
pub struct Params {
    pub kind: Kind,
    pub mode: Mode,
    given: BTreeMap<&'static str, f64>,
    /// Keys whose value is a reference (its nominal value is in `given`).
    refs: BTreeMap<&'static str, Reference>,
}

impl Params {
    /// Check `pairs` against the keys of `kind`: unknown keys (listing the valid ones),
    /// values out of range (naming the key and range), missing required keys.
    pub fn new(kind: Kind, pairs: &[(String, f64)]) -> Result<Params, String> {
        Params::new_in(kind, Mode::Explicit, pairs)
    }

    /// As `new`, for the keys of `mode`.
    pub fn new_in(kind: Kind, mode: Mode, pairs: &[(String, f64)]) -> Result<Params, String> {
        Params::with_references(kind, mode, pairs, &[])
    }

    /// As `new_in`, with some keys given as references (`i: ptat(750n)`, `v_hi: ladder(0.75)`):
    /// a reference not yet pinned to a supply is pinned to this oscillator's `vdd`, and its
    /// nominal value is the key's number, checked like any other.
    pub fn with_references(
        kind: Kind,
        mode: Mode,
        pairs: &[(String, f64)],
        refs: &[(String, Reference)],
    ) -> Result<Params, String> {
        let keys = kind.keys_for(mode);
        if keys.is_empty() {
            return Err(format!(
                "osc_from: a \"{}\" oscillator cannot be built from process models yet; use osc(\"{}\", #{{...}}) with explicit numbers",
                kind.name(),
                kind.name()
            ));
        }
        let find = |k: &str| {
            keys.iter()
                .copied()
                .find(|n| *n == k)
                .ok_or_else(|| format!("{}: unknown key '{k}'; valid keys are: {}", kind.caller(mode), keys.join(", ")))
        };
        let vdd = pairs.iter().find(|(k, _)| k == "vdd").map_or_else(
            || match def("vdd").map(|d| d.default) {
                Some(Dflt::Value(v)) => v,
                _ => f64::NAN,
            },
            |(_, v)| *v,
        );
        let mut ref_map = BTreeMap::new();
        let mut all: Vec<(&'static str, f64)> = Vec::with_capacity(pairs.len() + refs.len());
        for (k, r) in refs {
            let name = find(k)?;
            let d = def(name).ok_or_else(|| format!("internal: key '{name}' has no definition"))?;
            let fits = match r.quantity {
                Quantity::Current => name == "i",
                Quantity::Voltage => matches!(name, "v_lo" | "v_hi"),
            };
            if !fits {
                return Err(format!(
                    "{}: key '{k}' ({}, {}) cannot take the reference {}: a current reference is a value of 'i', a threshold reference one of 'v_lo' or 'v_hi'",
                    kind.caller(mode),
                    d.what,
                    d.unit,
                    r.describe()
                ));
            }
            let r = r.pinned(vdd);
            all.push((name, r.nominal()));
            ref_map.insert(name, r);
        }
        for (k, v) in pairs {
            let name = find(k)?;
            ref_map.remove(name);
            all.retain(|(n, _)| *n != name);
            all.push((name, *v));
        }
        let mut given = BTreeMap::new();
        for (name, v) in all {
            let d = def(name).ok_or_else(|| format!("internal: key '{name}' has no definition"))?;
            check_range(d, v).map_err(|e| match ref_map.get(name) {
                Some(r) => format!("{}: {e} (the nominal value of {})", kind.caller(mode), r.describe()),
                None => format!("{}: {e}", kind.caller(mode)),
            })?;
            given.insert(name, v);
        }
        let p = Params { kind, mode, given, refs: ref_map };
        p.check_required().map_err(|e| format!("{}: {e}", kind.caller(mode)))?;
        Ok(p)
    }

    /// The same parameters with some keys replaced (checked the same way).
    /// A key that holds a reference keeps it, scaled to the new nominal value, so that a sweep,
    /// a sensitivity or a Monte Carlo draw of `i` moves the reference's level, not its law.
    pub fn with(&self, pairs: &[(String, f64)]) -> Result<Params, String> {
        self.with_all(pairs, &[])
    }

    /// As `with`, some keys given new references (which replace what they held).
    pub fn with_all(&self, pairs: &[(String, f64)], new_refs: &[(String, Reference)]) -> Result<Params, String> {
        let mut all: Vec<(String, f64)> =
            self.given.iter().filter(|(k, _)| !self.refs.contains_key(*k)).map(|(k, v)| (k.to_string(), *v)).collect();
        let mut refs: Vec<(String, Reference)> = self.refs.iter().map(|(k, r)| (k.to_string(), r.clone())).collect();
        for (k, v) in pairs {
            if let Some((_, r)) = refs.iter_mut().find(|(a, _)| a == k) {
                let nom = r.nominal();
                *r = if nom != 0.0 { r.scaled(*v / nom) } else { r.clone() };
                continue;
            }
            all.retain(|(a, _)| a != k);
            all.push((k.clone(), *v));
        }
        for (k, r) in new_refs {
            all.retain(|(a, _)| a != k);
            refs.retain(|(a, _)| a != k);
            refs.push((k.clone(), r.clone()));
        }
        Params::with_references(self.kind, self.mode, &all, &refs)
    }

    /// The reference a key holds, if it holds one.
    pub fn reference(&self, key: &str) -> Option<&Reference> {
        self.refs.get(key)
    }

    /// Keys that hold references, with them.
    pub fn references(&self) -> impl Iterator<Item = (&'static str, &Reference)> + '_ {
        self.refs.iter().map(|(k, r)| (*k, r))
    }

    fn check_required(&self) -> Result<(), String> {
        self.need("c")?;
        self.kind.topology().check_required(self)
    }

    /// An error naming `key` unless it was given.
    pub fn need(&self, key: &str) -> Result<(), String> {
        if self.has(key) { Ok(()) } else { Err(format!("key '{key}' is required")) }
    }

    pub fn has(&self, key: &str) -> bool {
        self.given.contains_key(key)
    }

    /// Value of `key` as given, else its default; NaN for a derived key that is absent (the
    /// caller derives it) or a key this kind does not have.
    pub fn get(&self, key: &str) -> f64 {
        if let Some(v) = self.given.get(key) {
            return *v;
        }
        match def(key).map(|d| d.default) {
            Some(Dflt::Value(v)) => v,
            _ => {
                debug_assert!(def(key).is_some(), "unknown key {key}");
                f64::NAN
            }
        }
    }

    /// Keys given explicitly, with their values.
    pub fn given(&self) -> impl Iterator<Item = (&'static str, f64)> + '_ {
        self.given.iter().map(|(k, v)| (*k, *v))
    }

    /// The given keys of the parasitics in `groups`, as `name = value unit` (engineering
    /// notation), for messages.
    pub fn given_in(&self, groups: &[Parasitic]) -> Vec<String> {
        self.given
            .iter()
            .filter_map(|(k, v)| {
                let d = def(k)?;
                let unit = if d.unit == "1" { "" } else { d.unit };
                (d.group.is_some_and(|g| groups.contains(&g)))
                    .then(|| format!("{k} = {}", eng_exact(*v, unit).trim_end()))
            })
            .collect()
    }

    /// Whether any key of parasitic `p` was given a value other than its ideal default.
    pub fn sets(&self, p: Parasitic) -> bool {
        if p.reference_keys().iter().any(|k| self.refs.contains_key(k)) {
            return true;
        }
        self.given.iter().any(|(k, v)| {
            def(k).is_some_and(|d| {
                d.group == Some(p)
                    && d.default != Dflt::Value(*v)
                    && !matches!(*k, "sw_phi" | "sw_m" | "v_ds_ref" | "cmp_vsw")
            })
        })
    }
}

fn check_range(d: &KeyDef, v: f64) -> Result<(), String> {
    let lo_ok = if d.open_min { v > d.min } else { v >= d.min };
    if v.is_nan() || !lo_ok || v > d.max {
        let lb = if d.open_min { "(" } else { "[" };
        let unit = if d.unit == "1" { "" } else { d.unit };
        // Bounds and value each with their unit (and prefix): `(0, 1 mF]`, `= -500 mV`.
        let show = |x: f64| if x == 0.0 { "0".to_string() } else { eng_exact(x, unit).trim_end().to_string() };
        let value = eng_exact(v, unit).trim_end().to_string();
        return Err(format!(
            "key '{}' ({}) = {value} is out of range {lb}{}, {}]",
            d.name,
            d.what,
            show(d.min),
            show(d.max)
        ));
    }
    Ok(())
}
