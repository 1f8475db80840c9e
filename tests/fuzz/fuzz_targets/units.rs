#![no_main]
use beamsift::units::{self, Dim};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    if let Ok(s) = std::str::from_utf8(data) {
        for dim in [Dim::Length, Dim::Force, Dim::LineLoad, Dim::Moment, Dim::Stress, Dim::SecondMoment, Dim::Density] {
            if let Ok(v) = units::parse(s, dim) {
                assert!(v.is_finite());
            }
        }
    }
});
