//! The parasitics the period model knows, and masks that switch them on or off.

/// One parasitic effect (a group of keys). Off means ideal: zero capacitance, ideal current
/// source, zero offset, zero delay, instant reset.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Parasitic {
    /// The current reference's own temperature and supply law (a key `i` given as a reference).
    CurrentRef,
    /// The threshold generator's own temperature and supply law (`v_lo`, `v_hi` as references).
    ThresholdRef,
    /// Voltage coefficient of the timing capacitor (keys c_vc1, c_vc2).
    CapVc,
    /// Voltage coefficient of the timing resistor (key r_vc).
    ResVc,
    /// Junction capacitance the switches add to the node, versus voltage (c_swn, c_swp).
    SwitchCap,
    /// Input capacitance of the comparator / trigger / inverter on the node (c_in).
    InputCap,
    /// Output resistance of the current mirrors (r_out, v_ds_ref); with process mirrors, their
    /// whole output characteristic (Vds-dependent error, compliance).
    MirrorRout,
    /// Low-side versus high-side current mismatch (i_mismatch).
    Mismatch,
    /// Mismatch of the two ping-pong capacitors (c_mismatch).
    CapMismatch,
    /// Comparator offsets / threshold errors (vos_hi, vos_lo, vos).
    Offset,
    /// Comparator delay at the actual ramp slope (t_cmp, cmp_gbw).
    CmpDelay,
    /// Latch and logic delay (t_latch, t_logic).
    LogicDelay,
    /// Switch turn-over time (t_sw).
    SwitchDelay,
    /// Finite reset: pulse width and switch resistance (t_reset, r_reset).
    Reset,
}

pub const ALL: [Parasitic; 14] = [
    Parasitic::CurrentRef,
    Parasitic::ThresholdRef,
    Parasitic::CapVc,
    Parasitic::ResVc,
    Parasitic::SwitchCap,
    Parasitic::InputCap,
    Parasitic::MirrorRout,
    Parasitic::Mismatch,
    Parasitic::CapMismatch,
    Parasitic::Offset,
    Parasitic::CmpDelay,
    Parasitic::LogicDelay,
    Parasitic::SwitchDelay,
    Parasitic::Reset,
];

impl Parasitic {
    /// Stable short name (used as a metric / table key).
    pub fn name(self) -> &'static str {
        match self {
            Parasitic::CurrentRef => "current_ref",
            Parasitic::ThresholdRef => "threshold_ref",
            Parasitic::CapVc => "cap_vc",
            Parasitic::ResVc => "res_vc",
            Parasitic::SwitchCap => "switch_cap",
            Parasitic::InputCap => "input_cap",
            Parasitic::MirrorRout => "mirror_rout",
            Parasitic::Mismatch => "i_mismatch",
            Parasitic::CapMismatch => "c_mismatch",
            Parasitic::Offset => "offset",
            Parasitic::CmpDelay => "cmp_delay",
            Parasitic::LogicDelay => "logic_delay",
            Parasitic::SwitchDelay => "switch_delay",
            Parasitic::Reset => "reset",
        }
    }
    /// Human label for tables and plots.
    pub fn label(self) -> &'static str {
        match self {
            Parasitic::CurrentRef => "current reference",
            Parasitic::ThresholdRef => "threshold reference",
            Parasitic::CapVc => "capacitor voltage coefficient",
            Parasitic::ResVc => "resistor voltage coefficient",
            Parasitic::SwitchCap => "switch junction capacitance",
            Parasitic::InputCap => "comparator input capacitance",
            Parasitic::MirrorRout => "mirror output resistance and Vds error",
            Parasitic::Mismatch => "high/low current mismatch",
            Parasitic::CapMismatch => "capacitor mismatch",
            Parasitic::Offset => "comparator offset",
            Parasitic::CmpDelay => "comparator delay",
            Parasitic::LogicDelay => "latch and logic delay",
            Parasitic::SwitchDelay => "switch delay",
            Parasitic::Reset => "finite reset",
        }
    }
    /// Keys whose value may be a reference of this parasitic (none for the others).
    pub fn reference_keys(self) -> &'static [&'static str] {
        match self {
            Parasitic::CurrentRef => &["i"],
            Parasitic::ThresholdRef => &["v_lo", "v_hi"],
            _ => &[],
        }
    }
    /// Whether it belongs to the comparators (the "ideal comparators" scenario turns these off).
    pub fn is_comparator(self) -> bool {
        matches!(self, Parasitic::InputCap | Parasitic::Offset | Parasitic::CmpDelay)
    }
    /// Whether it belongs to the delay chain (comparator, latch, logic, switch).
    pub fn is_delay(self) -> bool {
        matches!(self, Parasitic::CmpDelay | Parasitic::LogicDelay | Parasitic::SwitchDelay)
    }
    fn bit(self) -> u32 {
        1 << (self as u32)
    }
}

/// A set of parasitics that are switched on.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub struct Mask(u32);

impl Mask {
    /// Nothing on: the ideal circuit.
    pub const NONE: Mask = Mask(0);
    /// Everything on: the real circuit.
    pub const ALL: Mask = Mask(u32::MAX);
    pub fn on(self, p: Parasitic) -> bool {
        self.0 & p.bit() != 0
    }
    pub fn with(self, p: Parasitic) -> Mask {
        Mask(self.0 | p.bit())
    }
    pub fn without(self, p: Parasitic) -> Mask {
        Mask(self.0 & !p.bit())
    }
    pub fn only(p: Parasitic) -> Mask {
        Mask(p.bit())
    }
}
