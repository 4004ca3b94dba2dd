//! The bare-metal side: UART, exit, command line, markers, stack painting, panic handler.

use core::hint::black_box;
use core::ptr::{read_volatile, write_volatile};

/// Word written over free stack RAM by [`paint_stack`].
pub const PAINT: u32 = 0xC5AC_CE55;

#[cfg(board_m0)]
mod uart {
    //! nRF51 UART0 (QEMU `microbit`).
    const BASE: usize = 0x4000_2000;
    const TASKS_STARTTX: usize = BASE + 0x008;
    const EVENTS_TXDRDY: usize = BASE + 0x11C;
    const ENABLE: usize = BASE + 0x500;
    const TXD: usize = BASE + 0x51C;

    pub fn init() {
        // SAFETY: fixed, documented peripheral registers of the emulated nRF51.
        unsafe {
            super::write_volatile(ENABLE as *mut u32, 4);
            super::write_volatile(TASKS_STARTTX as *mut u32, 1);
        }
    }

    pub fn put(byte: u8) {
        // SAFETY: as above.
        unsafe {
            super::write_volatile(EVENTS_TXDRDY as *mut u32, 0);
            super::write_volatile(TXD as *mut u32, u32::from(byte));
            while super::read_volatile(EVENTS_TXDRDY as *const u32) == 0 {}
        }
    }
}

#[cfg(board_m4f)]
mod uart {
    //! CMSDK APB UART0 (QEMU `mps2-an386`).
    const BASE: usize = 0x4000_4000;
    const DATA: usize = BASE;
    const STATE: usize = BASE + 0x04;
    const CTRL: usize = BASE + 0x08;

    pub fn init() {
        // SAFETY: fixed, documented peripheral registers of the emulated MPS2 board.
        unsafe { super::write_volatile(CTRL as *mut u32, 1) }
    }

    pub fn put(byte: u8) {
        // SAFETY: as above.
        unsafe {
            while super::read_volatile(STATE as *const u32) & 1 != 0 {}
            super::write_volatile(DATA as *mut u32, u32::from(byte));
        }
    }
}

/// Enables the UART transmitter.
pub fn uart_init() {
    uart::init();
}

/// Writes bytes to the UART.
pub fn write_bytes(bytes: &[u8]) {
    for &b in bytes {
        uart::put(b);
    }
}

/// Writes a string to the UART.
pub fn write_str(s: &str) {
    write_bytes(s.as_bytes());
}

/// Writes a word as 8 lower-case hex digits.
pub fn write_hex(x: u32) {
    let mut buf = [0u8; 8];
    for (i, b) in buf.iter_mut().enumerate() {
        let nibble = (x >> (28 - 4 * i)) & 0xF;
        *b = b"0123456789abcdef"[nibble as usize];
    }
    write_bytes(&buf);
}

/// Writes a word in decimal.
pub fn write_dec(mut x: u32) {
    let mut buf = [0u8; 10];
    let mut i = buf.len();
    loop {
        i -= 1;
        buf[i] = b'0' + (x % 10) as u8;
        x /= 10;
        if x == 0 {
            break;
        }
    }
    write_bytes(&buf[i..]);
}

/// Ends the emulation through semihosting SYS_EXIT with success or failure.
pub fn exit(ok: bool) -> ! {
    use cortex_m_semihosting::debug;
    debug::exit(if ok {
        debug::EXIT_SUCCESS
    } else {
        debug::EXIT_FAILURE
    });
    loop {
        cortex_m::asm::wfi();
    }
}

/// Reads the semihosting command line (the `arg=` values QEMU was given, joined by spaces)
/// into `buf` and returns the part used. Empty when the host gives none.
pub fn cmdline(buf: &mut [u8]) -> &[u8] {
    // Parameter block of SYS_GET_CMDLINE: [buffer address, buffer length]; the host writes the
    // used length back into the second word.
    let mut block = [buf.as_mut_ptr() as usize, buf.len().saturating_sub(1)];
    // SAFETY: the block and the buffer outlive the call; the host writes at most `len` bytes.
    let rc = unsafe {
        cortex_m_semihosting::syscall1(
            cortex_m_semihosting::nr::GET_CMDLINE,
            block.as_mut_ptr() as usize,
        )
    };
    // SAFETY: reading back our own local, written by the host behind the compiler's back.
    let used = unsafe { read_volatile(&block[1]) };
    if rc != 0 {
        return &[];
    }
    &buf[..used.min(buf.len())]
}

/// Start marker: the host starts counting at this function's address.
#[inline(never)]
#[no_mangle]
pub extern "C" fn bench_start() {
    black_box(1u32);
}

/// Stop marker: the host stops counting at this function's address.
#[inline(never)]
#[no_mangle]
pub extern "C" fn bench_stop() {
    black_box(2u32);
}

/// Fills free RAM from `__sheap` up to the current stack pointer with [`PAINT`]; returns the
/// stack pointer it painted up to.
#[inline(always)]
pub fn paint_stack() -> usize {
    extern "C" {
        static __sheap: u32;
    }
    let sp: usize;
    // SAFETY: writes only below the current stack pointer (free, unused RAM) and above the
    // end of the statics; uses no stack itself.
    unsafe {
        core::arch::asm!(
            "mov {end}, sp",
            "2:",
            "cmp {p}, {end}",
            "bhs 3f",
            "str {pat}, [{p}]",
            "adds {p}, #4",
            "b 2b",
            "3:",
            p = inout(reg) core::ptr::addr_of!(__sheap) as usize => _,
            end = out(reg) sp,
            pat = in(reg) PAINT,
        );
    }
    sp
}

/// The lowest address, between `__sheap` and the current stack pointer, whose word no longer
/// holds [`PAINT`] (the stack pointer itself when none was touched).
#[inline(always)]
pub fn stack_low_water() -> usize {
    extern "C" {
        static __sheap: u32;
    }
    let low: usize;
    // SAFETY: reads only RAM between the end of the statics and the stack pointer.
    unsafe {
        core::arch::asm!(
            "mov {end}, sp",
            "2:",
            "cmp {p}, {end}",
            "bhs 3f",
            "ldr {v}, [{p}]",
            "cmp {v}, {pat}",
            "bne 3f",
            "adds {p}, #4",
            "b 2b",
            "3:",
            p = inout(reg) core::ptr::addr_of!(__sheap) as usize => low,
            end = out(reg) _,
            v = out(reg) _,
            pat = in(reg) PAINT,
        );
    }
    low
}

#[panic_handler]
fn panic(_info: &core::panic::PanicInfo) -> ! {
    write_str("\nPANIC\n");
    exit(false)
}
