//! In-line line monitor in integer fixed point, for a transmitter feed line watched by a
//! Cortex-M0 (no FPU, no divide instruction).
//!
//! What it computes, once per reading of forward and reflected power (integer microwatts):
//! delivered power (forward − reflected), VSWR and return loss (Q16.16 fixed point, through a
//! [`LineMath`] chain; [`PowerChain`] builds it on [`crate::fixed`]'s log2/exp2), a boxcar average over the last `averaging` readings, peak hold over each
//! report interval, an SWR alarm with hold-off and hysteresis, a transmitter-protection output
//! through an embedded-hal 1.0 [`OutputPin`](embedded_hal::digital::OutputPin), and a report
//! every `report_every` readings.
//!
//! Method: VSWR = (1 + |Γ|)/(1 − |Γ|) with |Γ| = √(P_ref/P_fwd) and return loss
//! = 10·log10(P_fwd/P_ref) (textbook transmission-line relations; see [`crate::reflection`]).
//! The alarm is a two-threshold comparator with counters, common practice for protection
//! circuits: it trips after `hold_off` consecutive readings strictly above the trip threshold,
//! and clears after `clear_count` consecutive readings strictly below the lower clear
//! threshold, or never by itself when latched.
//!
//! Supported: powers up to `u32::MAX` µW (about 4.29 kW); VSWR capped at 1000 and return loss
//! at 100 dB like the f32 path. A reading whose forward power is below the configured gate
//! (transmitter unkeyed) is "idle": it cannot advance a trip and counts towards clearing, since
//! no power means no danger. Not supported: directivity correction (feed corrected powers) and
//! time-based (rather than reading-count) scheduling.
//!
//! Panic policy: nothing here panics; all arithmetic is saturating or checked, and the buffers
//! are fixed arrays reached through `get`/`get_mut`.

mod alarm;
mod average;
mod config;
mod line_monitor;
mod math;
mod power_chain;
mod protection;

pub use alarm::{AlarmEvent, AlarmState, SwrAlarm};
pub use average::Averager;
pub use config::{ConfigError, MonitorConfig};
pub use line_monitor::{Monitor, Report, Step};
pub use math::{LineFigures, LineMath, PowerReading};
pub use power_chain::{PowerChain, GAMMA_BOUND};
pub use protection::{PinSense, Protection};
