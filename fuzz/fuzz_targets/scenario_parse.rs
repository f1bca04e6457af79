//! Arbitrary text into the scenario loader: Ok or an Input error whose message names the input, never a panic.
#![no_main]

use junctura::scenario::Scenario;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    if let Err(e) = Scenario::parse(text, None) {
        assert_eq!(e.kind, junctura::ErrorKind::Input, "{e}");
        assert!(e.message.starts_with("<input>"), "{e}");
    }
});
