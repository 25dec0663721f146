//! The report functions as scripts call them: value formatting of `show`, `table` from maps
//! and arrays of maps, and errors that name the key and the allowed values.
use tickwork::engine::{
    self,
    sandbox::Sandbox,
    script::run_source,
    session::{Session, Shared},
};
use tickwork::report::Item;

fn run(code: &str) -> Result<Vec<Item>, String> {
    let dir = tempfile::tempdir().unwrap();
    let sandbox = Sandbox::new(dir.path(), &dir.path().join("out"), dir.path()).unwrap();
    let mut s = Session::new("t", sandbox);
    s.echo = false;
    let shared = Shared::new(s);
    let e = engine::build(&shared, engine::DEFAULT_MAX_OPS);
    run_source(&e, &shared, "t.rhai", code, engine::DEFAULT_MAX_OPS).map_err(|e| e.to_string())?;
    let g = shared.lock();
    Ok(g.report.items().cloned().collect())
}

fn shown(code: &str) -> String {
    match run(code).unwrap().pop() {
        Some(Item::Show { value, .. }) => value,
        other => panic!("not a show: {other:?}"),
    }
}

fn markdown(code: &str) -> String {
    match run(code).unwrap().pop() {
        Some(Item::Table(t)) => t.markdown(),
        other => panic!("not a table: {other:?}"),
    }
}

#[test]
fn show_formats() {
    assert_eq!(shown("show(\"t\", 2.5e-7, \"s\");"), "250 ns");
    assert_eq!(shown("show(\"t\", 2.5e-7, \"s\", #{digits: 4});"), "250.0 ns");
    assert_eq!(shown("show(\"n\", 12);"), "12");
    assert_eq!(shown("show(\"d\", 0.25, \"%\");"), "0.250 %");
    assert_eq!(shown("show(\"s\", span(1n, 3n, 3), \"s\");"), "n = 3, min 1.00 ns, mean 2.00 ns, max 3.00 ns");
    assert_eq!(shown("show(\"s\", span(1n, 3n, 3), \"s\", #{full: true});"), "[1.00 ns, 2.00 ns, 3.00 ns]");
    assert_eq!(shown("show(\"a\", [1.0, 2.0], \"V\");"), "n = 2, min 1.00 V, mean 1.50 V, max 2.00 V");
    assert_eq!(shown("show(\"codes\", series([3.0, 4.0]), #{full: true, digits: 2});"), "[3.0, 4.0]");
    assert!(
        run("show(\"x\", 1.0, \"s\", #{all: true});")
            .unwrap_err()
            .contains("unknown key 'all'; the keys are full, digits")
    );
}

#[test]
fn table_from_columns_and_rows() {
    let md = markdown(
        "table(#{temp: [-40, 27, 125], period: span(250n, 260n, 3)}, #{columns: [\"temp\", \"period\"], units: #{temp: \"°C\", period: \"s\"}});",
    );
    assert_eq!(md, "| temp (°C) | period (s) |\n| ---: | ---: |\n| -40 | 250n |\n| 27 | 255n |\n| 125 | 260n |\n");
    // Without `columns`, a map's columns come in name order.
    let md = markdown("table([#{corner: \"ss\", f: 3.9M}, #{corner: \"ff\", f: 4.1M}], #{units: #{f: \"Hz\"}});");
    assert_eq!(md, "| corner | f (Hz) |\n| --- | ---: |\n| ss | 3.90M |\n| ff | 4.10M |\n");
}

#[test]
fn table_errors_name_the_column() {
    assert!(run("table(#{a: [1.0, 2.0], b: [1.0]});").unwrap_err().contains("'a' has 2 values, 'b' has 1"));
    assert!(run("table(#{a: [1.0]}, #{columns: [\"b\"]});").unwrap_err().contains("'columns' names 'b'"));
    assert!(run("table([#{a: 1}, #{b: 2}]);").unwrap_err().contains("row 1 has the keys b; row 0 has a"));
    assert!(run("table(#{a: [1.0]}, #{units: #{z: \"s\"}});").unwrap_err().contains("'units' names column 'z'"));
}

#[test]
fn plot_and_metric_errors_name_the_key() {
    assert!(run("plot(#{x: [1.0], y: [1.0], colour: \"red\"});").unwrap_err().contains("unknown key 'colour'"));
    assert!(run("plot(#{kind: \"histogram\", y: [1.0]});").unwrap_err().contains("samples in 'x'"));
    assert!(
        run("metric(\"f\", 1.0, \"Hz\", #{minimum: 0.5});")
            .unwrap_err()
            .contains("unknown key 'minimum'; the keys are min, max")
    );
    assert!(run("metric(\"f\", 1.0, \"Hz\"); metric(\"f\", 2.0, \"Hz\");").unwrap_err().contains("recorded twice"));
    assert!(run("metric(\"f\", 0.0 / 0.0, \"Hz\");").unwrap_err().contains("finite"));
}

#[test]
fn figures_are_numbered_in_order() {
    let items = run("plot(#{title: \"A b\", x: [1.0, 2.0], y: [1.0, 2.0]}); let f = plot(#{x: [1.0, 2.0], y: [2.0, 1.0]}); print(f);").unwrap();
    let files: Vec<String> =
        items.iter().filter_map(|i| if let Item::Figure(f) = i { Some(f.file.clone()) } else { None }).collect();
    assert_eq!(files, ["fig-01-a-b.svg", "fig-02-plot.svg"]);
    assert!(matches!(items.last(), Some(Item::Text(t)) if t == "fig-02-plot.svg"));
}

#[test]
fn included_files_list_data_read_through_the_session() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::create_dir(dir.path().join("data")).unwrap();
    std::fs::write(dir.path().join("data/sim.csv"), "abc").unwrap();
    let sandbox = Sandbox::new(dir.path(), &dir.path().join("out"), dir.path()).unwrap();
    let mut s = Session::new("t", sandbox);
    s.read_input("data/sim.csv").unwrap();
    let files = s.provenance().inputs;
    // FIPS 180-2, appendix B.1: SHA-256("abc").
    assert_eq!(
        files,
        [("data/sim.csv".to_string(), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad".to_string())]
    );
}
