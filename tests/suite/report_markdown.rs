//! Markdown rendering of a report built directly: section order, the preamble, fences for
//! printed text, escaping, the estimates note and the provenance block.
use tickwork::report::markdown::{ESTIMATES_NOTE, render};
use tickwork::report::{Item, Metric, Provenance, Report, Section, Spec};

fn prov() -> Provenance {
    Provenance {
        tool: "tickwork 0.1.0".into(),
        script: Some("scripts/clock.rhai".into()),
        script_sha256: Some("ab".repeat(32)),
        inputs: vec![("data/demo180.toml".into(), "cd".repeat(32))],
        overrides: [("C".to_string(), "2p".to_string())].into_iter().collect(),
        seed: 42,
        stamp: None,
    }
}

fn report() -> Report {
    let mut r = Report::new("clock");
    r.sections[0].items.push(Item::Text("before any prose".into()));
    r.sections.push(Section {
        prose: "## First".into(),
        line: 1,
        items: vec![Item::Show { label: "v_lo".into(), value: "0.600 V".into() }],
    });
    r.sections.push(Section {
        prose: "## Second".into(),
        line: 5,
        items: vec![Item::Text("a ``` fence inside".into()), Item::Text("and more".into())],
    });
    r
}

#[test]
fn sections_in_order_with_preamble_first() {
    let md = render(&report(), &prov());
    let at = |s: &str| md.find(s).unwrap_or_else(|| panic!("no '{s}' in\n{md}"));
    assert!(at("**Provenance**") < at("before any prose"));
    assert!(at("before any prose") < at("## First"));
    assert!(at("## First") < at("- **v\\_lo**: 0.600 V"));
    assert!(at("- **v\\_lo**") < at("## Second"));
    // Consecutive prints share one fence, longer than the backtick run inside them.
    assert!(md.contains("\n````text\na ``` fence inside\nand more\n````\n"), "{md}");
}

#[test]
fn provenance_block_lists_everything() {
    let md = render(&report(), &prov());
    let want = format!(
        "**Provenance**\n\n- tool: tickwork 0.1.0\n- script: `scripts/clock.rhai` (SHA-256 `{}`)\n- files read:\n  - `data/demo180.toml` (SHA-256 `{}`)\n- overrides: `--set C=2p`\n- seed: 42\n",
        "ab".repeat(32),
        "cd".repeat(32)
    );
    assert!(md.starts_with(&format!("# clock\n\n{want}")), "{md}");
    assert!(!md.contains("run at"));
}

#[test]
fn estimates_note_only_with_design_figures() {
    let mut r = Report::new("notes");
    r.sections[0].items.push(Item::Text("just text".into()));
    assert!(!render(&r, &prov()).contains(ESTIMATES_NOTE));
    r.sections[0].items.push(Item::Metric(Metric::new("osc.period", 2.5e-7, "s", Spec::default()).unwrap()));
    let md = render(&r, &prov());
    assert!(md.contains(ESTIMATES_NOTE));
    assert!(md.contains("| `osc.period` | 250 ns | — | — |"), "{md}");
    assert!(md.contains("- metric `osc.period` = 250 ns\n"), "{md}");
}
