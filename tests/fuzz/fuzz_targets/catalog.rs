#![no_main]
use beamsift::catalog::read::{self, ReadOptions};
use beamsift::check::Material;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let m = Material { name: String::new(), e: 1e4, fb_tension: 10.0, fb_compression: 10.0, fv: Some(1.0), fy: None, density: 450.0 };
    if let Ok(cat) = read::open(data, "fuzz.csv", &ReadOptions::default()) {
        let _ = read::validate(cat, &m, &[], true);
    }
});
