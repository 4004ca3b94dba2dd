#![no_std]
#![no_main]
use defmt_rtt as _;
use panic_probe as _;
use rp2040_hal as hal;

#[link_section = ".boot2"]
#[used]
pub static BOOT2_FIRMWARE: [u8; 256] = rp2040_boot2::BOOT_LOADER_W25Q080;

#[hal::entry]
fn main() -> ! {
    let _p = hal::pac::Peripherals::take();
    defmt::info!("hi");
    loop {}
}
