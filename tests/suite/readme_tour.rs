//! The README's tour is real: its `rhai` block runs and prints what its `// →` comments say.
use crate::cli_util;
use cli_util::*;

#[test]
fn readme_tour_prints_what_it_claims() {
    let readme = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/README.md")).unwrap();
    let block =
        readme.split("```rhai\n").nth(1).and_then(|b| b.split("```").next()).expect("a rhai block in README.md");
    let claimed: Vec<String> =
        block.lines().filter_map(|l| l.split("// → ").nth(1)).map(|s| s.trim().to_string()).collect();
    assert!(!claimed.is_empty());
    let p = Project::new();
    p.write("tour.rhai", block);
    let o = p.tickwork(&["run", "tour.rhai"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let printed: Vec<String> = stdout(&o).lines().map(str::to_string).collect();
    assert_eq!(printed, claimed);
}
