#![no_main]
use beamsift::catalog::read::{self, ReadOptions};
use beamsift::check::Material;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let m = Material::allowable("fuzz", 1e4, 10.0, Some(1.0), 450.0);
    // The file reader, then the block reader with tiny segments: both
    // must agree, and neither may panic.
    if let Ok(cat) = read::open(data, "fuzz.csv", &ReadOptions::default()) {
        let _ = read::validate(cat, &m, &[], true);
    }
    let mut whole = beamsift::catalog::records::Records::default();
    let text = data.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(data);
    beamsift::catalog::records::parse(text, b',', 1, &mut whole, None);
    let mut b = beamsift::catalog::records::Blocks::new(data, b',');
    b.set_segment(7);
    let mut block = beamsift::catalog::records::Block::default();
    let mut recs = beamsift::catalog::records::Records::default();
    let mut k = 0;
    while let Ok(n) = b.next_records(&mut block, &mut recs) {
        if n == 0 {
            break;
        }
        for r in recs.iter() {
            let w = whole.get(k);
            assert_eq!(w.line(), r.line());
            assert!(w.iter().eq(r.iter()));
            k += 1;
        }
    }
    assert_eq!(k, whole.len());
});
