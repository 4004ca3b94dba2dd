//! Panic-freedom proof for the serial reports and the command console (`feedline::report`,
//! `feedline::command`): every public entry point, fed inputs the optimizer cannot see.

use core::hint::black_box as input;

use feedline::command::{self, Console, Settings};
use feedline::report::frame::{self, FrameDecoder, MAX_PAYLOAD, MAX_WIRE};
use feedline::report::record::{self, LAYOUT_VERSION};
use feedline::report::{checksum, line, DeviceState, MonitorFlags, Record, StatusRecord};
use feedline::units::{Db, Watts};

fn keep<T>(x: T) {
    core::hint::black_box(x);
}

/// An `embedded_io::Write` whose acceptance the optimizer cannot predict (it may accept
/// zero bytes, or fail).
struct Port;

impl embedded_io::ErrorType for Port {
    type Error = embedded_io::ErrorKind;
}

impl embedded_io::Write for Port {
    fn write(&mut self, buf: &[u8]) -> Result<usize, Self::Error> {
        keep(buf);
        let n: usize = input(buf.len());
        if input(false) {
            Err(embedded_io::ErrorKind::Other)
        } else {
            Ok(n.min(buf.len()))
        }
    }
    fn flush(&mut self) -> Result<(), Self::Error> {
        Ok(())
    }
}

/// A `core::fmt::Write` that may fail.
struct Text;

impl core::fmt::Write for Text {
    fn write_str(&mut self, s: &str) -> core::fmt::Result {
        keep(s);
        if input(false) {
            Err(core::fmt::Error)
        } else {
            Ok(())
        }
    }
}

pub fn prove_report() {
    let bytes: [u8; 80] = input([0x11; 80]);
    let n: usize = input(10);
    let part = bytes.get(..n.min(80)).unwrap_or(&[]);
    keep(checksum::crc32(part));
    keep(LAYOUT_VERSION);

    let mut wire = [0u8; MAX_WIRE];
    keep(frame::encode_frame(input(0x11), part, &mut wire));
    keep(frame::write_frame(&mut Port, input(0x12), part));
    keep(frame::check_content(part));

    let mut rx: FrameDecoder = FrameDecoder::new();
    for &b in bytes.iter() {
        if let Some(Ok(f)) = rx.push(input(b)) {
            keep(f.kind());
            keep(f.payload());
            keep(Record::from_frame(&f));
        }
    }
    rx.reset();

    let r = Record::Status(StatusRecord {
        uptime_s: input(1),
        state: DeviceState::from_code(input(1)).unwrap_or(DeviceState::Idle),
        locked: input(true),
        cal_valid: input(false),
        rx_errors: input(0),
    });
    let r = match Record::from_payload(input(0x11), part) {
        Ok(other) => other,
        Err(_) => r,
    };
    keep(r.type_byte());
    keep(r.validate());
    let mut payload = [0u8; MAX_PAYLOAD];
    keep(r.encode_payload(&mut payload));
    keep(r.encode_frame(&mut wire));
    keep(r.write_frame(&mut Port));
    keep(line::write_line_fmt(&mut Text, &r));
    keep(line::write_line(&mut Port, &r));
    let text = core::str::from_utf8(part).unwrap_or("fl.sts v=1");
    keep(line::parse_line(text));
    keep(DeviceState::from_word(text));
    keep(DeviceState::Sweeping.word());
    keep(DeviceState::Sweeping.code());
    keep(MonitorFlags::from_bits(input(3)).map(|f| (f.bits(), f.contains(1))));

    keep(record::milliwatts(Watts::new(input(1.5))));
    keep(record::vswr_milli(
        feedline::reflection::Vswr::new(input(1.5))
            .unwrap_or(feedline::reflection::Gamma::TOTAL.vswr()),
    ));
    keep(record::return_loss_cdb(Db::new(input(20.0))));
    keep(record::gamma_micro(input(0.5)));
}

pub fn prove_command() {
    let bytes: [u8; 64] = input([b'a'; 64]);
    let mut console: Console = Console::new(input(Settings::DEFAULT));
    for (i, &b) in bytes.iter().enumerate() {
        if let Some(r) = console.push(input(b), input(i as u32)) {
            keep(r.action);
            keep(r.reply.write_to(&mut Text));
        }
    }
    let text = core::str::from_utf8(&bytes).unwrap_or("stat");
    keep(console.handle_line(text, input(5)));
    if let Ok(Some(cmd)) = command::parse(text) {
        keep(cmd.needs_unlock());
        keep(console.handle(cmd, input(6)));
    }
    keep(console.is_locked(input(7)));
    keep(console.rx_errors());
    let s = *console.settings();
    keep(s.validate());
    let img = s.encode();
    keep(Settings::decode(input(&img[..])));
    let mut out = [0u8; 64];
    keep(<Settings as feedline::store::Record>::encode(&s, &mut out[..]).ok());
    keep(<Settings as feedline::store::Record>::decode(
        input(1),
        input(&img[..]),
    ));
    let e = input(command::CommandError::Range);
    keep((e.code(), e.text()));
    keep(command::ReportFormat::from_word(text).map(|f| f.word()));
    keep(command::CalStep::Open.word());
}
