//! Running a firmware image under QEMU for the QEMU-in-the-loop tests: one emulated board,
//! its semihosting command line, a timeout, and the UART text it printed.

use std::io::Read;
use std::path::Path;
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

/// The emulated boards the project runs on.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Machine {
    /// `mps2-an386`, Cortex-M4F.
    Mps2An386,
    /// `microbit`, Cortex-M0.
    Microbit,
}

/// Runs `kernel` on `machine` with `program` and `args` on its semihosting command line.
/// Returns (exit status, UART text with carriage returns removed). Panics, failing the test,
/// when QEMU is missing (with the command that installs it) or the run exceeds `timeout`.
pub fn run<S: AsRef<str>>(
    machine: Machine,
    kernel: &Path,
    program: &str,
    args: &[S],
    timeout: Duration,
) -> (i32, String) {
    let mut semi = format!("enable=on,target=native,arg={program}");
    for a in args {
        let a = a.as_ref();
        assert!(!a.contains(','), "QEMU splits arg= at commas: {a:?}");
        semi.push_str(",arg=");
        semi.push_str(a);
    }
    let mut cmd = Command::new("qemu-system-arm");
    match machine {
        Machine::Mps2An386 => cmd
            .args(["-cpu", "cortex-m4", "-machine", "mps2-an386", "-nographic"])
            .args(["-monitor", "none", "-serial", "stdio"]),
        Machine::Microbit => cmd
            .args(["-cpu", "cortex-m0", "-machine", "microbit", "-nographic"])
            .args(["-monitor", "none"]),
    };
    let child = cmd
        .arg("-semihosting-config")
        .arg(&semi)
        .arg("-kernel")
        .arg(kernel)
        .stdin(Stdio::null())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn();
    let mut child = match child {
        Ok(c) => c,
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => {
            panic!("qemu-system-arm is not installed: run `cargo verify` (it installs QEMU), then retry")
        }
        Err(e) => panic!("cannot start qemu-system-arm: {e}"),
    };
    // Drain stdout on a thread so a full pipe cannot stall QEMU.
    let mut out = child.stdout.take().expect("piped stdout");
    let reader = std::thread::spawn(move || {
        let mut s = String::new();
        let _ = out.read_to_string(&mut s);
        s
    });
    let start = Instant::now();
    let status = loop {
        if let Some(st) = child.try_wait().expect("wait for qemu") {
            break st;
        }
        if start.elapsed() > timeout {
            let _ = child.kill();
            let _ = child.wait();
            let shown: Vec<&str> = args.iter().map(|a| a.as_ref()).collect();
            panic!("qemu run {shown:?} did not finish within {timeout:?}");
        }
        std::thread::sleep(Duration::from_millis(5));
    };
    let text = reader.join().expect("reader thread");
    (status.code().unwrap_or(-1), text.replace('\r', ""))
}
