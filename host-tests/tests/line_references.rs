//! Transmission-line models against published formulas and worked values, each named beside
//! its check. Values recalled rather than read from a source are marked "from memory".

use feedline::line::feed_loss::{gamma_at_input, total_loss};
use feedline::line::geometry::skin_depth;
use feedline::line::{
    CoaxGeometry, Dielectric, LineConstants, TwoWireGeometry, COPPER_CONDUCTIVITY,
};
use feedline::reflection::{Gamma, Vswr};
use feedline::units::{Db, Feet, Hertz, Meters};
use feedline_host_tests::reference::line as reference;
use num_complex::Complex32;

fn mm(x: f32) -> Meters {
    Meters::new(x * 1.0e-3)
}

#[test]
fn precision_air_line_is_50_ohm() {
    // 7 mm precision air line: outer 7.000 mm, inner 3.0404 mm → 50.00 Ω (IEEE Std 287
    // precision coaxial connector dimensions, from memory); Z0 = 59.9585·ln(D/d).
    let c = CoaxGeometry::new(mm(3.0404), mm(7.0), Dielectric::AIR);
    let z0 = c.characteristic_impedance().unwrap().value();
    println!("7 mm air line: Z0 = {z0:.4} Ω");
    assert!((z0 - 50.0).abs() < 0.01);
    // The same from the f64 reference.
    let want = reference::coax_z0(3.0404, 7.0, 1.0);
    assert!((f64::from(z0) - want).abs() < 1e-3);
}

#[test]
fn rg58_like_coax() {
    // RG-58-like: 0.81 mm solid copper, 2.95 mm solid PE (εr 2.25) (dimensions from memory).
    // Z0 = 59.96/1.5·ln(2.95/0.81) = 51.7 Ω; VF = 1/√2.25 = 0.667 (handbook VF 0.66 for solid
    // PE, from memory).
    let c = CoaxGeometry::new(mm(0.81), mm(2.95), Dielectric::SOLID_PE);
    let z0 = c.characteristic_impedance().unwrap().value();
    let vf = c.velocity_factor().unwrap();
    println!("RG-58-like: Z0 = {z0:.2} Ω, VF = {vf:.4}");
    assert!((z0 - 51.7).abs() < 0.1);
    assert!((vf - 0.6667).abs() < 1e-3);
    // C = 2πε0εr/ln(D/d) = 96.84 pF/m (datasheets list about 100 pF/m, 30.8 pF/ft, from
    // memory).
    let k = c.lossless_constants().unwrap();
    assert!(
        (k.capacitance - 96.84e-12).abs() < 0.05e-12,
        "{}",
        k.capacitance
    );
    // Matched loss at 100 MHz for ideal smooth copper: 3.4 dB/100 ft by the formulas;
    // datasheets give 4.5–5.3 dB/100 ft (from memory) — stranding and braid add the rest, so
    // the ideal model must lie below and within a factor 2.
    let line = c.line_at(Hertz::new(100.0e6)).unwrap();
    let a = line.attenuation::<Feet>().value() * 100.0;
    println!("RG-58-like at 100 MHz: {a:.3} dB/100 ft (ideal copper)");
    let [r, l, g, cc] = reference::coax_rlgc(0.81e-3, 2.95e-3, 2.25, 2.0e-4, 5.8e7, 100.0e6);
    let (_, gm) = reference::rlgc(r, l, g, cc, 100.0e6);
    let want = gm.re * reference::DB_PER_NP * 30.48;
    assert!((f64::from(a) - want).abs() < want * 1e-4, "{a} {want}");
    assert!(a > 2.25 && a < 4.5);
    // Wave on the line at 100 MHz: VF·c/f = 1.999 m for the dielectric alone; the skin
    // layer's internal inductance R/ω (0.8 % of L here) slows the wave by 0.4 % → 1.991 m.
    let lambda = line.wavelength::<Meters>().value();
    assert!((lambda - 1.991).abs() < 0.002, "{lambda}");
    let want = 2.0 * std::f64::consts::PI / gm.im;
    assert!((f64::from(lambda) - want).abs() < want * 1e-5);
}

#[test]
fn open_wire_600_ohm() {
    // Air open-wire line with D/d = 75 is about 600 Ω (common practice, from memory):
    // 119.9·acosh 75 = 600.8 Ω.
    let t = TwoWireGeometry::new(mm(2.0), mm(150.0), Dielectric::AIR);
    let z0 = t.characteristic_impedance().unwrap().value();
    println!("open wire D/d = 75: Z0 = {z0:.2} Ω");
    assert!((z0 - 600.8).abs() < 0.5);
    assert!((f64::from(z0) - reference::two_wire_z0(2.0, 150.0, 1.0)).abs() < 0.05);
}

#[test]
fn copper_skin_depth() {
    // δ = 1/√(π f μ0 σ): copper at 1 MHz 66 µm, at 100 MHz 6.6 µm (handbook tables, from
    // memory).
    for (f, want) in [(1.0e6f32, 66.1e-6f32), (100.0e6, 6.61e-6)] {
        let d = skin_depth(Hertz::new(f), COPPER_CONDUCTIVITY)
            .unwrap()
            .value();
        assert!((d - want).abs() < want * 2e-3, "{f}: {d}");
        let r = reference::skin_depth(f64::from(f), 5.8e7);
        assert!((f64::from(d) - r).abs() < r * 1e-5);
    }
}

#[test]
fn quarter_and_eighth_wave() {
    // Pozar §2.5 quarter-wave transformer Zin = Z0²/ZL, and a shorted λ/8 stub Zin = jZ0.
    let v = 0.66 * 299_792_458.0f32;
    let line = LineConstants::per_meter(0.0, 75.0 / v, 0.0, 1.0 / (75.0 * v))
        .at(Hertz::new(14.2e6))
        .unwrap();
    let lambda = line.wavelength::<Meters>().value();
    let z = line
        .input_impedance(Complex32::new(150.0, 0.0), Meters::new(lambda / 4.0))
        .unwrap();
    assert!((z.re - 37.5).abs() < 0.02 && z.im.abs() < 0.05, "{z}");
    let z = line
        .input_impedance_from_gamma(Complex32::new(-1.0, 0.0), Meters::new(lambda / 8.0))
        .unwrap();
    assert!(z.re.abs() < 1e-3 && (z.im - 75.0).abs() < 0.02, "{z}");
}

#[test]
fn handbook_total_loss() {
    // 10·log10[(A² − |ΓL|²)/(A·(1 − |ΓL|²))] (ARRL Antenna Book, from memory): matched loss
    // 1 dB with SWR 3 at the load → 1.504 dB; 3 dB with SWR 10 → 7.008 dB (both by hand from
    // the formula, and against the f64 reference).
    for (ml, s) in [(1.0f32, 3.0f32), (3.0, 10.0), (0.2, 1.5), (10.0, 50.0)] {
        let g = Gamma::from_vswr(s).unwrap();
        let t = total_loss(Db::new(ml), g).unwrap().value();
        let want = reference::total_loss(f64::from(ml), f64::from(g.value()));
        println!("ML {ml} dB, SWR {s}: total {t:.4} dB (f64 {want:.4})");
        assert!((f64::from(t) - want).abs() < 1e-4);
    }
    let t = total_loss(Db::new(1.0), Gamma::from_vswr(3.0).unwrap())
        .unwrap()
        .value();
    assert!((t - 1.504).abs() < 1e-3);
    let t = total_loss(Db::new(3.0), Gamma::from_vswr(10.0).unwrap())
        .unwrap()
        .value();
    assert!((t - 7.008).abs() < 1e-3);
}

#[test]
fn swr_improves_through_a_lossy_line() {
    // A short behind 3 dB of cable reads SWR ≈ 3 (|Γ| = 10^(−6/20) = 0.501; common practice).
    let g = gamma_at_input(Gamma::TOTAL, Db::new(3.0)).unwrap();
    let s = g.vswr().value();
    assert!((s - 3.0095).abs() < 1e-3, "{s}");
    let back = feedline::line::swr_at_load(Vswr::new(s).unwrap(), Db::new(3.0)).unwrap();
    assert!(back.vswr.value() > 900.0);
}
