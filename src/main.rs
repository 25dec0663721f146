//! The `tickwork` command: parses the command line and hands it to `cli`; a panic is reported
//! in one line as a bug, never as the user's fault.
use clap::Parser;

fn main() {
    // A panic is a bug in tickwork, never the user's fault: say so in one line, no backtrace.
    std::panic::set_hook(Box::new(|info| {
        let place = info.location().map(|l| format!(" at {}:{}", l.file(), l.line())).unwrap_or_default();
        let msg = info
            .payload()
            .downcast_ref::<&str>()
            .map(|s| s.to_string())
            .or_else(|| info.payload().downcast_ref::<String>().cloned())
            .unwrap_or_default();
        // Never `eprintln!` here: a failed write to stderr inside the hook would abort.
        tickwork::engine::term::err(&format!(
            "tickwork: internal error{place}: {msg}\nthis is a bug in tickwork; please report it with the script that caused it"
        ));
    }));
    tickwork::num::alloc::keep_large_blocks();
    let cli = tickwork::cli::Cli::parse();
    let code = std::panic::catch_unwind(|| tickwork::cli::main(cli)).unwrap_or(101);
    std::process::exit(code);
}
