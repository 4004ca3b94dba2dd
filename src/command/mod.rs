//! Line commands for configuration and control: a bounded-input parser, a console that
//! enforces an unlock before any change to stored settings or calibration, and the
//! [`Settings`] those commands change, with a CRC-checked byte image for the
//! power-fail-safe store.
//!
//! - [`mod@parse`]: the command words and their grammar (our own), and [`CommandError`].
//! - [`console`]: byte-at-a-time line assembly into a fixed buffer, the lock with its
//!   timeout, reply lines, and the [`Action`]s left to the application.
//! - [`settings`]: the [`Settings`] struct, ranges, `encode`/`decode`, and its
//!   [`crate::store::Record`] implementation for the power-fail-safe A/B store.
//!
//! ```
//! use feedline::command::{Console, Settings, Reply, CommandError};
//! let mut console: Console = Console::new(Settings::DEFAULT);
//! let mut last = None;
//! for &b in b"avg 16\n" {
//!     if let Some(r) = console.push(b, 0) { last = Some(r.reply); }
//! }
//! assert_eq!(last, Some(Reply::Refused(CommandError::Locked)));
//! ```
//!
//! Not supported: passwords or per-user rights (the unlock guards against accidents and
//! stray bytes, not against an attacker on the serial line), line editing (backspace is
//! just a byte), command history.
//!
//! Panic policy: nothing here panics; every malformed or over-long line gets one typed
//! error and one `err` reply line.

pub mod console;
pub mod parse;
pub mod settings;

pub use console::{Action, Console, Reply, Response, UNLOCK_WINDOW_MS};
pub use parse::{parse, CalStep, Command, CommandError};
pub use settings::{ReportFormat, Settings, SettingsError, SETTINGS_TAG};
