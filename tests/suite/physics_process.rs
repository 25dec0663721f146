//! Process files: the demo parses, corners apply, and every bad file gives an error naming the
//! key and the file.
use tickwork::physics::process::{DEMO180_TOML, Process};

fn with(edit: impl Fn(&str) -> String) -> Result<Process, String> {
    Process::from_toml(&edit(DEMO180_TOML), "lab.toml")
}

#[test]
fn demo_process_parses_and_is_labelled_invented() {
    let p = Process::demo180();
    assert_eq!(p.name, "demo180");
    assert!(p.note.contains("invented"));
    assert!(DEMO180_TOML.contains("EVERY NUMBER IN THIS FILE IS INVENTED"));
    assert_eq!(p.vdd, 1.8);
    assert_eq!(p.nmos.vth0, 0.45);
    assert_eq!(p.corner_names(), ["ff", "ff_cold_high", "fs", "sf", "ss", "ss_hot_low", "tt"]);
    assert!(p.resistors.contains_key("rpoly") && p.capacitors.contains_key("mim"));
    assert!(Process::builtin("demo180").is_ok());
    assert!(Process::builtin("demo90").unwrap_err().contains("no built-in process 'demo90'"));
}

#[test]
fn corners_shift_devices_supply_and_temperature() {
    let p = Process::demo180();
    let ss = p.at_corner("ss_hot_low").unwrap();
    assert!((ss.nmos.vth0 - 0.49).abs() < 1e-12 && (ss.pmos.kp - 63e-6).abs() < 1e-15);
    assert_eq!((ss.vdd, ss.temp, ss.corner.as_str()), (1.6, 125.0, "ss_hot_low"));
    let fs = p.at_corner("fs").unwrap();
    assert!(fs.nmos.vth0 < p.nmos.vth0 && fs.pmos.vth0 > p.pmos.vth0);
    assert_eq!((fs.vdd, fs.temp), (p.vdd, p.tnom));
    let tt = p.at_corner("tt").unwrap();
    assert_eq!(tt.nmos, p.nmos);
    assert!(p.at_corner("xx").unwrap_err().contains("no corner 'xx'"));
    assert!(ss.at_corner("ff").unwrap_err().contains("already applied"));
}

#[test]
fn numbers_may_carry_si_prefixes() {
    let p = with(|t| t.replacen("avt = 5.0e-9", "avt = \"5n\"", 1)).unwrap();
    assert_eq!(p.nmos.avt, 5e-9);
    let p = with(|t| t.replacen("tnom = 27 ", "tnom = 27.0 ", 1)).unwrap();
    assert_eq!(p.tnom, 27.0);
}

#[test]
fn unknown_keys_are_errors_naming_key_and_file() {
    let e = with(|t| t.replacen("vth0 = 0.45", "vth0 = 0.45\nvto = 0.4", 1)).unwrap_err();
    assert!(e.contains("lab.toml") && e.contains("unknown key 'nmos.vto'") && e.contains("vth0"), "{e}");
    let e = with(|t| format!("{t}\n[bjt]\nbf = 100\n")).unwrap_err();
    assert!(e.contains("lab.toml") && e.contains("unknown key 'bjt'"), "{e}");
    let e = with(|t| t.replacen("[corner.ff]", "[corner.ff]\nnmos_vth = 0.1", 1)).unwrap_err();
    assert!(e.contains("unknown key 'corner.ff.nmos_vth'"), "{e}");
    let e = with(|t| t.replacen("a_c = 5.0e-9", "a_c = 5.0e-9\nq = 1", 1)).unwrap_err();
    assert!(e.contains("unknown key 'capacitor.mim.q'"), "{e}");
}

#[test]
fn missing_keys_are_errors_naming_key_and_file() {
    let e = with(|t| t.replacen("kp = 70e-6\n", "", 1)).unwrap_err();
    assert!(e.contains("lab.toml") && e.contains("missing key 'pmos.kp'") && e.contains("A/V²"), "{e}");
    let e = with(|t| t.replacen("rsh = 1000.0", "", 1)).unwrap_err();
    assert!(e.contains("missing key 'resistor.rpoly.rsh'"), "{e}");
    let e = with(|t| t.replacen("[nmos]", "[nmos_typo]", 1)).unwrap_err();
    assert!(e.contains("lab.toml") && e.contains("missing table [nmos]"), "{e}");
    let e = with(|t| t.replacen("name = \"demo180\"", "", 1)).unwrap_err();
    assert!(e.contains("missing key 'process.name'"), "{e}");
}

#[test]
fn out_of_range_and_wrong_types_are_errors() {
    let cases = [
        ("vth0 = 0.45", "vth0 = 4.5", "'nmos.vth0' = 4.5 is out of range"),
        ("n = 1.35", "n = 0.9", "'nmos.n' = 0.9 is out of range; allowed 1..3"),
        ("cox = 8.5e-3       # F/m² (tox ≈ 4 nm)", "cox = -1.0", "'nmos.cox' = -1 is out of range"),
        ("vdd = 1.8          # V", "vdd = \"high\"", "key 'process.vdd': 'high' is not a number"),
        ("vdd = 1.8          # V", "vdd = true", "key 'process.vdd' must be a number, found a boolean"),
        ("vdd = 1.8          # V", "vdd = nan", "'process.vdd' = NaN is out of range"),
        ("vdd = 1.8          # V", "vdd = inf", "'process.vdd' = inf is out of range"),
        ("name = \"demo180\"", "name = 180", "key 'process.name' must be a string"),
        ("[corner.tt]", "[corner.tt]\ntemp = 900", "'corner.tt.temp' = 900 is out of range"),
        ("rsh = 300.0", "rsh = 0", "'resistor.ppoly.rsh' = 0 is out of range"),
    ];
    for (from, to, want) in cases {
        assert!(DEMO180_TOML.contains(from), "{from}");
        let e = with(|t| t.replacen(from, to, 1)).unwrap_err();
        assert!(e.contains("lab.toml") && e.contains(want), "{to}: {e}");
    }
    let e = Process::from_toml("[process\nname=", "broken.toml").unwrap_err();
    assert!(e.contains("broken.toml") && e.contains("not valid TOML"), "{e}");
    let e = Process::from_toml("process = 3", "x.toml").unwrap_err();
    assert!(e.contains("'process' must be a table"), "{e}");
    let e = with(|t| t.replacen("[corner.tt]", "[corner]\ntt = 1\n", 1)).unwrap_err();
    assert!(e.contains("'corner.tt' must be a table"), "{e}");
}

#[test]
fn process_format_doc_lists_every_key() {
    // The documented schema (docs/process-format.md) names every key the reader accepts.
    let doc = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/docs/process-format.md")).unwrap();
    for line in DEMO180_TOML.lines() {
        let l = line.trim();
        if let Some((k, _)) = l.split_once('=') {
            let k = k.trim();
            assert!(doc.contains(&format!("`{k}`")), "docs/process-format.md does not document `{k}`");
        }
    }
    for k in ["note", "nmos_dvth", "nmos_kp", "pmos_dvth", "pmos_kp", "res", "cap", "vdd", "temp"] {
        assert!(doc.contains(&format!("`{k}`")), "`{k}` undocumented");
    }
}
