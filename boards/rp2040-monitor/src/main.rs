//! In-line line monitor on an RP2040 (Cortex-M0+, no FPU): an ADS1115 reads the forward and
//! reflected detectors of a directional coupler in the transmitter's feed line, the board turns
//! the voltages into powers with its first-calibration constants, and feedline's fixed-point
//! monitor (`feedline::monitor`) averages, holds peaks, raises the SWR alarm and drives the
//! transmitter-protection output (GPIO15, high = transmit permitted). Reports and alarm events
//! go out with defmt over RTT. Wiring, detector assumptions and first calibration: README.md
//! beside this file.
//!
//! The board code only moves data between the drivers and the core; every computation that
//! decides the alarm is in `feedline` (tested on the host and on an emulated Cortex-M0).
#![no_std]
#![no_main]

mod detector;

use defmt_rtt as _;
use embedded_hal::delay::DelayNs;
use embedded_hal::digital::{InputPin, OutputPin, PinState};
use feedline::fixed::VswrQ16;
use feedline::monitor::{AlarmEvent, Monitor, MonitorConfig, PinSense, PowerChain, PowerReading};
use feedline_drivers::ads1115::{Ads1115, Input, Range, Rate, ADDRESS_GND};
use panic_probe as _;
use rp2040_hal::{
    self as hal,
    clocks::init_clocks_and_plls,
    fugit::RateExtU32,
    gpio::{FunctionI2C, Pin, PullUp},
    pac,
    watchdog::Watchdog,
    Clock, Sio, Timer, I2C,
};

use detector::DetectorCal;

/// The second-stage bootloader for the W25Q080 flash of a Raspberry Pi Pico.
#[link_section = ".boot2"]
#[used]
pub static BOOT2_FIRMWARE: [u8; 256] = rp2040_boot2::BOOT_LOADER_W25Q080;

/// The Pico's crystal.
const XTAL_FREQ_HZ: u32 = 12_000_000;
/// One reading every this many milliseconds (two ADS1115 conversions at 860 SPS take ~2.4 ms).
const READING_PERIOD_MS: u32 = 10;
/// Averaging buffer capacity (readings).
const CAPACITY: usize = 16;

/// First-calibration constants (see the README). These example values suit a 40 dB coupler
/// with Schottky peak detectors at about 100 W; replace them with your own.
const FORWARD_CAL: DetectorCal = DetectorCal {
    offset_mv: 150,
    uw_per_mv2_q16: 100 << 16,
};
const REFLECTED_CAL: DetectorCal = DetectorCal {
    offset_mv: 150,
    uw_per_mv2_q16: 100 << 16,
};

/// Alarm and report settings: trip above 2.0 after 3 readings (30 ms), clear below 1.5 after
/// 50 readings (0.5 s), latched (an operator resets it with a push button from GPIO14 to
/// GND), gate 5 W, average of 16, a report every 100 readings (1 s).
const CONFIG: MonitorConfig = MonitorConfig {
    trip_vswr: VswrQ16::from_bits(2 << 16),
    clear_vswr: VswrQ16::from_bits(3 << 15),
    hold_off: 3,
    clear_count: 50,
    latched: true,
    gate_uw: 5_000_000,
    averaging: 16,
    report_every: 100,
};

/// Consecutive ADC failures after which readings are treated as total reflection (so a dead
/// converter trips the alarm after the hold-off).
const ADC_FAILS_TO_FAULT: u8 = 2;

#[hal::entry]
fn main() -> ! {
    let Some(mut pac) = pac::Peripherals::take() else {
        defmt::panic!("peripherals taken twice");
    };
    let mut watchdog = Watchdog::new(pac.WATCHDOG);
    let Ok(clocks) = init_clocks_and_plls(
        XTAL_FREQ_HZ,
        pac.XOSC,
        pac.CLOCKS,
        pac.PLL_SYS,
        pac.PLL_USB,
        &mut pac.RESETS,
        &mut watchdog,
    ) else {
        defmt::panic!("clock set-up failed");
    };
    let sio = Sio::new(pac.SIO);
    let pins = hal::gpio::Pins::new(
        pac.IO_BANK0,
        pac.PADS_BANK0,
        sio.gpio_bank0,
        &mut pac.RESETS,
    );
    let mut timer = Timer::new(pac.TIMER, &mut pac.RESETS, &clocks);

    // Protection output: starts at inhibit (low) until the first reading is judged.
    let permit = pins.gpio15.into_push_pull_output_in_state(PinState::Low);
    let mut led = pins.gpio25.into_push_pull_output_in_state(PinState::Low);
    let mut reset_button = pins.gpio14.into_pull_up_input();

    // ADS1115 on I2C0: SDA GPIO4, SCL GPIO5, 400 kHz; AIN0 forward, AIN1 reflected.
    let sda: Pin<_, FunctionI2C, PullUp> = pins.gpio4.reconfigure();
    let scl: Pin<_, FunctionI2C, PullUp> = pins.gpio5.reconfigure();
    let i2c = I2C::i2c0(
        pac.I2C0,
        sda,
        scl,
        400.kHz(),
        &mut pac.RESETS,
        clocks.system_clock.freq(),
    );
    let mut adc = Ads1115::new(i2c, ADDRESS_GND, Range::V4_096, Rate::Sps860);

    let mut monitor: Monitor<_, _, CAPACITY> =
        match Monitor::new(CONFIG, PowerChain, permit, PinSense::PermitHigh) {
            Ok(m) => m,
            Err(e) => defmt::panic!("monitor settings refused: {}", e),
        };
    defmt::info!("feedline line monitor: {}", CONFIG);

    let mut adc_fails: u8 = 0;
    loop {
        let mut delay = timer;
        let fwd = adc.convert(Input::Ain0, &mut delay, 20);
        let refl = adc.convert(Input::Ain1, &mut delay, 20);
        let reading = match (fwd, refl) {
            (Ok(f), Ok(r)) => {
                adc_fails = 0;
                PowerReading::new(
                    FORWARD_CAL.power_uw(adc.microvolts(f)),
                    REFLECTED_CAL.power_uw(adc.microvolts(r)),
                )
            }
            (Err(e), _) | (_, Err(e)) => {
                adc_fails = adc_fails.saturating_add(1);
                defmt::warn!(
                    "ADC read failed ({=u8} in a row): {}",
                    adc_fails,
                    defmt::Debug2Format(&e)
                );
                if adc_fails >= ADC_FAILS_TO_FAULT {
                    // Pessimistic: a reading the alarm must count as above any trip level.
                    PowerReading::new(CONFIG.gate_uw, CONFIG.gate_uw)
                } else {
                    timer.delay_ms(READING_PERIOD_MS);
                    continue;
                }
            }
        };
        let step = monitor.update(reading);
        match step.event {
            Some(AlarmEvent::Tripped { vswr }) => {
                defmt::error!(
                    "SWR ALARM at reading {=u32}: VSWR {} — transmitter inhibited",
                    step.sequence,
                    vswr
                );
            }
            Some(AlarmEvent::Cleared) => {
                defmt::info!("alarm cleared at reading {=u32}", step.sequence)
            }
            None => {}
        }
        if !step.pin_ok {
            defmt::error!(
                "protection pin write failed at reading {=u32}",
                step.sequence
            );
        }
        if let Some(report) = step.report {
            defmt::info!("{}", report);
        }
        if reset_button.is_low().unwrap_or(false) {
            let (ev, pin_ok) = monitor.reset_alarm();
            if ev.is_some() {
                defmt::warn!(
                    "alarm reset by the operator at reading {=u32}",
                    step.sequence
                );
            }
            if !pin_ok {
                defmt::error!("protection pin write failed on reset");
            }
        }
        let _ = led.set_state(PinState::from(
            monitor.alarm_state() == feedline::monitor::AlarmState::Tripped,
        ));
        timer.delay_ms(READING_PERIOD_MS);
    }
}
