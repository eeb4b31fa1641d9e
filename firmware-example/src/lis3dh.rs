//! A small driver for the ST LIS3DH 3-axis accelerometer over
//! [`embedded_hal::i2c::I2c`].
//!
//! Register names, addresses and bit fields follow ST's LIS3DH datasheet
//! (DocID17530), quoted **from memory** and cross-checked against several
//! independent public register headers: WHO_AM_I 0x0F reads 0x33; CTRL_REG1
//! 0x20 holds ODR\[3:0\] in bits 7..4, LPen in bit 3 and Zen/Yen/Xen in bits
//! 2..0; CTRL_REG4 0x23 holds BDU in bit 7, FS\[1:0\] in bits 5..4 and HR in bit
//! 3; OUT_X_L..OUT_Z_H are 0x28..0x2D; setting bit 7 of the sub-address makes
//! the device auto-increment it during a multi-byte transfer. 7-bit bus
//! address 0x18 with SA0 (SDO) tied low, 0x19 with it high.
//!
//! The driver runs the sensor in high-resolution mode (12-bit output, left
//! justified in 16 bits) with block data update on, so the two bytes of one
//! axis always belong to the same sample.
//!
//! **Sensor frame.** The chip's own x, y, z axes as printed in the datasheet's
//! pin-1 drawing. Readings are specific force in g (1 g = 9.80665 m/s²): a
//! chip lying still, face up, reads about (0, 0, +1).

use embedded_hal::i2c::I2c;

/// 7-bit bus address with SA0 (SDO) tied to ground.
pub const ADDRESS_SA0_LOW: u8 = 0x18;
/// 7-bit bus address with SA0 (SDO) tied to the supply.
pub const ADDRESS_SA0_HIGH: u8 = 0x19;
/// What WHO_AM_I reads on a LIS3DH.
pub const WHO_AM_I_VALUE: u8 = 0x33;

/// Register sub-addresses (datasheet register map, from memory).
pub mod reg {
    /// Device identification, reads [`super::WHO_AM_I_VALUE`].
    pub const WHO_AM_I: u8 = 0x0F;
    /// Data rate, low-power enable, axis enables.
    pub const CTRL_REG1: u8 = 0x20;
    /// Block data update, endianness, full scale, high resolution.
    pub const CTRL_REG4: u8 = 0x23;
    /// Data-ready and overrun flags.
    pub const STATUS_REG: u8 = 0x27;
    /// First of the six output bytes (X low, X high, Y low, Y high, Z low, Z high).
    pub const OUT_X_L: u8 = 0x28;
    /// Bit 7 of the sub-address: auto-increment during multi-byte transfers.
    pub const AUTO_INCREMENT: u8 = 0x80;
}

/// Output data rate (CTRL_REG1 ODR field), in normal and high-resolution mode.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum DataRate {
    /// 1 Hz (ODR = 0001).
    Hz1,
    /// 10 Hz (ODR = 0010).
    Hz10,
    /// 25 Hz (ODR = 0011).
    Hz25,
    /// 50 Hz (ODR = 0100).
    Hz50,
    /// 100 Hz (ODR = 0101).
    Hz100,
    /// 200 Hz (ODR = 0110).
    Hz200,
    /// 400 Hz (ODR = 0111).
    Hz400,
}

impl DataRate {
    const fn odr_bits(self) -> u8 {
        match self {
            DataRate::Hz1 => 0b0001,
            DataRate::Hz10 => 0b0010,
            DataRate::Hz25 => 0b0011,
            DataRate::Hz50 => 0b0100,
            DataRate::Hz100 => 0b0101,
            DataRate::Hz200 => 0b0110,
            DataRate::Hz400 => 0b0111,
        }
    }
}

/// Full-scale range (CTRL_REG4 FS field).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Range {
    /// ±2 g, 1 mg per digit in high-resolution mode.
    G2,
    /// ±4 g, 2 mg per digit.
    G4,
    /// ±8 g, 4 mg per digit.
    G8,
    /// ±16 g, 12 mg per digit.
    G16,
}

impl Range {
    const fn fs_bits(self) -> u8 {
        match self {
            Range::G2 => 0b00,
            Range::G4 => 0b01,
            Range::G8 => 0b10,
            Range::G16 => 0b11,
        }
    }

    /// Sensitivity in high-resolution (12-bit) mode, g per digit (datasheet
    /// table of mechanical characteristics, "So", from memory: 1, 2, 4 and
    /// 12 mg/digit).
    #[must_use]
    pub const fn g_per_digit(self) -> f32 {
        match self {
            Range::G2 => 0.001,
            Range::G4 => 0.002,
            Range::G8 => 0.004,
            Range::G16 => 0.012,
        }
    }
}

/// Sensor configuration.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Config {
    /// Output data rate; choose at least twice the control loop rate.
    pub rate: DataRate,
    /// Full scale; ±2 g gives the finest tilt resolution.
    pub range: Range,
}

impl Default for Config {
    /// 100 Hz, ±2 g.
    fn default() -> Self {
        Config {
            rate: DataRate::Hz100,
            range: Range::G2,
        }
    }
}

impl Config {
    /// CTRL_REG1 value: ODR, normal power (LPen = 0), X, Y and Z enabled.
    #[must_use]
    pub const fn ctrl_reg1(self) -> u8 {
        (self.rate.odr_bits() << 4) | 0b0111
    }

    /// CTRL_REG4 value: BDU = 1, little-endian (BLE = 0), FS, HR = 1.
    #[must_use]
    pub const fn ctrl_reg4(self) -> u8 {
        0x80 | (self.range.fs_bits() << 4) | 0x08
    }
}

/// What went wrong talking to the accelerometer: the bus, or the device.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Error<E> {
    /// The I2C bus reported an error (no acknowledge, arbitration loss, ...).
    Bus(E),
    /// WHO_AM_I did not read [`WHO_AM_I_VALUE`]: another chip, or none.
    WrongDevice {
        /// The value read.
        found: u8,
    },
    /// A control register read back differently from what was written: the
    /// sensor reset itself (for example after a supply dip) and must be set
    /// up again.
    ConfigLost {
        /// Register sub-address that differed.
        register: u8,
        /// Value read back.
        found: u8,
    },
}

impl<E> From<E> for Error<E> {
    fn from(e: E) -> Self {
        Error::Bus(e)
    }
}

/// One raw sample: the three left-justified 16-bit output words, sensor frame.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct RawSample {
    /// X, Y, Z output words as read (two's complement, left justified).
    pub words: [i16; 3],
}

impl RawSample {
    /// Decodes the six output bytes in register order (X_L, X_H, Y_L, Y_H, Z_L, Z_H).
    #[must_use]
    pub const fn from_bytes(b: [u8; 6]) -> Self {
        RawSample {
            words: [
                i16::from_le_bytes([b[0], b[1]]),
                i16::from_le_bytes([b[2], b[3]]),
                i16::from_le_bytes([b[4], b[5]]),
            ],
        }
    }

    /// The six output bytes this sample reads as (inverse of [`Self::from_bytes`]).
    #[must_use]
    pub const fn to_bytes(self) -> [u8; 6] {
        let x = self.words[0].to_le_bytes();
        let y = self.words[1].to_le_bytes();
        let z = self.words[2].to_le_bytes();
        [x[0], x[1], y[0], y[1], z[0], z[1]]
    }

    /// Specific force in g, sensor frame: each word shifted right by 4 (the
    /// 12-bit high-resolution value) times the range's sensitivity.
    #[must_use]
    pub fn to_g(self, range: Range) -> [f32; 3] {
        let s = range.g_per_digit();
        let [x, y, z] = self.words;
        [
            f32::from(x >> 4) * s,
            f32::from(y >> 4) * s,
            f32::from(z >> 4) * s,
        ]
    }
}

/// The LIS3DH on an I2C bus.
#[derive(Debug)]
pub struct Lis3dh<I2C> {
    i2c: I2C,
    address: u8,
    config: Config,
}

impl<I2C: I2c> Lis3dh<I2C> {
    /// A driver for the sensor at 7-bit `address` ([`ADDRESS_SA0_LOW`] or
    /// [`ADDRESS_SA0_HIGH`]). Does not touch the bus; call [`Self::init`].
    pub const fn new(i2c: I2C, address: u8, config: Config) -> Self {
        Lis3dh {
            i2c,
            address,
            config,
        }
    }

    /// The configuration this driver writes.
    pub const fn config(&self) -> Config {
        self.config
    }

    /// Checks WHO_AM_I, then writes CTRL_REG1 and CTRL_REG4. Bus transactions,
    /// in order: write-read `[WHO_AM_I]` → 1 byte; write `[CTRL_REG1, v1]`;
    /// write `[CTRL_REG4, v4]`.
    ///
    /// # Errors
    /// [`Error::Bus`] from the bus; [`Error::WrongDevice`] for a wrong WHO_AM_I.
    pub fn init(&mut self) -> Result<(), Error<I2C::Error>> {
        let found = self.read_register(reg::WHO_AM_I)?;
        if found != WHO_AM_I_VALUE {
            return Err(Error::WrongDevice { found });
        }
        self.i2c
            .write(self.address, &[reg::CTRL_REG1, self.config.ctrl_reg1()])?;
        self.i2c
            .write(self.address, &[reg::CTRL_REG4, self.config.ctrl_reg4()])?;
        Ok(())
    }

    /// Reads CTRL_REG1 to CTRL_REG4 in one burst (write-read
    /// `[CTRL_REG1 | AUTO_INCREMENT]` → 4 bytes) and compares the two
    /// registers this driver sets.
    ///
    /// # Errors
    /// [`Error::Bus`]; [`Error::ConfigLost`] when either register differs.
    pub fn verify_config(&mut self) -> Result<(), Error<I2C::Error>> {
        let mut b = [0u8; 4];
        self.i2c.write_read(
            self.address,
            &[reg::CTRL_REG1 | reg::AUTO_INCREMENT],
            &mut b,
        )?;
        let [r1, _r2, _r3, r4] = b;
        if r1 != self.config.ctrl_reg1() {
            return Err(Error::ConfigLost {
                register: reg::CTRL_REG1,
                found: r1,
            });
        }
        if r4 != self.config.ctrl_reg4() {
            return Err(Error::ConfigLost {
                register: reg::CTRL_REG4,
                found: r4,
            });
        }
        Ok(())
    }

    /// Burst-reads the six output bytes: write-read `[OUT_X_L | AUTO_INCREMENT]` → 6 bytes.
    ///
    /// # Errors
    /// [`Error::Bus`].
    pub fn read_raw(&mut self) -> Result<RawSample, Error<I2C::Error>> {
        let mut b = [0u8; 6];
        self.i2c
            .write_read(self.address, &[reg::OUT_X_L | reg::AUTO_INCREMENT], &mut b)?;
        Ok(RawSample::from_bytes(b))
    }

    /// [`Self::read_raw`] scaled to g, sensor frame.
    ///
    /// # Errors
    /// [`Error::Bus`].
    pub fn read_g(&mut self) -> Result<[f32; 3], Error<I2C::Error>> {
        Ok(self.read_raw()?.to_g(self.config.range))
    }

    /// Reads one register.
    ///
    /// # Errors
    /// [`Error::Bus`].
    pub fn read_register(&mut self, register: u8) -> Result<u8, Error<I2C::Error>> {
        let mut b = [0u8; 1];
        self.i2c.write_read(self.address, &[register], &mut b)?;
        let [v] = b;
        Ok(v)
    }

    /// The bus, for a board that shares it or an emulation that scripts it.
    pub fn bus_mut(&mut self) -> &mut I2C {
        &mut self.i2c
    }

    /// Gives the bus back.
    pub fn release(self) -> I2C {
        self.i2c
    }
}
