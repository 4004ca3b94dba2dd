//! The command console: assembles bytes into bounded lines, parses them, enforces the
//! lock, applies setting changes and answers every line with one reply line.
//!
//! Reply lines:
//!
//! ```text
//! ok <the command, re-printed in canonical form>
//! ok show trip=3.000 clear=2.500 holdoff=100ms floor=0.000W avg=8 band=1000000Hz-30000000Hz/101 rate=1000ms form=text
//! err <code> <text>                    e.g.  err 9 locked, send unlock first
//! ```
//!
//! Lock: the console starts locked. `unlock` opens a window of [`UNLOCK_WINDOW_MS`];
//! `lock`, `keep`, or the window running out closes it. While locked, every command that
//! changes settings or calibration ([`Command::needs_unlock`]) is refused with
//! [`CommandError::Locked`] and changes nothing.
//!
//! Actions the console cannot perform itself (measure a standard, start a sweep, write the
//! store, send a status record) come back as an [`Action`] for the application.
//!
//! Panic policy: nothing here panics; time is a wrapping millisecond counter.

use core::fmt;

use super::parse::{parse, CalStep, Command, CommandError};
use super::settings::{Settings, SettingsError};

/// How long `unlock` allows changes, ms.
pub const UNLOCK_WINDOW_MS: u32 = 120_000;

/// Work the application must do after a command was accepted.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Action {
    /// Send a status record.
    ReportStatus,
    /// The settings changed in RAM (apply them; they are not stored yet).
    Apply,
    /// Write [`Console::settings`] to the store.
    Store,
    /// Start a sweep with the current band.
    StartSweep,
    /// Stop a sweep.
    Halt,
    /// Perform this calibration step.
    Calibrate(CalStep),
}

/// The answer to one line.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Reply {
    /// Accepted.
    Done(Command),
    /// Accepted `show`: the current settings.
    Settings(Settings),
    /// Refused.
    Refused(CommandError),
}

impl Reply {
    /// Writes the reply line, `\n` included.
    pub fn write_to<W: fmt::Write>(&self, w: &mut W) -> fmt::Result {
        match self {
            Reply::Refused(e) => writeln!(w, "err {} {}", e.code(), e.text()),
            Reply::Settings(s) => {
                w.write_str("ok show trip=")?;
                milli(w, u64::from(s.trip_vswr_milli))?;
                w.write_str(" clear=")?;
                milli(w, u64::from(s.clear_vswr_milli))?;
                write!(w, " holdoff={}ms floor=", s.holdoff_ms)?;
                milli(w, u64::from(s.floor_mw))?;
                writeln!(
                    w,
                    "W avg={} band={}Hz-{}Hz/{} rate={}ms form={}",
                    s.averaging,
                    s.start_hz,
                    s.stop_hz,
                    s.points,
                    s.report_period_ms,
                    s.report_format.word()
                )
            }
            Reply::Done(c) => {
                w.write_str("ok ")?;
                canonical(w, c)?;
                w.write_char('\n')
            }
        }
    }
}

/// `v / 1000` with three decimals.
fn milli<W: fmt::Write>(w: &mut W, v: u64) -> fmt::Result {
    write!(w, "{}.{:03}", v / 1000, v % 1000)
}

/// Prints a command as it would be typed.
fn canonical<W: fmt::Write>(w: &mut W, c: &Command) -> fmt::Result {
    match c {
        Command::Status => w.write_str("stat"),
        Command::Show => w.write_str("show"),
        Command::Unlock => w.write_str("unlock"),
        Command::Lock => w.write_str("lock"),
        Command::Sweep => w.write_str("sweep"),
        Command::Halt => w.write_str("halt"),
        Command::Keep => w.write_str("keep"),
        Command::AlarmTrip(v) => {
            w.write_str("alarm trip ")?;
            milli(w, u64::from(*v))
        }
        Command::AlarmClear(v) => {
            w.write_str("alarm clear ")?;
            milli(w, u64::from(*v))
        }
        Command::AlarmHoldoff(v) => write!(w, "alarm holdoff {v}"),
        Command::AlarmFloor(v) => {
            w.write_str("alarm floor ")?;
            milli(w, u64::from(*v))
        }
        Command::Average(n) => write!(w, "avg {n}"),
        Command::Band {
            start_hz,
            stop_hz,
            points,
        } => write!(w, "band {start_hz} {stop_hz} {points}"),
        Command::Rate(ms) => write!(w, "rate {ms}"),
        Command::Form(f) => write!(w, "form {}", f.word()),
        Command::Cal(s) => write!(w, "cal {}", s.word()),
    }
}

/// A reply and, when accepted, what the application must do.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Response {
    /// The reply line to send.
    pub reply: Reply,
    /// Work for the application.
    pub action: Option<Action>,
}

impl Response {
    fn refused(e: CommandError) -> Self {
        Response {
            reply: Reply::Refused(e),
            action: None,
        }
    }
}

/// The console. `N` is the input line capacity in bytes (line ending excluded).
#[derive(Clone, Debug)]
pub struct Console<const N: usize = 96> {
    buf: [u8; N],
    len: usize,
    overflow: bool,
    settings: Settings,
    unlocked_at: Option<u32>,
    /// Standards measured in the calibration in progress: open, short, load bits.
    cal_taken: u8,
    rx_errors: u16,
}

impl<const N: usize> Console<N> {
    /// A locked console holding `settings` (e.g. as loaded from the store).
    pub const fn new(settings: Settings) -> Self {
        Self {
            buf: [0; N],
            len: 0,
            overflow: false,
            settings,
            unlocked_at: None,
            cal_taken: 0,
            rx_errors: 0,
        }
    }

    /// The current settings (with any accepted changes).
    pub fn settings(&self) -> &Settings {
        &self.settings
    }

    /// Lines refused since power-up (saturating), for the status record.
    pub fn rx_errors(&self) -> u16 {
        self.rx_errors
    }

    /// True when setting changes are refused at time `now_ms`.
    pub fn is_locked(&self, now_ms: u32) -> bool {
        match self.unlocked_at {
            Some(t) => now_ms.wrapping_sub(t) >= UNLOCK_WINDOW_MS,
            None => true,
        }
    }

    /// Feeds one received byte. A `\n` ends a line (a `\r` before it is dropped); the
    /// line's response comes back then. Blank lines get no response.
    pub fn push(&mut self, byte: u8, now_ms: u32) -> Option<Response> {
        if byte != b'\n' {
            match self.buf.get_mut(self.len) {
                Some(slot) if !self.overflow => {
                    *slot = byte;
                    self.len = self.len.saturating_add(1);
                }
                _ => self.overflow = true,
            }
            return None;
        }
        let overflow = self.overflow;
        let len = self.len;
        self.len = 0;
        self.overflow = false;
        let r = if overflow {
            Some(Response::refused(CommandError::TooLong))
        } else {
            let mut line = self.buf.get(..len).unwrap_or(&[]);
            if let Some(stripped) = line.strip_suffix(b"\r") {
                line = stripped;
            }
            match core::str::from_utf8(line) {
                Ok(text) => {
                    // Copy out of the buffer so `handle` may borrow `self` mutably.
                    let mut copy = [0u8; N];
                    for (d, s) in copy.iter_mut().zip(text.bytes()) {
                        *d = s;
                    }
                    let text = core::str::from_utf8(copy.get(..text.len()).unwrap_or(&[]))
                        .unwrap_or("\u{1}");
                    self.handle_line(text, now_ms)
                }
                Err(_) => Some(Response::refused(CommandError::NotText)),
            }
        };
        if let Some(Response {
            reply: Reply::Refused(_),
            ..
        }) = r
        {
            self.rx_errors = self.rx_errors.saturating_add(1);
        }
        r
    }

    /// Handles one complete line (no line ending). `None` for a blank line.
    pub fn handle_line(&mut self, line: &str, now_ms: u32) -> Option<Response> {
        match parse(line) {
            Ok(None) => None,
            Ok(Some(cmd)) => Some(self.handle(cmd, now_ms)),
            Err(e) => Some(Response::refused(e)),
        }
    }

    /// Applies one parsed command at time `now_ms`.
    pub fn handle(&mut self, cmd: Command, now_ms: u32) -> Response {
        if self.is_locked(now_ms) {
            self.unlocked_at = None;
            if cmd.needs_unlock() {
                return Response::refused(CommandError::Locked);
            }
        }
        let done = |action| Response {
            reply: Reply::Done(cmd),
            action,
        };
        let mut next = self.settings;
        match cmd {
            Command::Status => return done(Some(Action::ReportStatus)),
            Command::Show => {
                return Response {
                    reply: Reply::Settings(self.settings),
                    action: None,
                }
            }
            Command::Unlock => {
                self.unlocked_at = Some(now_ms);
                return done(None);
            }
            Command::Lock => {
                self.unlocked_at = None;
                return done(None);
            }
            Command::Sweep => return done(Some(Action::StartSweep)),
            Command::Halt => return done(Some(Action::Halt)),
            Command::Keep => {
                self.unlocked_at = None;
                return done(Some(Action::Store));
            }
            Command::Cal(step) => {
                let bit = match step {
                    CalStep::Open => 1,
                    CalStep::Short => 2,
                    CalStep::Load => 4,
                    CalStep::Done => {
                        if self.cal_taken != 7 {
                            return Response::refused(CommandError::State);
                        }
                        self.cal_taken = 0;
                        return done(Some(Action::Calibrate(step)));
                    }
                    CalStep::Drop => {
                        self.cal_taken = 0;
                        return done(Some(Action::Calibrate(step)));
                    }
                };
                self.cal_taken |= bit;
                return done(Some(Action::Calibrate(step)));
            }
            Command::AlarmTrip(v) => next.trip_vswr_milli = v,
            Command::AlarmClear(v) => next.clear_vswr_milli = v,
            Command::AlarmHoldoff(v) => next.holdoff_ms = v,
            Command::AlarmFloor(v) => next.floor_mw = v,
            Command::Average(n) => next.averaging = n,
            Command::Band {
                start_hz,
                stop_hz,
                points,
            } => {
                next.start_hz = start_hz;
                next.stop_hz = stop_hz;
                next.points = points;
            }
            Command::Rate(ms) => next.report_period_ms = ms,
            Command::Form(f) => next.report_format = f,
        }
        match next.validate() {
            Ok(()) => {
                self.settings = next;
                done(Some(Action::Apply))
            }
            Err(SettingsError::Inconsistent) => Response::refused(CommandError::Inconsistent),
            Err(_) => Response::refused(CommandError::Range),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn feed(c: &mut Console, text: &str, now: u32) -> heapless::Vec<Response, 8> {
        let mut out = heapless::Vec::new();
        for b in text.bytes() {
            if let Some(r) = c.push(b, now) {
                out.push(r).unwrap();
            }
        }
        out
    }

    fn reply_text(r: &Response) -> heapless::String<200> {
        let mut s = heapless::String::new();
        r.reply.write_to(&mut s).unwrap();
        s
    }

    #[test]
    fn locked_refuses_then_unlock_allows_then_window_closes() {
        let mut c: Console = Console::new(Settings::DEFAULT);
        let r = feed(&mut c, "alarm trip 2.2\r\n", 0);
        assert_eq!(reply_text(&r[0]), "err 9 locked, send unlock first\n");
        assert_eq!(c.settings(), &Settings::DEFAULT);
        feed(&mut c, "unlock\n", 10);
        let r = feed(&mut c, "alarm trip 3.25\n", 20);
        assert_eq!(reply_text(&r[0]), "ok alarm trip 3.250\n");
        assert_eq!(r[0].action, Some(Action::Apply));
        assert_eq!(c.settings().trip_vswr_milli, 3250);
        // Below the clear point: refused, nothing changed.
        let r = feed(&mut c, "alarm trip 2.2\n", 21);
        assert_eq!(r[0].reply, Reply::Refused(CommandError::Inconsistent));
        assert_eq!(c.settings().trip_vswr_milli, 3250);
        let r = feed(&mut c, "avg 4\n", 10 + UNLOCK_WINDOW_MS);
        assert_eq!(r[0].reply, Reply::Refused(CommandError::Locked));
        assert_eq!(c.settings().averaging, Settings::DEFAULT.averaging);
    }

    #[test]
    fn over_long_line_is_one_error_and_next_line_works() {
        let mut c: Console<16> = Console::new(Settings::DEFAULT);
        let mut out = heapless::Vec::<Response, 4>::new();
        for b in b"show show show show show\nstat\n" {
            if let Some(r) = c.push(*b, 0) {
                out.push(r).unwrap();
            }
        }
        assert_eq!(out[0].reply, Reply::Refused(CommandError::TooLong));
        assert_eq!(out[1].action, Some(Action::ReportStatus));
        assert_eq!(c.rx_errors(), 1);
    }

    #[test]
    fn show_and_inconsistent_change() {
        let mut c: Console = Console::new(Settings::DEFAULT);
        let r = feed(&mut c, "show\n", 0);
        assert_eq!(
            reply_text(&r[0]),
            "ok show trip=3.000 clear=2.500 holdoff=100ms floor=0.000W avg=8 \
             band=1000000Hz-30000000Hz/101 rate=1000ms form=text\n"
        );
        feed(&mut c, "unlock\n", 0);
        let r = feed(&mut c, "alarm clear 3.5\n", 1);
        assert_eq!(r[0].reply, Reply::Refused(CommandError::Inconsistent));
        let r = feed(&mut c, "cal done\n", 1);
        assert_eq!(r[0].reply, Reply::Refused(CommandError::State));
        feed(&mut c, "cal open\ncal short\ncal load\n", 2);
        let r = feed(&mut c, "cal done\n", 3);
        assert_eq!(r[0].action, Some(Action::Calibrate(CalStep::Done)));
    }
}
