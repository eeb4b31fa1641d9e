//! The station on mocked pins (embedded-hal-mock) and on a mocked or
//! emulated bus. Every expected time below is derived by hand from the
//! scripted inputs and the settings written next to them; the pin
//! expectations follow the fail-safe convention (low = request).

use embedded_hal::i2c::{ErrorKind, I2c, NoAcknowledgeSource};
use embedded_hal_mock::eh1::digital::{Mock as PinMock, State, Transaction as PinTx};
use embedded_hal_mock::eh1::i2c::{Mock as I2cMock, Transaction as I2cTx};
use embedded_hal_mock::eh1::MockError;
use standfast_firmware::lis3dh::{self, Config, Lis3dh, RawSample};
use standfast_firmware::replay::{EmulatedLis3dh, ScriptedVane};
use standfast_firmware::station::{Station, StationConfig, StepInputs, Watchdog};
use standfast_firmware::wind::{Anemometer, AnemometerCal, PulseLatch};
use standfast_firmware::{FailSafeLines, LimitRule, Limits, LineState};

const ADDR: u8 = 0x18;
const PERIOD_MS: u64 = 100;
/// +1 g on z at ±2 g, high resolution: 1000 digits << 4 (datasheet, from memory).
const LEVEL: RawSample = RawSample {
    words: [0, 0, 16000],
};

fn cfg() -> StationConfig {
    StationConfig {
        period_ms: 100,
        accel_stale_ms: 250,
        wind_stale_ms: 3000,
        vane_stale_ms: 3000,
        fault_clear_ms: 2000,
        verify_every_steps: 0,
        ..StationConfig::default()
    }
}

/// Park at 12 m/s, alarm at 18 m/s or 2° tilt, held 5 s (invented limits).
fn rule() -> LimitRule {
    LimitRule::new(Limits::new(12.0, 18.0, 2f32.to_radians(), 5000).unwrap())
}

/// 0.75 m/s per Hz + 0.3 m/s, 1 s gate: f Hz → 0.75 f + 0.3 m/s, so 4 Hz →
/// 3.3 m/s, 16 Hz → 12.3 m/s (over the park limit), 24 Hz → 18.3 m/s (over
/// the alarm limit).
fn anemometer() -> Anemometer {
    Anemometer::new(AnemometerCal::new(0.75, 0.3, 0.5).unwrap(), 1000)
}

type TestStation<B> = Station<B, ScriptedVane, PinMock, PinMock, LimitRule>;

fn station<B: I2c>(bus: B, cfg: StationConfig, park: &PinMock, alarm: &PinMock) -> TestStation<B> {
    Station::new(
        cfg,
        Lis3dh::new(bus, ADDR, Config::default()),
        anemometer(),
        ScriptedVane {
            from_rad: Some(1.0),
        },
        FailSafeLines::new(park.clone(), alarm.clone()),
        rule(),
    )
}

/// Pin expectations, one write per step, from the wanted line states.
fn pin_script(states: &[LineState]) -> (PinMock, PinMock) {
    let level = |req: bool| PinTx::set(if req { State::Low } else { State::High });
    let park: Vec<_> = states.iter().map(|s| level(s.park_requested)).collect();
    let alarm: Vec<_> = states.iter().map(|s| level(s.alarm_raised)).collect();
    (PinMock::new(&park), PinMock::new(&alarm))
}

const PARK_ONLY: LineState = LineState {
    park_requested: true,
    alarm_raised: false,
};

/// The first events of a station with the backstop rule and a level,
/// answering accelerometer, whose anemometer reports its first speed at
/// 1000 ms. Before its first decision the station's level is
/// `sensor_fault` (it has judged nothing yet; the guard's can't-see level);
/// the rule's first decision at 0 ms names `clear` (no wind sample yet, a
/// level tilt), so a level event at 0 ms, while the station's own
/// supervision keeps both lines requested until the first wind speed at
/// 1000 ms (arming).
const ARMED: [&str; 4] = [
    "event t_ms=0 kind=started",
    "event t_ms=0 kind=level from=sensor_fault to=clear",
    "event t_ms=1000 kind=park_off",
    "event t_ms=1000 kind=alarm_off",
];

/// Running pulse total at `t_ms` for a frequency of `freq_hz[k]` during second k.
fn pulse_total(freq_hz: &[u32], t_ms: u64) -> u32 {
    let k = (t_ms / 1000) as usize;
    let whole: u32 = freq_hz.iter().take(k).sum();
    let f = freq_hz.get(k).copied().unwrap_or(0);
    whole + (u64::from(f) * (t_ms % 1000) / 1000) as u32
}

fn latch(freq_hz: &[u32], t_ms: u64) -> Option<PulseLatch> {
    Some(PulseLatch {
        total: pulse_total(freq_hz, t_ms),
        at_ms: t_ms,
    })
}

/// Runs `steps` steps; returns every event as its text line.
fn run<B: I2c>(
    st: &mut TestStation<B>,
    steps: u64,
    mut inputs: impl FnMut(u64) -> StepInputs,
    mut before: impl FnMut(&mut TestStation<B>, u64),
) -> Vec<String> {
    let mut lines = Vec::new();
    for i in 0..steps {
        let t = i * PERIOD_MS;
        before(st, t);
        let r = st.step(t, inputs(t));
        assert!(r.complete, "step at {t} ms incomplete");
        lines.extend(r.events.iter().map(|e| e.to_string()));
    }
    lines
}

#[test]
fn a_scripted_windy_sequence_switches_the_lines() {
    // Seconds 0–2 at 4 Hz (3.3 m/s), 3–5 at 16 Hz (12.3 m/s), 6 at 24 Hz
    // (18.3 m/s), then 4 Hz again. Window k reports at (k+1)·1000 ms.
    let freq = [4, 4, 4, 16, 16, 16, 24, 4, 4, 4, 4, 4, 4, 4];
    // Lines: both requested until the first wind speed at 1000 ms (arming);
    // park from 4000 ms; alarm from 7000 ms; the last over-limit sample is at
    // 7000 ms, held 5000 ms inclusive, so all clear from 12100 ms.
    let want = |t: u64| match t {
        0..=999 => LineState::SAFE,
        1000..=3999 => LineState::ALL_WELL,
        4000..=6999 => PARK_ONLY,
        7000..=12000 => LineState::SAFE,
        _ => LineState::ALL_WELL,
    };
    let steps = 131;
    let states: Vec<_> = (0..steps).map(|i| want(i * PERIOD_MS)).collect();
    let (mut park, mut alarm) = pin_script(&states);
    let mut bus = EmulatedLis3dh::new(ADDR);
    bus.set_output(Some(LEVEL));
    let mut st = station(bus, cfg(), &park, &alarm);
    let events = run(
        &mut st,
        steps,
        |t| StepInputs {
            pulses: latch(&freq, t),
            pose: None,
        },
        |_, _| {},
    );
    assert_eq!(events[..4], ARMED);
    assert_eq!(
        events[4..],
        [
            "event t_ms=4000 kind=level from=clear to=park",
            "event t_ms=4000 kind=park_on",
            "event t_ms=7000 kind=level from=park to=alarm",
            "event t_ms=7000 kind=alarm_on",
            "event t_ms=12100 kind=level from=alarm to=clear",
            "event t_ms=12100 kind=park_off",
            "event t_ms=12100 kind=alarm_off",
        ]
    );
    park.done();
    alarm.done();
}

fn init_tx() -> [I2cTx; 3] {
    [
        I2cTx::write_read(ADDR, vec![0x0F], vec![0x33]),
        I2cTx::write(ADDR, vec![0x20, 0x57]),
        I2cTx::write(ADDR, vec![0x23, 0x88]),
    ]
}

fn read_tx() -> I2cTx {
    I2cTx::write_read(ADDR, vec![0xA8], LEVEL.to_bytes().to_vec())
}

fn nack() -> ErrorKind {
    ErrorKind::NoAcknowledge(NoAcknowledgeSource::Address)
}

#[test]
fn i2c_errors_past_the_stale_limit_park_and_alarm() {
    // Steady 4 Hz wind. The read at 1500 ms fails; the driver then sets the
    // sensor up again each step, and WHO_AM_I fails at 1600 and 1700 ms.
    // Last good reading 1400 ms; stale limit 250 ms: faulted at 1700 ms
    // (300 ms > 250 ms). Setup and reads succeed again from 1800 ms; the
    // fault clears 2000 ms later, at 3800 ms.
    let mut tx: Vec<I2cTx> = Vec::new();
    for i in 0..41 {
        match i {
            0 | 18 => {
                tx.extend(init_tx());
                tx.push(read_tx());
            }
            15 => tx.push(I2cTx::write_read(ADDR, vec![0xA8], vec![0; 6]).with_error(nack())),
            16 | 17 => tx.push(I2cTx::write_read(ADDR, vec![0x0F], vec![0]).with_error(nack())),
            _ => tx.push(read_tx()),
        }
    }
    let want = |t: u64| match t {
        0..=999 | 1700..=3799 => LineState::SAFE,
        _ => LineState::ALL_WELL,
    };
    let states: Vec<_> = (0..41).map(|i| want(i * PERIOD_MS)).collect();
    let (mut park, mut alarm) = pin_script(&states);
    let mut bus = I2cMock::new(&tx);
    let mut st = station(bus.clone(), cfg(), &park, &alarm);
    let freq = [4; 8];
    let events = run(
        &mut st,
        41,
        |t| StepInputs {
            pulses: latch(&freq, t),
            pose: None,
        },
        |_, _| {},
    );
    assert_eq!(events[..4], ARMED);
    assert_eq!(
        events[4..],
        [
            "event t_ms=1700 kind=fault source=accel cause=bus",
            "event t_ms=1700 kind=park_on",
            "event t_ms=1700 kind=alarm_on",
            "event t_ms=3800 kind=fault_cleared source=accel",
            "event t_ms=3800 kind=park_off",
            "event t_ms=3800 kind=alarm_off",
        ]
    );
    bus.done();
    park.done();
    alarm.done();
}

#[test]
fn with_no_tolerance_a_single_i2c_error_parks_and_alarms() {
    // accel_stale_ms = 0: the failed read at 1500 ms (100 ms after the last
    // good one) faults at once; good again from 1600 ms, cleared at 3600 ms.
    let mut tx: Vec<I2cTx> = Vec::new();
    for i in 0..40 {
        match i {
            0 | 16 => {
                tx.extend(init_tx());
                tx.push(read_tx());
            }
            15 => tx.push(I2cTx::write_read(ADDR, vec![0xA8], vec![0; 6]).with_error(nack())),
            _ => tx.push(read_tx()),
        }
    }
    let want = |t: u64| match t {
        0..=999 | 1500..=3599 => LineState::SAFE,
        _ => LineState::ALL_WELL,
    };
    let states: Vec<_> = (0..40).map(|i| want(i * PERIOD_MS)).collect();
    let (mut park, mut alarm) = pin_script(&states);
    let mut bus = I2cMock::new(&tx);
    let strict = StationConfig {
        accel_stale_ms: 0,
        ..cfg()
    };
    let mut st = station(bus.clone(), strict, &park, &alarm);
    let freq = [4; 8];
    let events = run(
        &mut st,
        40,
        |t| StepInputs {
            pulses: latch(&freq, t),
            pose: None,
        },
        |_, _| {},
    );
    assert!(events.contains(&"event t_ms=1500 kind=fault source=accel cause=bus".to_string()));
    assert!(events.contains(&"event t_ms=1500 kind=park_on".to_string()));
    assert!(events.contains(&"event t_ms=1500 kind=alarm_on".to_string()));
    assert!(events.contains(&"event t_ms=3600 kind=fault_cleared source=accel".to_string()));
    bus.done();
    park.done();
    alarm.done();
}

#[test]
fn a_stale_wind_sensor_parks_and_alarms() {
    // Latches delivered up to 2000 ms, none from 2100 to 7900 ms, again from
    // 8000 ms. Last wind speed at 2000 ms, stale limit 3000 ms: faulted at
    // 5100 ms. After the gap the first latch (8000 ms) opens a new window, the
    // first speed comes at 9000 ms, and the fault clears 2000 ms later.
    let freq = [4; 16];
    let want = |t: u64| match t {
        0..=999 | 5100..=10999 => LineState::SAFE,
        _ => LineState::ALL_WELL,
    };
    let steps = 121;
    let states: Vec<_> = (0..steps).map(|i| want(i * PERIOD_MS)).collect();
    let (mut park, mut alarm) = pin_script(&states);
    let mut bus = EmulatedLis3dh::new(ADDR);
    bus.set_output(Some(LEVEL));
    let mut st = station(bus, cfg(), &park, &alarm);
    let events = run(
        &mut st,
        steps,
        |t| StepInputs {
            pulses: if (2100..8000).contains(&t) {
                None
            } else {
                latch(&freq, t)
            },
            pose: None,
        },
        |_, _| {},
    );
    assert_eq!(events[..4], ARMED);
    assert_eq!(
        events[4..],
        [
            "event t_ms=5100 kind=fault source=wind cause=stale",
            "event t_ms=5100 kind=park_on",
            "event t_ms=5100 kind=alarm_on",
            "event t_ms=11000 kind=fault_cleared source=wind",
            "event t_ms=11000 kind=park_off",
            "event t_ms=11000 kind=alarm_off",
        ]
    );
    park.done();
    alarm.done();
}

#[test]
fn a_silent_vane_faults_against_the_wind_clock() {
    // Vane readable at the 1000 ms speed only. Speeds keep coming each
    // second; the vane's last good reading is 1000 ms behind the speed at
    // 4000 ms by 3000 ms (not over the limit) and at 5000 ms by 4000 ms: fault.
    let freq = [4; 8];
    let want = |t: u64| match t {
        0..=999 | 5000.. => LineState::SAFE,
        _ => LineState::ALL_WELL,
    };
    let steps = 56;
    let states: Vec<_> = (0..steps).map(|i| want(i * PERIOD_MS)).collect();
    let (mut park, mut alarm) = pin_script(&states);
    let mut bus = EmulatedLis3dh::new(ADDR);
    bus.set_output(Some(LEVEL));
    let mut st = station(bus, cfg(), &park, &alarm);
    let events = run(
        &mut st,
        steps,
        |t| StepInputs {
            pulses: latch(&freq, t),
            pose: None,
        },
        |st, t| {
            st.hardware().1.from_rad = if t <= 1000 { Some(0.5) } else { None };
        },
    );
    assert_eq!(events[..4], ARMED);
    assert_eq!(
        events[4..],
        [
            "event t_ms=5000 kind=fault source=vane cause=stale",
            "event t_ms=5000 kind=park_on",
            "event t_ms=5000 kind=alarm_on",
        ]
    );
    park.done();
    alarm.done();
}

#[test]
fn a_tilted_rig_raises_the_alarm() {
    // 3° tilt toward +x: specific force (sin 3°, 0, cos 3°) g = (52, 0, 999)
    // digits at 1 mg/digit; 3° is over the 2° limit. Wind steady and calm.
    let tilted = RawSample {
        words: [52 << 4, 0, 999 << 4],
    };
    let freq = [4; 4];
    let steps = 21;
    let want = |t: u64| match t {
        0..=999 | 1500.. => LineState::SAFE,
        _ => LineState::ALL_WELL,
    };
    let states: Vec<_> = (0..steps).map(|i| want(i * PERIOD_MS)).collect();
    let (mut park, mut alarm) = pin_script(&states);
    let mut bus = EmulatedLis3dh::new(ADDR);
    bus.set_output(Some(LEVEL));
    let mut st = station(bus, cfg(), &park, &alarm);
    let events = run(
        &mut st,
        steps,
        |t| StepInputs {
            pulses: latch(&freq, t),
            pose: None,
        },
        |st, t| {
            if t == 1500 {
                st.hardware().0.set_output(Some(tilted));
            }
        },
    );
    assert_eq!(events[..4], ARMED);
    assert_eq!(
        events[4..],
        [
            "event t_ms=1500 kind=level from=clear to=alarm",
            "event t_ms=1500 kind=park_on",
            "event t_ms=1500 kind=alarm_on",
        ]
    );
    park.done();
    alarm.done();
}

#[test]
fn a_lost_configuration_is_a_fault_and_the_sensor_is_set_up_again() {
    // Read-back every 2 steps: setup at step 0, read-back before the reads of
    // steps 2 and 4; at step 4 CTRL_REG1 reads its reset value 0x07.
    let verify_ok = I2cTx::write_read(ADDR, vec![0xA0], vec![0x57, 0, 0, 0x88]);
    let verify_lost = I2cTx::write_read(ADDR, vec![0xA0], vec![0x07, 0, 0, 0]);
    let mut tx: Vec<I2cTx> = Vec::new();
    tx.extend(init_tx());
    tx.push(read_tx());
    tx.push(read_tx());
    tx.push(verify_ok);
    tx.push(read_tx());
    tx.push(read_tx());
    tx.push(verify_lost);
    tx.extend(init_tx());
    tx.push(read_tx());
    let states = [LineState::SAFE; 6];
    let (mut park, mut alarm) = pin_script(&states);
    let mut bus = I2cMock::new(&tx);
    let c = StationConfig {
        verify_every_steps: 2,
        ..cfg()
    };
    let mut st = station(bus.clone(), c, &park, &alarm);
    let events = run(&mut st, 6, |_| StepInputs::default(), |_, _| {});
    assert!(
        events.contains(&"event t_ms=400 kind=fault source=accel cause=config_lost".to_string()),
        "{events:?}"
    );
    bus.done();
    park.done();
    alarm.done();
}

#[derive(Default)]
struct CountingWatchdog {
    feeds: u32,
}

impl Watchdog for CountingWatchdog {
    fn feed(&mut self) {
        self.feeds += 1;
    }
}

#[test]
fn the_watchdog_is_fed_only_after_a_completed_step() {
    let io = MockError::Io(std::io::ErrorKind::Other);
    // Step 1 drives both low; step 2's park write fails, the fallback drives
    // both low again.
    let mut park = PinMock::new(&[
        PinTx::set(State::Low),
        PinTx::set(State::Low).with_error(io),
        PinTx::set(State::Low),
    ]);
    let mut alarm = PinMock::new(&[PinTx::set(State::Low), PinTx::set(State::Low)]);
    let mut bus = EmulatedLis3dh::new(ADDR);
    bus.set_output(Some(LEVEL));
    let mut st = station(bus, cfg(), &park, &alarm);
    let mut wd = CountingWatchdog::default();
    let r = st.step_and_feed(0, StepInputs::default(), &mut wd);
    assert!(r.complete);
    assert_eq!(wd.feeds, 1);
    let r = st.step_and_feed(100, StepInputs::default(), &mut wd);
    assert!(!r.complete);
    assert_eq!(wd.feeds, 1);
    assert_eq!(r.lines, LineState::SAFE);
    assert_eq!(
        r.events.last().unwrap().to_string(),
        "event t_ms=100 kind=line_error line=park"
    );
    park.done();
    alarm.done();
}

#[test]
fn a_late_step_is_reported() {
    let (mut park, mut alarm) = pin_script(&[LineState::SAFE; 3]);
    let mut bus = EmulatedLis3dh::new(ADDR);
    bus.set_output(Some(LEVEL));
    let mut st = station(bus, cfg(), &park, &alarm);
    let _ = st.step(0, StepInputs::default());
    let r = st.step(200, StepInputs::default());
    assert!(
        r.events.is_empty(),
        "two periods is on time: {:?}",
        r.events
    );
    let r = st.step(450, StepInputs::default());
    assert_eq!(
        r.events[0].to_string(),
        "event t_ms=450 kind=late gap_ms=250"
    );
    park.done();
    alarm.done();
}

#[test]
fn the_driver_and_the_emulated_sensor_agree_on_the_register_map() {
    let mut bus = EmulatedLis3dh::new(ADDR);
    bus.set_output(Some(RawSample {
        words: [-8000, 4000, 16000],
    }));
    let mut acc = Lis3dh::new(bus, ADDR, Config::default());
    acc.init().unwrap();
    acc.verify_config().unwrap();
    let g = acc.read_g().unwrap();
    assert_eq!(g, [-0.5, 0.25, 1.0]);
    let bus = acc.release();
    assert_eq!(bus.register(lis3dh::reg::CTRL_REG1), 0x57);
    assert_eq!(bus.register(lis3dh::reg::CTRL_REG4), 0x88);
}
