//! The fail-safe output convention: energised (high) = all well; a request is
//! made by de-energising (low), so reset, hang or power loss reads as park
//! and alarm. (Common practice for safety interlocks, no source.)

use embedded_hal_mock::eh1::digital::{Mock as PinMock, State, Transaction as PinTx};
use embedded_hal_mock::eh1::MockError;
use standfast_firmware::lines::{FailSafeLines, LineError, LineState};

#[test]
fn starts_in_the_reset_state_without_touching_the_pins() {
    let mut park = PinMock::new(&[]);
    let mut alarm = PinMock::new(&[]);
    let lines = FailSafeLines::new(park.clone(), alarm.clone());
    assert_eq!(lines.state(), LineState::SAFE);
    park.done();
    alarm.done();
}

#[test]
fn all_well_energises_and_requests_de_energise() {
    let mut park = PinMock::new(&[
        PinTx::set(State::High),
        PinTx::set(State::Low),
        PinTx::set(State::Low),
    ]);
    let mut alarm = PinMock::new(&[
        PinTx::set(State::High),
        PinTx::set(State::High),
        PinTx::set(State::Low),
    ]);
    let mut lines = FailSafeLines::new(park.clone(), alarm.clone());
    lines.drive(LineState::ALL_WELL).unwrap();
    let park_only = LineState {
        park_requested: true,
        alarm_raised: false,
    };
    lines.drive(park_only).unwrap();
    assert_eq!(lines.state(), park_only);
    lines.drive(LineState::SAFE).unwrap();
    park.done();
    alarm.done();
}

#[test]
fn a_pin_error_falls_back_to_both_requests() {
    let io = MockError::Io(std::io::ErrorKind::Other);
    let mut park = PinMock::new(&[
        PinTx::set(State::High).with_error(io.clone()),
        PinTx::set(State::Low),
    ]);
    let mut alarm = PinMock::new(&[PinTx::set(State::Low)]);
    let mut lines = FailSafeLines::new(park.clone(), alarm.clone());
    assert_eq!(lines.drive(LineState::ALL_WELL), Err(LineError::Park(io)));
    assert_eq!(lines.state(), LineState::SAFE);
    park.done();
    alarm.done();
}
