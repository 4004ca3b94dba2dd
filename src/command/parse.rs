//! Parsing one command line into a [`Command`].
//!
//! Words are separated by one or more spaces; words and numbers are ASCII. The command
//! set (our own words):
//!
//! | line | meaning | needs unlock |
//! |---|---|---|
//! | `stat` | send a status record | no |
//! | `show` | reply with all settings | no |
//! | `unlock` / `lock` | allow / refuse setting changes | no |
//! | `alarm trip <vswr>` | VSWR alarm trip point, e.g. `alarm trip 2.5` | yes |
//! | `alarm clear <vswr>` | VSWR below which the alarm clears | yes |
//! | `alarm holdoff <ms>` | time above trip before the alarm trips | yes |
//! | `alarm floor <W>` | forward power below which no alarm is raised | yes |
//! | `avg <n>` | readings averaged per report | yes |
//! | `band <start Hz> <stop Hz> <points>` | sweep range | yes |
//! | `rate <ms>` | report period, `0` = off | yes |
//! | `form text\|bin\|both` | report format | yes |
//! | `sweep` / `halt` | start / stop a sweep | no |
//! | `cal open\|short\|load` | measure a calibration standard | yes |
//! | `cal done` / `cal drop` | compute and keep / discard the calibration | yes |
//! | `keep` | write the settings to the store (and lock) | yes |
//!
//! Decimal values take at most 3 fraction digits (`2`, `2.5`, `2.500`). Everything else is
//! an unsigned decimal integer.
//!
//! Panic policy: nothing here panics; every malformed line gives a [`CommandError`].

use super::settings::ReportFormat;

/// The most words a command line has.
const MAX_WORDS: usize = 4;

/// A calibration step.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum CalStep {
    /// Measure the open standard.
    Open,
    /// Measure the short standard.
    Short,
    /// Measure the load standard.
    Load,
    /// Compute and keep the calibration (all three standards measured).
    Done,
    /// Discard the calibration in progress.
    Drop,
}

impl CalStep {
    /// The command word.
    pub fn word(self) -> &'static str {
        match self {
            CalStep::Open => "open",
            CalStep::Short => "short",
            CalStep::Load => "load",
            CalStep::Done => "done",
            CalStep::Drop => "drop",
        }
    }
}

/// One parsed command.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Command {
    /// `stat`.
    Status,
    /// `show`.
    Show,
    /// `unlock`.
    Unlock,
    /// `lock`.
    Lock,
    /// `alarm trip <vswr>`, ×1000.
    AlarmTrip(u32),
    /// `alarm clear <vswr>`, ×1000.
    AlarmClear(u32),
    /// `alarm holdoff <ms>`.
    AlarmHoldoff(u32),
    /// `alarm floor <W>`, in mW.
    AlarmFloor(u32),
    /// `avg <n>`.
    Average(u16),
    /// `band <start> <stop> <points>`.
    Band {
        /// Start, Hz.
        start_hz: u64,
        /// Stop, Hz.
        stop_hz: u64,
        /// Points.
        points: u16,
    },
    /// `rate <ms>`.
    Rate(u32),
    /// `form <format>`.
    Form(ReportFormat),
    /// `sweep`.
    Sweep,
    /// `halt`.
    Halt,
    /// `cal <step>`.
    Cal(CalStep),
    /// `keep`.
    Keep,
}

impl Command {
    /// True for commands that change stored settings or calibration (refused while locked).
    pub fn needs_unlock(&self) -> bool {
        !matches!(
            self,
            Command::Status
                | Command::Show
                | Command::Unlock
                | Command::Lock
                | Command::Sweep
                | Command::Halt
        )
    }
}

/// Why a command line was refused. Each has a stable numeric code for the reply line.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum CommandError {
    /// The line did not fit the input buffer.
    TooLong,
    /// The line has a byte that is not printable ASCII.
    NotText,
    /// The first word (or a sub-word) names no command.
    Unknown,
    /// A value is missing.
    Missing,
    /// More words than the command takes.
    Extra,
    /// A value is not a number in the expected format.
    Number,
    /// A value is outside its allowed range.
    Range,
    /// The change would leave the settings inconsistent (clear ≥ trip, start ≥ stop).
    Inconsistent,
    /// The device is locked: send `unlock` first.
    Locked,
    /// The command does not fit the device's state (e.g. `cal done` before all standards).
    State,
}

impl CommandError {
    /// The numeric code printed in the reply.
    pub fn code(self) -> u8 {
        match self {
            CommandError::TooLong => 1,
            CommandError::NotText => 2,
            CommandError::Unknown => 3,
            CommandError::Missing => 4,
            CommandError::Extra => 5,
            CommandError::Number => 6,
            CommandError::Range => 7,
            CommandError::Inconsistent => 8,
            CommandError::Locked => 9,
            CommandError::State => 10,
        }
    }
    /// A short explanation for the reply line.
    pub fn text(self) -> &'static str {
        match self {
            CommandError::TooLong => "line too long",
            CommandError::NotText => "not printable ASCII",
            CommandError::Unknown => "unknown command",
            CommandError::Missing => "value missing",
            CommandError::Extra => "too many words",
            CommandError::Number => "not a number",
            CommandError::Range => "value out of range",
            CommandError::Inconsistent => "settings would conflict",
            CommandError::Locked => "locked, send unlock first",
            CommandError::State => "not possible now",
        }
    }
}

/// An unsigned decimal integer of at most 19 digits.
pub(crate) fn parse_uint(s: &str) -> Result<u64, CommandError> {
    if s.is_empty() || s.len() > 19 || !s.bytes().all(|b| b.is_ascii_digit()) {
        return Err(CommandError::Number);
    }
    s.bytes().try_fold(0u64, |acc, b| {
        acc.checked_mul(10)
            .and_then(|a| a.checked_add(u64::from(b.wrapping_sub(b'0'))))
            .ok_or(CommandError::Range)
    })
}

/// A decimal with at most 3 fraction digits, in thousandths.
pub(crate) fn parse_milli(s: &str) -> Result<u64, CommandError> {
    let (int, frac) = s.split_once('.').unwrap_or((s, ""));
    if int.is_empty() || frac.len() > 3 || (s.contains('.') && frac.is_empty()) {
        return Err(CommandError::Number);
    }
    let i = parse_uint(int)?;
    let mut f = 0u64;
    let mut scale = 100u64;
    for b in frac.bytes() {
        if !b.is_ascii_digit() {
            return Err(CommandError::Number);
        }
        f = f.saturating_add(u64::from(b.wrapping_sub(b'0')).saturating_mul(scale));
        scale /= 10;
    }
    i.checked_mul(1000)
        .and_then(|v| v.checked_add(f))
        .ok_or(CommandError::Range)
}

fn narrow<T: TryFrom<u64>>(v: u64) -> Result<T, CommandError> {
    T::try_from(v).map_err(|_| CommandError::Range)
}

/// Parses one line (no line ending). `Ok(None)` for a blank line, which needs no reply.
pub fn parse(line: &str) -> Result<Option<Command>, CommandError> {
    if !line.bytes().all(|b| (0x20..=0x7E).contains(&b)) {
        return Err(CommandError::NotText);
    }
    let mut words = [""; MAX_WORDS];
    let mut n = 0usize;
    for w in line.split(' ').filter(|w| !w.is_empty()) {
        match words.get_mut(n) {
            Some(slot) => *slot = w,
            None => return Err(CommandError::Extra),
        }
        n = n.saturating_add(1);
    }
    let [w0, w1, w2, w3] = words;
    // How many words each command takes, checked after the match.
    let (cmd, takes) = match w0 {
        "" => return Ok(None),
        "stat" => (Command::Status, 1),
        "show" => (Command::Show, 1),
        "unlock" => (Command::Unlock, 1),
        "lock" => (Command::Lock, 1),
        "sweep" => (Command::Sweep, 1),
        "halt" => (Command::Halt, 1),
        "keep" => (Command::Keep, 1),
        "alarm" => {
            let value = || {
                if w2.is_empty() {
                    Err(CommandError::Missing)
                } else {
                    Ok(w2)
                }
            };
            let cmd = match w1 {
                "" => return Err(CommandError::Missing),
                "trip" => Command::AlarmTrip(narrow(parse_milli(value()?)?)?),
                "clear" => Command::AlarmClear(narrow(parse_milli(value()?)?)?),
                "holdoff" => Command::AlarmHoldoff(narrow(parse_uint(value()?)?)?),
                "floor" => Command::AlarmFloor(narrow(parse_milli(value()?)?)?),
                _ => return Err(CommandError::Unknown),
            };
            (cmd, 3)
        }
        "avg" => {
            if w1.is_empty() {
                return Err(CommandError::Missing);
            }
            (Command::Average(narrow(parse_uint(w1)?)?), 2)
        }
        "band" => {
            if w3.is_empty() {
                return Err(CommandError::Missing);
            }
            (
                Command::Band {
                    start_hz: parse_uint(w1)?,
                    stop_hz: parse_uint(w2)?,
                    points: narrow(parse_uint(w3)?)?,
                },
                4,
            )
        }
        "rate" => {
            if w1.is_empty() {
                return Err(CommandError::Missing);
            }
            (Command::Rate(narrow(parse_uint(w1)?)?), 2)
        }
        "form" => {
            if w1.is_empty() {
                return Err(CommandError::Missing);
            }
            let f = ReportFormat::from_word(w1).ok_or(CommandError::Unknown)?;
            (Command::Form(f), 2)
        }
        "cal" => {
            let step = match w1 {
                "" => return Err(CommandError::Missing),
                "open" => CalStep::Open,
                "short" => CalStep::Short,
                "load" => CalStep::Load,
                "done" => CalStep::Done,
                "drop" => CalStep::Drop,
                _ => return Err(CommandError::Unknown),
            };
            (Command::Cal(step), 2)
        }
        _ => return Err(CommandError::Unknown),
    };
    if n > takes {
        return Err(CommandError::Extra);
    }
    Ok(Some(cmd))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (line, expected), written out from the table in the module doc.
    const VECTORS: [(&str, Result<Option<Command>, CommandError>); 16] = [
        ("", Ok(None)),
        ("   ", Ok(None)),
        ("stat", Ok(Some(Command::Status))),
        ("alarm trip 2.5", Ok(Some(Command::AlarmTrip(2500)))),
        ("alarm  clear   2.125", Ok(Some(Command::AlarmClear(2125)))),
        ("alarm floor 0.005", Ok(Some(Command::AlarmFloor(5)))),
        ("alarm trip 2.5555", Err(CommandError::Number)),
        ("alarm trip 2.", Err(CommandError::Number)),
        ("alarm trip", Err(CommandError::Missing)),
        ("alarm trip 2 3", Err(CommandError::Extra)),
        ("avg 70000", Err(CommandError::Range)),
        (
            "band 7000000 7300000 101",
            Ok(Some(Command::Band {
                start_hz: 7_000_000,
                stop_hz: 7_300_000,
                points: 101,
            })),
        ),
        ("band 7000000 7300000", Err(CommandError::Missing)),
        ("form bin", Ok(Some(Command::Form(ReportFormat::Binary)))),
        ("cal sideways", Err(CommandError::Unknown)),
        ("st\u{7f}at", Err(CommandError::NotText)),
    ];

    #[test]
    fn vectors() {
        for (line, want) in VECTORS.iter() {
            assert_eq!(parse(line), *want, "{line:?}");
        }
        assert_eq!(
            parse("rate 99999999999999999999"),
            Err(CommandError::Number)
        );
        assert_eq!(parse("rate 9999999999999999999"), Err(CommandError::Range));
        assert_eq!(parse("a b c d e"), Err(CommandError::Extra));
    }
}
