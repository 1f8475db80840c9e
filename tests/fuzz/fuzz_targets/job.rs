#![no_main]
use beamsift::check::Prepared;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    if let Ok(s) = std::str::from_utf8(data)
        && let Ok(job) = beamsift::job::from_toml(s, "fuzz.toml")
    {
        // Whatever parses must analyse without panicking.
        let _ = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone());
    }
});
