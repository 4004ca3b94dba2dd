//! The scenario cables described by the core's line models (`feedline::line`).
//!
//! A named cable is an invented datasheet: nominal Z0, velocity factor and matched loss at a
//! few frequencies. The firmware fits the core's two-term model α(f) = k1·√f + k2·f to those
//! points ([`LossModel::least_squares`]) and the simulated front end takes the cable's loss and
//! phase from it at every frequency it simulates. A cable given only as `--cable-db100` (a loss
//! at the scenario frequency) becomes a one-point model of pure conductor loss, k1·√f.
//!
//! Panic policy: nothing here panics; a model the core refuses gives `None`.

use feedline::line::{Line, LossModel, LossPoint};
use feedline::units::{DbPer, Hertz, Meters, Ohms};

/// An invented cable datasheet.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CableType {
    /// Option value naming it.
    pub name: &'static str,
    /// Words for the report.
    pub title: &'static str,
    /// Velocity factor.
    pub vf: f32,
    /// (MHz, dB per 100 m) datasheet points.
    pub points: [(f32, f32); 5],
}

/// The named cables (all invented for the demo).
pub const CABLES: [CableType; 2] = [
    CableType {
        name: "pe-5mm",
        title: "invented 5 mm solid-PE coax",
        vf: 0.66,
        points: [
            (10.0, 3.9),
            (50.0, 9.0),
            (145.0, 15.8),
            (435.0, 28.5),
            (1296.0, 52.0),
        ],
    },
    CableType {
        name: "foam-10mm",
        title: "invented 10 mm foam-PE coax",
        vf: 0.85,
        points: [
            (10.0, 1.3),
            (50.0, 3.0),
            (145.0, 5.2),
            (435.0, 9.4),
            (1296.0, 17.5),
        ],
    },
];

impl CableType {
    /// The cable called `name`.
    pub fn named(name: &str) -> Option<&'static CableType> {
        CABLES.iter().find(|c| c.name == name)
    }

    /// The datasheet points in the core's type.
    pub fn loss_points(&self) -> [LossPoint; 5] {
        self.points.map(|(mhz, db100)| {
            LossPoint::new(Hertz::new(mhz * 1.0e6), DbPer::<Meters>::new(db100 / 100.0))
        })
    }

    /// The core's least-squares fit of the points.
    pub fn model(&self) -> Option<LossModel> {
        LossModel::least_squares(&self.loss_points()).ok()
    }
}

/// The loss model of a scenario cable: the named one's fit, or a flat loss `db100` at
/// `f_mhz` taken as pure conductor loss (k2 = 0).
pub fn loss_model(named: Option<&CableType>, db100: f32, f_mhz: f32) -> Option<LossModel> {
    match named {
        Some(c) => c.model(),
        None => {
            let root = libm::sqrtf(f_mhz);
            if root.is_nan() || root <= 0.0 {
                return None;
            }
            LossModel::new::<Meters>(db100 / 100.0 / root, 0.0).ok()
        }
    }
}

/// The core's line at `f` for a loss model, Z0 and velocity factor.
pub fn line_at(model: &LossModel, f: Hertz, z0: f32, vf: f32) -> Option<Line> {
    model.line_at(f, Ohms::new(z0), vf).ok()
}
