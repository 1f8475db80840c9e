//! The catalogue reader against outside references: the fields of every
//! record equal what the `csv` crate (1.4, comment byte '#', flexible
//! records, no header) reads from the same bytes; line numbers equal a plain
//! count of line breaks (LF, CR, CR LF) before each record, written here
//! byte by byte; and reading in blocks of any size, with reads of any
//! length, gives the same records as parsing the whole input at once.

use beamsift::catalog::records::{Block, Blocks, Records, parse};
use proptest::prelude::*;

type Rec = (u64, Vec<Vec<u8>>);

fn ours_whole(data: &[u8]) -> Vec<Rec> {
    let mut r = Records::default();
    parse(data, b',', 1, &mut r, None);
    r.iter()
        .map(|x| (x.line(), x.iter().map(<[u8]>::to_vec).collect()))
        .collect()
}

fn ours_blocks(data: &[u8], segment: usize, step: usize) -> Vec<Rec> {
    let mut b = Blocks::new(Chunky { data, at: 0, step }, b',');
    b.set_segment(segment);
    let mut block = Block::default();
    let mut recs = Records::default();
    let mut out = Vec::new();
    while b.next_records(&mut block, &mut recs).unwrap() > 0 {
        out.extend(
            recs.iter()
                .map(|x| (x.line(), x.iter().map(<[u8]>::to_vec).collect())),
        );
    }
    out
}

fn blank(fields: &[Vec<u8>]) -> bool {
    fields.len() == 1 && fields[0].iter().all(|b| *b == b' ' || *b == b'\t')
}

/// The csv crate's records, without the blank lines our format skips.
fn reference_fields(data: &[u8]) -> Vec<Vec<Vec<u8>>> {
    let mut rdr = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .flexible(true)
        .has_headers(false)
        .from_reader(data);
    let mut out = Vec::new();
    let mut rec = csv::ByteRecord::new();
    while rdr.read_byte_record(&mut rec).unwrap() {
        let f: Vec<Vec<u8>> = rec.iter().map(<[u8]>::to_vec).collect();
        if !blank(&f) {
            out.push(f);
        }
    }
    out
}

/// Start lines by a byte-by-byte walk: quotes open only at a field's
/// first byte, `""` inside quotes is a quote, '#' at a record start is a
/// comment line.
fn reference_lines(data: &[u8]) -> Vec<u64> {
    let mut lines = Vec::new();
    let mut line = 1u64;
    let mut i = 0;
    let n = data.len();
    while i < n {
        let start = line;
        let comment = data[i] == b'#';
        let mut quoted = false;
        let mut field_start = true;
        let mut only_blank = true;
        let mut fields = 1;
        loop {
            if i >= n {
                break;
            }
            let b = data[i];
            if quoted {
                if b == b'"' {
                    if data.get(i + 1) == Some(&b'"') {
                        only_blank = false;
                        i += 2;
                        continue;
                    }
                    quoted = false;
                } else {
                    if b == b'\n' || (b == b'\r' && data.get(i + 1) != Some(&b'\n')) {
                        line += 1;
                    }
                    if b != b' ' && b != b'\t' {
                        only_blank = false;
                    }
                }
                i += 1;
                continue;
            }
            if b == b'\n' || b == b'\r' {
                i += if b == b'\r' && data.get(i + 1) == Some(&b'\n') {
                    2
                } else {
                    1
                };
                line += 1;
                break;
            }
            if !comment && b == b'"' && field_start {
                quoted = true;
                field_start = false;
                i += 1;
                continue;
            }
            if !comment && b == b',' {
                fields += 1;
                field_start = true;
            } else {
                field_start = false;
            }
            if b != b' ' && b != b'\t' {
                only_blank = false;
            }
            i += 1;
        }
        if quoted {
            // Never closed: a faulty record, kept to be reported.
            only_blank = false;
        }
        let blank_line = fields == 1 && only_blank;
        if !(comment || blank_line) {
            lines.push(start);
        }
    }
    lines
}

struct Chunky<'a> {
    data: &'a [u8],
    at: usize,
    step: usize,
}

impl std::io::Read for Chunky<'_> {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        let k = self.step.min(buf.len()).min(self.data.len() - self.at);
        buf[..k].copy_from_slice(&self.data[self.at..self.at + k]);
        self.at += k;
        Ok(k)
    }
}

fn tokens(lone_cr: bool) -> impl Strategy<Value = Vec<u8>> {
    let mut t = vec![
        "a", "bc", "12.5", ",", ",", "\"", "\"\"", "\n", "\n", "\r\n", "#", " ", "\t", "x\"y",
    ];
    if lone_cr {
        t.push("\r");
    }
    prop::collection::vec(prop::sample::select(t), 0..80).prop_map(|v| v.concat().into_bytes())
}

fn text() -> impl Strategy<Value = Vec<u8>> {
    tokens(true)
}

/// Without lone CRs: the csv crate ends a comment only at LF, where our
/// format (for files with CR line ends) ends it at any line break.
fn text_for_csv() -> impl Strategy<Value = Vec<u8>> {
    tokens(false)
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 3000, rng_seed: proptest::test_runner::RngSeed::Fixed(7), ..ProptestConfig::default() })]

    #[test]
    fn fields_equal_the_csv_crate(data in text_for_csv()) {
        // A quote never closed is a fault we report (always the last
        // record, as it runs to the end); the csv crate reads it as a
        // field, or as a blank line: compare the records before it.
        let mut r = Records::default();
        parse(&data, b',', 1, &mut r, None);
        let faulty = r.iter().last().is_some_and(|x| x.fault().is_some());
        let mut ours: Vec<Vec<Vec<u8>>> = ours_whole(&data).into_iter().map(|r| r.1).collect();
        let mut theirs = reference_fields(&data);
        if faulty {
            ours.pop();
            theirs.truncate(ours.len());
        }
        prop_assert_eq!(ours, theirs);
    }

    #[test]
    fn lines_equal_a_plain_count(data in text()) {
        let ours: Vec<u64> = ours_whole(&data).into_iter().map(|r| r.0).collect();
        prop_assert_eq!(ours, reference_lines(&data));
    }

    #[test]
    fn blocks_of_any_size_read_the_same(data in text(), segment in 1usize..40, step in 1usize..9) {
        prop_assert_eq!(ours_blocks(&data, segment, step), ours_whole(&data), "input {:?}", String::from_utf8_lossy(&data));
    }
}

/// The cases behind the line-number reports: CR LF files, CR-only files
/// whose first line is a comment, blank and whitespace-only lines.
#[test]
fn line_numbers_of_known_layouts() {
    let lines = |d: &[u8]| -> Vec<u64> { ours_whole(d).into_iter().map(|r| r.0).collect() };
    assert_eq!(lines(b"h,i\r\n# c\r\n\r\nA,1\r\nB,2\r\n"), vec![1, 4, 5]);
    assert_eq!(lines(b"# c\rh,i\rA,1\rB,2\r"), vec![2, 3, 4]);
    assert_eq!(lines(b"h,i\nA,1\n   \n\t\nB,2"), vec![1, 2, 5]);
    assert_eq!(lines(b"h,i\n\"two\nlines\",1\nB,2\n"), vec![1, 2, 4]);
}
