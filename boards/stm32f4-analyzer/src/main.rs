//! Spot-frequency analyzer on an STM32F411 (Cortex-M4F with FPU): an AD9833 DDS drives the
//! bridge at a list of frequencies, an ADS1115 reads the bridge's forward and reflected log
//! detectors, and feedline's f32 chain (`bridge::measure_volts`) turns each pair of voltages
//! into VSWR and return loss, logged with defmt over RTT. Wiring, detector assumptions and
//! first calibration: README.md beside this file.
//!
//! The board code only moves data between the drivers and the core: every computation is in
//! `feedline` (tested on the host) and the drivers are thin (`feedline-drivers`).
#![no_std]
#![no_main]

use cortex_m_rt::entry;
use defmt_rtt as _;
use embedded_hal::delay::DelayNs;
use embedded_hal_bus::spi::ExclusiveDevice;
use feedline::bridge::{measure_volts, BridgeSpec, Detector};
use feedline::detector::LogDetector;
use feedline::units::{Db, Dbm, Volts};
use feedline_drivers::ad9833::{Ad9833, Register, Waveform};
use feedline_drivers::ads1115::{Ads1115, Input, Range, Rate, ADDRESS_GND};
use panic_probe as _;
use stm32f4xx_hal::{
    i2c::{I2c, Mode as I2cMode},
    pac,
    prelude::*,
    rcc::Config,
    spi::{Mode, Phase, Polarity, Spi},
};

/// The AD9833 module's crystal oscillator (25 MHz on the common modules).
const DDS_MCLK_HZ: u32 = 25_000_000;
/// Spot frequencies, Hz (an invented list inside the AD9833's clean range, below MCLK/4).
const FREQUENCIES_HZ: [u32; 6] = [
    1_850_000, 3_650_000, 5_350_000, 7_100_000, 10_120_000, 1_000_000,
];
/// Settling time after a frequency change (bridge, detector video filter), µs.
const SETTLE_US: u32 = 5_000;
/// Log detector law, both channels (an AD8307-class part: 25 mV/dB, intercept −84 dBm —
/// typical data-sheet values, from memory; replace with your first-calibration figures).
const SLOPE_V_PER_DB: f32 = 0.025;
const INTERCEPT_DBM: f32 = -84.0;
/// Detector output range used: below the floor is noise, above the ceiling saturation.
const FLOOR_V: f32 = 0.25;
const CEILING_V: f32 = 2.5;
/// Bridge directivity (measure it: see the README).
const DIRECTIVITY_DB: f32 = 35.0;

#[entry]
fn main() -> ! {
    let Some(dp) = pac::Peripherals::take() else {
        defmt::panic!("peripherals taken twice");
    };
    let Some(cp) = cortex_m::Peripherals::take() else {
        defmt::panic!("core peripherals taken twice");
    };
    let mut rcc = dp.RCC.freeze(Config::hse(25.MHz()).sysclk(96.MHz()));
    let mut delay = cp.SYST.delay(&rcc.clocks);

    let gpioa = dp.GPIOA.split(&mut rcc);
    let gpiob = dp.GPIOB.split(&mut rcc);
    let gpioc = dp.GPIOC.split(&mut rcc);
    let mut led = gpioc.pc13.into_push_pull_output(); // Black Pill LED, active low

    // AD9833 on SPI1: SCK PA5, SDATA PA7 (MOSI), FSYNC PA4; mode 2, 5 MHz.
    let spi_mode = Mode {
        polarity: Polarity::IdleHigh,
        phase: Phase::CaptureOnFirstTransition,
    };
    let spi = Spi::new(
        dp.SPI1,
        (
            Some(gpioa.pa5),
            None::<stm32f4xx_hal::gpio::PA6>,
            Some(gpioa.pa7),
        ),
        spi_mode,
        5.MHz(),
        &mut rcc,
    );
    let fsync = gpioa
        .pa4
        .into_push_pull_output_in_state(stm32f4xx_hal::gpio::PinState::High);
    // A push-pull pin's error type is Infallible: this cannot fail.
    let Ok(spi_dev) = ExclusiveDevice::new_no_delay(spi, fsync);
    let mut dds = Ad9833::new(spi_dev, DDS_MCLK_HZ);

    // ADS1115 on I2C1: SCL PB6, SDA PB7, 100 kHz; AIN0 forward, AIN1 reflected.
    let i2c = I2c::new(
        dp.I2C1,
        (gpiob.pb6, gpiob.pb7),
        I2cMode::standard(100.kHz()),
        &mut rcc,
    );
    let mut adc = Ads1115::new(i2c, ADDRESS_GND, Range::V4_096, Rate::Sps475);

    let spec = match LogDetector::new(Volts::new(SLOPE_V_PER_DB), Dbm::new(INTERCEPT_DBM)) {
        Ok(law) => BridgeSpec::new(
            Detector::Log(law),
            Volts::new(FLOOR_V),
            Volts::new(CEILING_V),
            Db::new(DIRECTIVITY_DB),
        ),
        Err(e) => defmt::panic!("detector law refused: {}", e),
    };

    if let Err(e) = dds.init().and_then(|_| dds.set_waveform(Waveform::Sine)) {
        defmt::error!("AD9833 init failed: {}", defmt::Debug2Format(&e));
    }
    defmt::info!(
        "feedline spot analyzer: {} frequencies",
        FREQUENCIES_HZ.len()
    );

    loop {
        for &hz in FREQUENCIES_HZ.iter() {
            let set = dds
                .set_frequency(Register::Zero, hz)
                .and_then(|actual| dds.enable().map(|_| actual));
            let actual = match set {
                Ok(a) => a,
                Err(e) => {
                    defmt::error!("{=u32} Hz: DDS error {}", hz, defmt::Debug2Format(&e));
                    continue;
                }
            };
            delay.delay_us(SETTLE_US);
            let fwd = adc.convert(Input::Ain0, &mut delay, 20);
            let refl = adc.convert(Input::Ain1, &mut delay, 20);
            let (f, r) = match (fwd, refl) {
                (Ok(f), Ok(r)) => (f, r),
                (Err(e), _) | (_, Err(e)) => {
                    defmt::error!("{=u32} Hz: ADC error {}", actual, defmt::Debug2Format(&e));
                    continue;
                }
            };
            let fv = Volts::new(adc.microvolts(f) as f32 * 1e-6);
            let rv = Volts::new(adc.microvolts(r) as f32 * 1e-6);
            match measure_volts(&spec, fv, rv) {
                Ok(m) => defmt::info!(
                    "{=u32} Hz: VSWR {=f32} RL {=f32} dB quality {=u8:#04x}",
                    actual,
                    m.reflection.vswr.value(),
                    m.reflection.return_loss.value(),
                    m.quality.bits()
                ),
                Err(fault) => defmt::warn!("{=u32} Hz: no measurement: {}", actual, fault),
            }
        }
        let _ = dds.hold();
        led.toggle();
        delay.delay_ms(500);
    }
}
