//! Anemometer pulse counting and calibration. The transfer function of a cup
//! anemometer is linear in the pulse frequency, v = A·f + B, with slope A and
//! offset B from its wind-tunnel calibration (the form used by cup-anemometer
//! calibration procedures such as IEC 61400-12-1 annex F; from memory).

use standfast_firmware::wind::{Anemometer, AnemometerCal, PulseCounter, PulseLatch};

fn cal() -> AnemometerCal {
    // Invented calibration: 0.75 m/s per Hz plus 0.3 m/s, stall below 0.5 Hz.
    AnemometerCal::new(0.75, 0.3, 0.5).unwrap()
}

#[test]
fn frequency_maps_to_speed_by_slope_and_offset() {
    let c = cal();
    // 10 Hz → 0.75·10 + 0.3 = 7.8 m/s; 0.5 Hz (at the stall) → 0.675 m/s.
    assert!((c.speed_mps(10.0) - 7.8).abs() < 1e-6);
    assert!((c.speed_mps(0.5) - 0.675).abs() < 1e-6);
    // Below the stall frequency the cups are not measuring: 0, not the offset.
    assert_eq!(c.speed_mps(0.49), 0.0);
    assert_eq!(c.speed_mps(0.0), 0.0);
    assert_eq!(c.speed_mps(f32::NAN), 0.0);
}

#[test]
fn calibration_is_validated() {
    assert!(AnemometerCal::new(0.0, 0.3, 0.5).is_err());
    assert!(AnemometerCal::new(0.75, -0.1, 0.5).is_err());
    assert!(AnemometerCal::new(f32::NAN, 0.3, 0.5).is_err());
    assert!(AnemometerCal::new(0.75, 0.3, -1.0).is_err());
}

#[test]
fn a_gate_window_gives_the_mean_frequency() {
    let mut a = Anemometer::new(cal(), 1000);
    let at = |total, at_ms| PulseLatch { total, at_ms };
    assert_eq!(a.update(at(100, 0)), None); // first latch opens the window
    assert_eq!(a.update(at(105, 500)), None); // gate not yet complete
                                              // 20 pulses in 2000 ms = 10 Hz → 7.8 m/s.
    let v = a.update(at(120, 2000)).unwrap();
    assert!((v - 7.8).abs() < 1e-5, "{v}");
    // The next window starts where the last ended: 4 pulses in 1 s = 4 Hz → 3.3 m/s.
    let v = a.update(at(124, 3000)).unwrap();
    assert!((v - 3.3).abs() < 1e-5, "{v}");
}

#[test]
fn the_running_total_may_wrap() {
    let mut a = Anemometer::new(cal(), 1000);
    assert_eq!(
        a.update(PulseLatch {
            total: u32::MAX - 4,
            at_ms: 0
        }),
        None
    );
    // 5 pulses to wrap to 0, then 5 more: 10 pulses in 1 s.
    let v = a
        .update(PulseLatch {
            total: 5,
            at_ms: 1000,
        })
        .unwrap();
    assert!((v - 7.8).abs() < 1e-5, "{v}");
}

#[test]
fn a_clock_step_backwards_restarts_the_window() {
    let mut a = Anemometer::new(cal(), 1000);
    let _ = a.update(PulseLatch {
        total: 0,
        at_ms: 5000,
    });
    assert_eq!(
        a.update(PulseLatch {
            total: 50,
            at_ms: 4000
        }),
        None
    );
    let v = a
        .update(PulseLatch {
            total: 54,
            at_ms: 5000,
        })
        .unwrap();
    assert!((v - 3.3).abs() < 1e-5, "{v}");
}

#[test]
fn the_counter_counts_from_an_interrupt_context() {
    static COUNTER: PulseCounter = PulseCounter::new();
    let before = COUNTER.total();
    std::thread::scope(|s| {
        for _ in 0..4 {
            s.spawn(|| {
                for _ in 0..1000 {
                    COUNTER.on_pulse();
                }
            });
        }
    });
    assert_eq!(COUNTER.total().wrapping_sub(before), 4000);
    assert_eq!(
        COUNTER.latch(42),
        PulseLatch {
            total: COUNTER.total(),
            at_ms: 42
        }
    );
}
