//! The integration tests, one binary: linking one test executable instead of two dozen keeps
//! the test build short on small machines. Each module is one area; every external check names
//! its source beside it.
mod analysis_fit;
mod analysis_grid;
mod analysis_noise;
mod architecture;
mod bad_input;
mod cli_streams;
mod cli_util;
mod docs_coverage;
mod engine_errors;
mod engine_literals;
mod engine_set;
mod physics_api;
mod physics_circuits;
mod physics_laws;
mod physics_mosfet;
mod physics_process;
mod physics_reference;
mod prepass_robustness;
mod readme_tour;
mod repl_pipe;
mod report_api;
mod report_markdown;
mod report_plot;
mod report_run;
mod series_math;
mod stdlib_modules;
mod timing_generators;
mod timing_noise;
mod timing_process;
mod timing_properties;
mod timing_references;
mod timing_script;
mod timing_transient;
mod timing_variant;
mod weekly_run;
