//! Semihosting: the command line and exit with a status.
//!
//! Semihosting calls trap into the debugger (here QEMU, run with
//! `-semihosting-config enable=on,target=native,arg=...`). Without a debugger attached the
//! trap is a HardFault, so call these only under QEMU or a semihosting-aware probe.
//!
//! * SYS_GET_CMDLINE (0x15) takes a two-word block [buffer address, buffer length]; the host
//!   writes the text and stores the used length back into the second word, which is read back
//!   with a volatile read (the compiler cannot see the host's write).
//! * SYS_EXIT (0x18) with ADP_Stopped_ApplicationExit ends QEMU with status 0;
//!   SYS_EXIT_EXTENDED (0x20) with [reason, code] ends it with `code`.

use core::ptr::{addr_of, read_volatile};
use cortex_m_semihosting::{nr, syscall};

/// Why the command line could not be read.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CmdlineError {
    /// The host refused the call (no command line, or it does not fit the buffer with its
    /// terminating NUL).
    Refused,
    /// The text is not UTF-8.
    NotUtf8,
}

/// Reads the semihosting command line into `buf` and returns it as text.
///
/// QEMU gives the `arg=` values joined by single spaces; the first one is the program name by
/// convention. `buf` must hold the whole line plus one NUL byte.
pub fn cmdline(buf: &mut [u8]) -> Result<&str, CmdlineError> {
    let block: [usize; 2] = [buf.as_mut_ptr() as usize, buf.len()];
    // SAFETY: GET_CMDLINE writes at most block[1] bytes to block[0] (our buffer, exclusively
    // borrowed) and writes block[1]; `block` lives until after the volatile read below.
    let status = unsafe { syscall(nr::GET_CMDLINE, &block) };
    // SAFETY: `block` is a live, aligned local; the host may have changed its second word.
    let used = unsafe { read_volatile(addr_of!(block[1])) };
    if status != 0 {
        return Err(CmdlineError::Refused);
    }
    let text = buf.get(..used.min(buf.len())).unwrap_or(&[]);
    core::str::from_utf8(text).map_err(|_| CmdlineError::NotUtf8)
}

/// ADP_Stopped_ApplicationExit, the "normal end" reason code of the exit calls.
const ADP_STOPPED_APPLICATION_EXIT: usize = 0x2_0026;
/// SYS_EXIT_EXTENDED.
const EXIT_EXTENDED: usize = 0x20;

/// Ends the run: QEMU exits with `status` (0 = success).
///
/// If the host ignores the call (no debugger), this spins forever.
pub fn exit(status: u8) -> ! {
    let block: [usize; 2] = [ADP_STOPPED_APPLICATION_EXIT, usize::from(status)];
    // SAFETY: EXIT_EXTENDED reads the two-word block; it does not return under QEMU.
    unsafe {
        syscall(EXIT_EXTENDED, &block);
    }
    // Fallback for a host without the extended call: plain exit, success or failure only.
    cortex_m_semihosting::debug::exit(if status == 0 {
        cortex_m_semihosting::debug::EXIT_SUCCESS
    } else {
        cortex_m_semihosting::debug::EXIT_FAILURE
    });
    loop {
        cortex_m::asm::wfi();
    }
}
