#![no_std]
#![no_main]
use cortex_m_rt::entry;
use defmt_rtt as _;
use panic_probe as _;
use stm32f4xx_hal as hal;

#[entry]
fn main() -> ! {
    let _p = hal::pac::Peripherals::take();
    defmt::info!("hi");
    loop {}
}
