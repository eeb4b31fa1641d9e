//! The LIS3DH driver against the bus transactions ST's LIS3DH datasheet
//! (DocID17530) prescribes. Register addresses and values are quoted from
//! memory and match several independent public register headers:
//! WHO_AM_I = 0x0F reading 0x33; CTRL_REG1 = 0x20 (ODR in bits 7..4,
//! Zen/Yen/Xen bits 2..0); CTRL_REG4 = 0x23 (BDU bit 7, FS bits 5..4, HR bit
//! 3); OUT_X_L = 0x28; bit 7 of the sub-address auto-increments.

use embedded_hal::i2c::{ErrorKind, NoAcknowledgeSource};
use embedded_hal_mock::eh1::i2c::{Mock as I2cMock, Transaction as I2cTx};
use standfast_firmware::lis3dh::{self, Config, DataRate, Error, Lis3dh, Range, RawSample};

const ADDR: u8 = 0x18; // SA0 low (datasheet, from memory)

#[test]
fn init_checks_identity_then_writes_both_control_registers() {
    // 100 Hz (ODR = 0101) with X, Y, Z on: CTRL_REG1 = 0101_0111 = 0x57.
    // BDU = 1, FS = 00 (±2 g), HR = 1: CTRL_REG4 = 1000_1000 = 0x88.
    let expected = [
        I2cTx::write_read(ADDR, vec![0x0F], vec![0x33]),
        I2cTx::write(ADDR, vec![0x20, 0x57]),
        I2cTx::write(ADDR, vec![0x23, 0x88]),
    ];
    let mut bus = I2cMock::new(&expected);
    let mut acc = Lis3dh::new(bus.clone(), lis3dh::ADDRESS_SA0_LOW, Config::default());
    acc.init().unwrap();
    bus.done();
}

#[test]
fn other_rates_and_ranges_encode_as_the_datasheet_fields() {
    // 50 Hz = ODR 0100 → 0x47; ±8 g = FS 10 → 0x80 | 0x20 | 0x08 = 0xA8.
    let c = Config {
        rate: DataRate::Hz50,
        range: Range::G8,
    };
    assert_eq!(c.ctrl_reg1(), 0x47);
    assert_eq!(c.ctrl_reg4(), 0xA8);
    // 400 Hz = ODR 0111 → 0x77; ±16 g = FS 11 → 0xB8.
    let c = Config {
        rate: DataRate::Hz400,
        range: Range::G16,
    };
    assert_eq!(c.ctrl_reg1(), 0x77);
    assert_eq!(c.ctrl_reg4(), 0xB8);
}

#[test]
fn a_wrong_identity_is_a_device_error_and_nothing_is_written() {
    // Any value other than 0x33 must be refused (0x32 here: one bit off).
    let expected = [I2cTx::write_read(ADDR, vec![0x0F], vec![0x32])];
    let mut bus = I2cMock::new(&expected);
    let mut acc = Lis3dh::new(bus.clone(), ADDR, Config::default());
    assert_eq!(acc.init(), Err(Error::WrongDevice { found: 0x32 }));
    bus.done();
}

#[test]
fn a_bus_error_is_reported_as_such() {
    let nack = ErrorKind::NoAcknowledge(NoAcknowledgeSource::Address);
    let expected = [I2cTx::write_read(ADDR, vec![0x0F], vec![0]).with_error(nack)];
    let mut bus = I2cMock::new(&expected);
    let mut acc = Lis3dh::new(bus.clone(), ADDR, Config::default());
    assert_eq!(acc.init(), Err(Error::Bus(nack)));
    bus.done();
}

#[test]
fn burst_read_of_six_bytes_scales_to_g() {
    // High-resolution ±2 g: 1 mg per digit of the 12-bit value, left justified
    // in 16 bits (datasheet, from memory). +1 g = 1000 digits = 0x3E80 as a
    // word; −0.5 g = −500 digits = 0xE0C0; +0.25 g = 250 digits = 0x0FA0.
    let expected = [I2cTx::write_read(
        ADDR,
        vec![0x28 | 0x80],
        vec![0xA0, 0x0F, 0xC0, 0xE0, 0x80, 0x3E],
    )];
    let mut bus = I2cMock::new(&expected);
    let mut acc = Lis3dh::new(bus.clone(), ADDR, Config::default());
    let g = acc.read_g().unwrap();
    assert!((g[0] - 0.25).abs() < 1e-6, "{g:?}");
    assert!((g[1] + 0.5).abs() < 1e-6, "{g:?}");
    assert!((g[2] - 1.0).abs() < 1e-6, "{g:?}");
    bus.done();
}

#[test]
fn sensitivity_follows_the_range() {
    // Datasheet sensitivities in high-resolution mode (from memory): 1, 2, 4
    // and 12 mg/digit. The same word 0x3E80 (1000 digits) reads 1, 2, 4, 12 g.
    let raw = RawSample {
        words: [0x3E80, 0, 0],
    };
    for (range, want) in [
        (Range::G2, 1.0),
        (Range::G4, 2.0),
        (Range::G8, 4.0),
        (Range::G16, 12.0),
    ] {
        let g = raw.to_g(range)[0];
        assert!((g - want).abs() < 1e-5, "{range:?}: {g}");
    }
    // The low four bits are not part of the 12-bit value.
    let noisy = RawSample {
        words: [0x3E8F, 0, 0],
    };
    assert_eq!(noisy.to_g(Range::G2)[0], raw.to_g(Range::G2)[0]);
}

#[test]
fn verify_reads_back_the_control_registers_in_one_burst() {
    let cfg = Config::default();
    let expected = [
        I2cTx::write_read(ADDR, vec![0x20 | 0x80], vec![0x57, 0x00, 0x00, 0x88]),
        // The sensor reset itself: CTRL_REG1 back at its reset value 0x07
        // (power-down, axes on; datasheet, from memory).
        I2cTx::write_read(ADDR, vec![0x20 | 0x80], vec![0x07, 0x00, 0x00, 0x00]),
    ];
    let mut bus = I2cMock::new(&expected);
    let mut acc = Lis3dh::new(bus.clone(), ADDR, cfg);
    acc.verify_config().unwrap();
    assert_eq!(
        acc.verify_config(),
        Err(Error::ConfigLost {
            register: 0x20,
            found: 0x07
        })
    );
    bus.done();
}
