//! `capture`: read a serial capture of feedline reports (line records and/or binary
//! frames) from a file or stdin, check every CRC, write CSV and Touchstone files, and
//! report corrupted frames and lines (count and byte offsets) on stderr.
//!
//! ```text
//! cargo run -p feedline-host-tests --bin capture -- INPUT|- OUT_PREFIX
//! ```
//!
//! Writes `OUT_PREFIX-monitor.csv`, `OUT_PREFIX-points.csv` and one
//! `OUT_PREFIX-sweep<N>.s1p` (Touchstone 1.1, one port) per sweep found; a sweep with lost
//! points is still written, with the lost indices named in a comment and a warning on
//! stderr. Exit status: 0 when every frame and record line was good, 1 when some were
//! corrupted, 2 on a usage or I/O error.

use std::io::Read;
use std::process::ExitCode;

use feedline_host_tests::serial_capture as capture;

fn run() -> Result<bool, String> {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let [input, prefix] = args.as_slice() else {
        return Err("usage: capture INPUT|- OUT_PREFIX".into());
    };
    let mut bytes = Vec::new();
    if input == "-" {
        std::io::stdin()
            .read_to_end(&mut bytes)
            .map_err(|e| format!("stdin: {e}"))?;
    } else {
        bytes = std::fs::read(input).map_err(|e| format!("{input}: {e}"))?;
    }
    let cap = capture::scan(&bytes);
    let write = |name: String, text: String| {
        std::fs::write(&name, text).map_err(|e| format!("{name}: {e}"))
    };
    write(format!("{prefix}-monitor.csv"), capture::monitor_csv(&cap))?;
    write(format!("{prefix}-points.csv"), capture::points_csv(&cap))?;
    for (i, sw) in capture::sweeps(&cap).iter().enumerate() {
        if !sw.complete() {
            eprintln!(
                "capture: sweep {} (#{i}) is missing points; written with a comment",
                sw.sweep
            );
        }
        write(format!("{prefix}-sweep{i}.s1p"), sw.touchstone())?;
    }
    eprint!("{}", capture::summary(&cap));
    Ok(cap.corrupted.is_empty())
}

fn main() -> ExitCode {
    match run() {
        Ok(true) => ExitCode::SUCCESS,
        Ok(false) => ExitCode::from(1),
        Err(e) => {
            eprintln!("capture: {e}");
            ExitCode::from(2)
        }
    }
}
