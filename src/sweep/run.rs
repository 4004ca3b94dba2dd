//! The sweep runner: tune, settle, read, stream each point to a sink; progress and cancel.

use super::{FrequencySource, PointReader, SweepPlan};
use crate::units::Hertz;
use embedded_hal::delay::DelayNs;

/// Whether a sweep goes on after a point or a progress report.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Flow {
    /// Go on with the next point.
    Continue,
    /// Stop the sweep now (a user cancel, or a sink that has seen enough).
    Stop,
}

/// One point of a running sweep, as handed to a [`PointSink`].
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SweepPoint<R> {
    /// Index in the plan, from 0.
    pub index: usize,
    /// Frequency of the point.
    pub frequency: Hertz,
    /// The reading taken there.
    pub reading: R,
}

/// Receives each point of a sweep as soon as it is read. Any
/// `FnMut(&SweepPoint<R>) -> Flow` closure is a sink.
pub trait PointSink<R> {
    /// Handle one point; return [`Flow::Stop`] to end the sweep.
    fn accept(&mut self, point: &SweepPoint<R>) -> Flow;
}

impl<R, F: FnMut(&SweepPoint<R>) -> Flow> PointSink<R> for F {
    fn accept(&mut self, point: &SweepPoint<R>) -> Flow {
        self(point)
    }
}

/// Told after each point how many of how many are done; may cancel. Any
/// `FnMut(usize, usize) -> Flow` closure is a progress callback.
pub trait Progress {
    /// `done` points of `total` are finished; return [`Flow::Stop`] to cancel.
    fn report(&mut self, done: usize, total: usize) -> Flow;
}

impl<F: FnMut(usize, usize) -> Flow> Progress for F {
    fn report(&mut self, done: usize, total: usize) -> Flow {
        self(done, total)
    }
}

/// A progress callback that never cancels.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct NoProgress;

impl Progress for NoProgress {
    fn report(&mut self, _done: usize, _total: usize) -> Flow {
        Flow::Continue
    }
}

/// How a sweep ended without a hardware error.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SweepOutcome {
    /// Points read and handed to the sink.
    pub points_done: usize,
    /// True when the sink or the progress callback stopped the sweep early.
    pub cancelled: bool,
}

/// A hardware failure during a sweep, with the index of the point that failed.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum RunError<S, R> {
    /// The frequency source failed.
    Source {
        /// Index of the point.
        index: usize,
        /// The source's error.
        error: S,
    },
    /// The reader failed.
    Reader {
        /// Index of the point.
        index: usize,
        /// The reader's error.
        error: R,
    },
}

/// Run `plan`: for each point tune `source`, wait its settling time on `delay`, read with
/// `reader`, hand the point to `sink`, then report to `progress`. Either may stop the sweep.
pub fn run_sweep<const N: usize, S, P, D, K, G>(
    plan: &SweepPlan<N>,
    source: &mut S,
    reader: &mut P,
    delay: &mut D,
    sink: &mut K,
    progress: &mut G,
) -> Result<SweepOutcome, RunError<S::Error, P::Error>>
where
    S: FrequencySource,
    P: PointReader,
    D: DelayNs,
    K: PointSink<P::Reading>,
    G: Progress,
{
    let total = plan.points();
    let mut previous: Option<Hertz> = None;
    let mut done = 0usize;
    for (index, frequency) in plan.iter() {
        source
            .set_frequency(frequency)
            .map_err(|error| RunError::Source { index, error })?;
        let wait = source.settling_time_us(previous, frequency);
        if wait > 0 {
            delay.delay_us(wait);
        }
        previous = Some(frequency);
        let reading = reader
            .read_point(frequency)
            .map_err(|error| RunError::Reader { index, error })?;
        let point = SweepPoint {
            index,
            frequency,
            reading,
        };
        let flow = sink.accept(&point);
        done = done.saturating_add(1);
        let flow2 = progress.report(done, total);
        if flow == Flow::Stop || flow2 == Flow::Stop {
            return Ok(SweepOutcome {
                points_done: done,
                cancelled: done < total,
            });
        }
    }
    Ok(SweepOutcome {
        points_done: done,
        cancelled: false,
    })
}

#[cfg(test)]
mod tests {
    use super::super::Spacing;
    use super::*;

    struct Src {
        tuned: [f32; 8],
        n: usize,
    }
    impl FrequencySource for Src {
        type Error = ();
        fn set_frequency(&mut self, f: Hertz) -> Result<(), ()> {
            if let Some(slot) = self.tuned.get_mut(self.n) {
                *slot = f.value();
            }
            self.n += 1;
            Ok(())
        }
        fn settling_time_us(&self, from: Option<Hertz>, _to: Hertz) -> u32 {
            if from.is_none() {
                100
            } else {
                10
            }
        }
    }
    struct Reader;
    impl PointReader for Reader {
        type Reading = f32;
        type Error = u8;
        fn read_point(&mut self, f: Hertz) -> Result<f32, u8> {
            if f.value() > 6.5 {
                Err(7)
            } else {
                Ok(f.value() * 2.0)
            }
        }
    }
    struct Delay(u32);
    impl DelayNs for Delay {
        fn delay_ns(&mut self, ns: u32) {
            self.0 += ns / 1000;
        }
        fn delay_us(&mut self, us: u32) {
            self.0 += us;
        }
    }

    #[test]
    fn streams_cancels_and_reports_errors() {
        let plan =
            SweepPlan::<8>::from_start_stop(Hertz::new(1.0), Hertz::new(5.0), 5, Spacing::Linear)
                .unwrap();
        let mut src = Src {
            tuned: [0.0; 8],
            n: 0,
        };
        let mut delay = Delay(0);
        let mut sum = 0.0;
        let out = run_sweep(
            &plan,
            &mut src,
            &mut Reader,
            &mut delay,
            &mut |p: &SweepPoint<f32>| {
                sum += p.reading;
                Flow::Continue
            },
            &mut NoProgress,
        )
        .unwrap();
        assert_eq!(
            out,
            SweepOutcome {
                points_done: 5,
                cancelled: false
            }
        );
        assert_eq!(sum, 30.0);
        assert_eq!(delay.0, 140);
        assert_eq!(src.tuned[..5], [1.0, 2.0, 3.0, 4.0, 5.0]);

        let out = run_sweep(
            &plan,
            &mut src,
            &mut Reader,
            &mut delay,
            &mut |_: &SweepPoint<f32>| Flow::Continue,
            &mut |done: usize, _total: usize| {
                if done == 2 {
                    Flow::Stop
                } else {
                    Flow::Continue
                }
            },
        )
        .unwrap();
        assert_eq!(
            out,
            SweepOutcome {
                points_done: 2,
                cancelled: true
            }
        );

        let plan =
            SweepPlan::<8>::from_start_stop(Hertz::new(5.0), Hertz::new(8.0), 4, Spacing::Linear)
                .unwrap();
        let e = run_sweep(
            &plan,
            &mut src,
            &mut Reader,
            &mut delay,
            &mut |_: &SweepPoint<f32>| Flow::Continue,
            &mut NoProgress,
        );
        assert_eq!(e, Err(RunError::Reader { index: 2, error: 7 }));
    }
}
