//! Our own reading of delimited text: records with exact line numbers,
//! found in blocks that can be parsed in parallel.
//!
//! The format is RFC 4180 with the leniencies catalogues need: a record
//! ends at LF, CR or CR LF (each one line; a line break inside quotes is a
//! line too, so line numbers are physical lines as an editor shows them); a
//! field is quoted only when its first byte is `"` (a quote elsewhere is
//! text), `""` inside quotes is one quote, and text after a closing quote
//! up to the delimiter is kept; a record whose first byte is `#` is a
//! comment; a record of one field holding only spaces or tabs is a blank
//! line. A byte-order mark at the start of the input is dropped.
//!
//! Two machines share these rules: [`boundaries`] finds where records end
//! (one pass, looking only at line breaks and quotes at field starts: this
//! is the sequential part of a parallel read), and [`parse`] splits a run
//! of whole records into fields (run in parallel on separate runs). The
//! tests check both against each other and against the `csv` crate.

use memchr::{memchr, memchr2, memchr3};

/// A fault of one record, reported as a bad row.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Fault {
    /// The input ended inside a quoted field.
    UnclosedQuote,
}

#[derive(Clone, Copy, Debug)]
struct Span {
    /// Index of the record's first field in `fields`.
    first: u32,
    count: u32,
    line: u64,
    fault: Option<Fault>,
}

/// Records of a run of input: the bytes copied once, fields as ranges of
/// them (a quoted field with `""` in it is stored unescaped after them).
#[derive(Default, Debug)]
pub struct Records {
    buf: Vec<u8>,
    fields: Vec<(u32, u32)>,
    spans: Vec<Span>,
}

/// One record of a [`Records`].
#[derive(Clone, Copy, Debug)]
pub struct Record<'a> {
    buf: &'a [u8],
    fields: &'a [(u32, u32)],
    line: u64,
    fault: Option<Fault>,
}

impl<'a> Record<'a> {
    pub fn len(&self) -> usize {
        self.fields.len()
    }
    pub fn is_empty(&self) -> bool {
        self.fields.is_empty()
    }
    /// Field `i`, without its quotes.
    #[inline]
    pub fn get(&self, i: usize) -> Option<&'a [u8]> {
        let (a, b) = *self.fields.get(i)?;
        Some(&self.buf[a as usize..b as usize])
    }
    pub fn iter(&self) -> impl Iterator<Item = &'a [u8]> + '_ {
        (0..self.len()).map(|i| self.get(i).unwrap_or(b""))
    }
    /// The physical line the record starts on (1-based).
    pub fn line(&self) -> u64 {
        self.line
    }
    pub fn fault(&self) -> Option<Fault> {
        self.fault
    }
}

impl Records {
    pub fn clear(&mut self) {
        self.buf.clear();
        self.fields.clear();
        self.spans.clear();
    }
    pub fn len(&self) -> usize {
        self.spans.len()
    }
    pub fn is_empty(&self) -> bool {
        self.spans.is_empty()
    }
    pub fn get(&self, k: usize) -> Record<'_> {
        let s = self.spans[k];
        Record {
            buf: &self.buf,
            fields: &self.fields[s.first as usize..(s.first + s.count) as usize],
            line: s.line,
            fault: s.fault,
        }
    }
    pub fn iter(&self) -> impl Iterator<Item = Record<'_>> + '_ {
        (0..self.len()).map(|k| self.get(k))
    }
    /// Append a record given as fields (for rows built in code).
    pub fn push(&mut self, fields: &[&[u8]], line: u64) {
        let first = self.fields.len() as u32;
        for f in fields {
            let a = self.buf.len() as u32;
            self.buf.extend_from_slice(f);
            self.fields.push((a, self.buf.len() as u32));
        }
        self.spans.push(Span {
            first,
            count: fields.len() as u32,
            line,
            fault: None,
        });
    }
}

/// Length of the line break at `data[i]` (a CR or LF): 2 for CR LF, else 1.
/// With `eof` false, a CR that is the last byte is not yet known: None.
#[inline]
fn line_break(data: &[u8], i: usize, eof: bool) -> Option<usize> {
    if data[i] == b'\r' {
        match data.get(i + 1) {
            Some(b'\n') => Some(2),
            Some(_) => Some(1),
            None if eof => Some(1),
            None => None,
        }
    } else {
        Some(1)
    }
}

/// The end of every whole record in `data` (which starts at a record
/// start, on line `line`): calls `mark(end, next_line)` after each record,
/// with the byte offset just past its line break and the line the next
/// record starts on. Returns the offset and line after the last whole
/// record: with `eof` false, what follows is an incomplete record to be
/// read on.
pub fn boundaries(
    data: &[u8],
    eof: bool,
    delim: u8,
    mut line: u64,
    mut mark: impl FnMut(usize, u64),
) -> (usize, u64) {
    let n = data.len();
    let mut i = 0;
    let mut done = (0, line);
    while i < n {
        let record_start = i;
        // The line break that ends this record (None: the data ends first).
        let end = if data[i] == b'#' {
            // A comment runs to its line break; quotes in it are text.
            memchr2(b'\n', b'\r', &data[i..]).map(|k| i + k)
        } else {
            let mut in_quotes = false;
            loop {
                let found = if in_quotes {
                    memchr(b'"', &data[i..]).map(|k| (i + k, b'"'))
                } else {
                    memchr3(b'"', b'\n', b'\r', &data[i..]).map(|k| (i + k, data[i + k]))
                };
                // Inside quotes, line breaks are counted as they are passed.
                if in_quotes {
                    let upto = found.map_or(n, |f| f.0);
                    line += count_lines(&data[i..upto], eof || found.is_some());
                }
                let Some((j, b)) = found else {
                    break None;
                };
                if b != b'"' {
                    break Some(j);
                }
                if in_quotes {
                    match data.get(j + 1) {
                        Some(b'"') => i = j + 2,
                        None if !eof => return done,
                        _ => {
                            in_quotes = false;
                            i = j + 1;
                        }
                    }
                } else {
                    // A quote opens a field only as its first byte.
                    in_quotes = j == record_start || data[j - 1] == delim;
                    i = j + 1;
                }
            }
        };
        let Some(j) = end else {
            if eof {
                // The last record has no line break (or an unclosed quote).
                mark(n, line);
                return (n, line);
            }
            return done;
        };
        let Some(len) = line_break(data, j, eof) else {
            return done;
        };
        i = j + len;
        line += 1;
        mark(i, line);
        done = (i, line);
    }
    done
}

/// Line breaks in `s` (CR LF counts once). A CR that ends `s` counts
/// unless it may be the first half of a CR LF still to come (`whole`
/// false).
fn count_lines(s: &[u8], whole: bool) -> u64 {
    let mut n = 0;
    let mut i = 0;
    while let Some(k) = memchr2(b'\n', b'\r', &s[i..]) {
        let j = i + k;
        if s[j] == b'\r' && s.get(j + 1) == Some(&b'\n') {
            i = j + 2;
        } else {
            if s[j] == b'\r' && j + 1 == s.len() && !whole {
                break;
            }
            i = j + 1;
        }
        n += 1;
    }
    n
}

/// Each byte of `x` that is zero marked by its high bit, exactly (no
/// carries between bytes: the low seven bits are added apart from the top
/// one).
#[inline]
fn zero_bytes(x: u64) -> u64 {
    const LOW7: u64 = 0x7f7f_7f7f_7f7f_7f7f;
    !((((x & LOW7).wrapping_add(LOW7)) | x) | LOW7)
}

/// The first delimiter or line break at or after `i` (or `data.len()`):
/// eight bytes at a time (fields are short, so this beats a vector search,
/// and a byte loop by about three instructions a byte), then byte by byte
/// for the last few.
#[inline]
fn field_end(data: &[u8], mut i: usize, delim: u8) -> usize {
    const ONES: u64 = 0x0101_0101_0101_0101;
    let (d, lf, cr) = (
        ONES * u64::from(delim),
        ONES * u64::from(b'\n'),
        ONES * u64::from(b'\r'),
    );
    while let Some(chunk) = data.get(i..i + 8) {
        let mut w = [0u8; 8];
        w.copy_from_slice(chunk);
        let w = u64::from_le_bytes(w);
        let hit = zero_bytes(w ^ d) | zero_bytes(w ^ lf) | zero_bytes(w ^ cr);
        if hit != 0 {
            return i + (hit.trailing_zeros() / 8) as usize;
        }
        i += 8;
    }
    while i < data.len() {
        let b = data[i];
        if b == delim || b == b'\n' || b == b'\r' {
            return i;
        }
        i += 1;
    }
    i
}

/// Split `data` (whole records, starting on line `line`) into `out`,
/// appending. Comment lines and blank lines are left out; `stop_after`
/// (if given) stops after that many records and returns the offset and
/// line there.
pub fn parse(
    data: &[u8],
    delim: u8,
    mut line: u64,
    out: &mut Records,
    stop_after: Option<usize>,
) -> (usize, u64) {
    let n = data.len();
    // One copy of the bytes; fields are ranges of it.
    let base = out.buf.len();
    out.buf.extend_from_slice(data);
    let at = |k: usize| (base + k) as u32;
    let mut i = 0;
    let mut got = 0usize;
    while i < n {
        if stop_after.is_some_and(|s| got >= s) {
            break;
        }
        let start_line = line;
        if data[i] == b'#' {
            match memchr2(b'\n', b'\r', &data[i..]) {
                None => i = n,
                Some(k) => {
                    let j = i + k;
                    i = j + line_break(data, j, true).unwrap_or(1);
                    line += 1;
                }
            }
            continue;
        }
        let first = out.fields.len() as u32;
        let mut fault = None;
        // Fields until the line break that ends the record.
        loop {
            // A quoted start: the content, unescaped when it holds `""`.
            let mut quoted: Option<(u32, u32)> = None;
            if data.get(i) == Some(&b'"') {
                let open = i + 1;
                let mut j = open;
                let mut escaped = false;
                loop {
                    match memchr(b'"', &data[j..]) {
                        None => {
                            j = n;
                            fault = Some(Fault::UnclosedQuote);
                            break;
                        }
                        Some(k) => {
                            let q = j + k;
                            if data.get(q + 1) == Some(&b'"') {
                                escaped = true;
                                j = q + 2;
                            } else {
                                j = q;
                                break;
                            }
                        }
                    }
                }
                line += count_lines(&data[open..j], true);
                quoted = Some(if escaped {
                    let a = out.buf.len();
                    let mut k = open;
                    while k < j {
                        if data[k] == b'"' {
                            k += 1;
                        }
                        out.buf.push(data[k]);
                        k += 1;
                    }
                    (a as u32, out.buf.len() as u32)
                } else {
                    (at(open), at(j))
                });
                i = (j + 1).min(n);
            }
            // The unquoted field, or what follows a closing quote.
            let j = field_end(data, i, delim);
            let field = match quoted {
                None => (at(i), at(j)),
                Some(q) if j == i => q,
                Some((a, b)) => {
                    // Text after the closing quote joins the field.
                    let start = out.buf.len();
                    out.buf.extend_from_within(a as usize..b as usize);
                    out.buf.extend_from_slice(&data[i..j]);
                    (start as u32, out.buf.len() as u32)
                }
            };
            out.fields.push(field);
            if j == n {
                i = n;
                break;
            }
            if data[j] == delim {
                i = j + 1;
                continue;
            }
            i = j + line_break(data, j, true).unwrap_or(1);
            line += 1;
            break;
        }
        let count = out.fields.len() as u32 - first;
        // A line of nothing but spaces or tabs is blank.
        if count == 1 && fault.is_none() {
            let (a, b) = out.fields[first as usize];
            if out.buf[a as usize..b as usize]
                .iter()
                .all(|b| *b == b' ' || *b == b'\t')
            {
                out.fields.pop();
                continue;
            }
        }
        out.spans.push(Span {
            first,
            count,
            line: start_line,
            fault,
        });
        got += 1;
    }
    (i, line)
}

/// A run of whole records inside a [`Block`].
#[derive(Clone, Copy, Debug)]
pub struct Segment {
    pub start: usize,
    pub end: usize,
    /// Line of the first record.
    pub line: u64,
}

/// Whole records read from the input, split into segments to parse in
/// parallel.
#[derive(Default, Debug)]
pub struct Block {
    pub data: Vec<u8>,
    pub segments: Vec<Segment>,
    /// Input bytes consumed up to the end of this block.
    pub end_offset: u64,
}

impl Block {
    /// Parse segment `k` into `out` (cleared first).
    pub fn parse_segment(&self, k: usize, delim: u8, out: &mut Records) {
        out.clear();
        let s = self.segments[k];
        parse(&self.data[s.start..s.end], delim, s.line, out, None);
    }
}

/// Longest record accepted (an unclosed quote would otherwise read the
/// whole input into memory).
pub const MAX_RECORD: usize = 16 << 20;

/// Bytes per segment by default (a block is 12 segments: two blocks are
/// in flight while one is merged and the next parsed; 16 took the peak
/// memory of a 10 M-row scan to 1.12–1.17× a 100 k-row one, 12 to
/// 1.08–1.10× at the same speed, 8 was slower; benches/README.md).
pub const SEGMENT: usize = 64 << 10;
const SEGMENTS_PER_BLOCK: usize = 12;

/// A record longer than [`MAX_RECORD`], from `line`.
#[derive(Debug)]
pub enum ReadError {
    Io(std::io::Error),
    TooLong { line: u64 },
}

/// Reads an input in blocks of whole records.
pub struct Blocks<R> {
    input: R,
    /// Bytes read and not yet handed out (they start at a record start).
    carry: Vec<u8>,
    eof: bool,
    /// Line of `carry[0]`.
    line: u64,
    /// Input offset of `carry[0]`.
    offset: u64,
    delim: u8,
    started: bool,
    /// Bytes per segment.
    segment: usize,
}

impl<R: std::io::Read> Blocks<R> {
    pub fn new(input: R, delim: u8) -> Self {
        Blocks {
            input,
            carry: Vec::new(),
            eof: false,
            line: 1,
            offset: 0,
            delim,
            started: false,
            segment: SEGMENT,
        }
    }

    /// Bytes per segment (results never depend on it; tests vary it).
    pub fn set_segment(&mut self, bytes: usize) {
        self.segment = bytes.max(1);
    }

    fn block(&self) -> usize {
        self.segment.saturating_mul(SEGMENTS_PER_BLOCK)
    }

    /// Read until `carry` holds at least `want` bytes or the input ends.
    fn fill(&mut self, want: usize) -> std::io::Result<()> {
        while !self.eof && self.carry.len() < want {
            let len = self.carry.len();
            let add = (want - len).max(self.block() / 4).max(4096);
            self.carry.resize(len + add, 0);
            match self.input.read(&mut self.carry[len..]) {
                Ok(0) => {
                    self.carry.truncate(len);
                    self.eof = true;
                }
                Ok(k) => self.carry.truncate(len + k),
                Err(e) if e.kind() == std::io::ErrorKind::Interrupted => {
                    self.carry.truncate(len);
                }
                Err(e) => {
                    self.carry.truncate(len);
                    return Err(e);
                }
            }
            if self.carry.len() >= 3 {
                self.drop_bom();
            }
        }
        if self.eof {
            self.drop_bom();
        }
        Ok(())
    }

    /// Drop a byte-order mark at the very start of the input (once).
    fn drop_bom(&mut self) {
        if !self.started {
            self.started = true;
            if self.carry.starts_with(b"\xEF\xBB\xBF") {
                self.carry.drain(..3);
                self.offset += 3;
            }
        }
    }

    /// The first `count` records that are not comments or blank lines
    /// (the header), or fewer at the end of the input.
    pub fn take_records(&mut self, count: usize, out: &mut Records) -> Result<(), ReadError> {
        let mut want = self.segment;
        loop {
            self.fill(want).map_err(ReadError::Io)?;
            let (end, _) = boundaries(&self.carry, self.eof, self.delim, self.line, |_, _| {});
            out.clear();
            let (used, line) = parse(&self.carry[..end], self.delim, self.line, out, Some(count));
            // What was used is whole records: drop it when it is all
            // there is to hand out, or only comments and blank lines (so
            // only the record still being read counts against the limit);
            // records found short of `count` are parsed again next time.
            if out.len() >= count || self.eof || out.is_empty() {
                self.carry.drain(..used);
                self.offset += used as u64;
                self.line = line;
            }
            if out.len() >= count || self.eof {
                return Ok(());
            }
            if self.carry.len() > MAX_RECORD {
                return Err(ReadError::TooLong { line: self.line });
            }
            want = (self.carry.len() * 2).clamp(self.segment, MAX_RECORD + 1);
        }
    }

    /// The next block of whole records; false at the end of the input.
    pub fn next_block(&mut self, block: &mut Block) -> Result<bool, ReadError> {
        let mut want = self.block();
        let segment = self.segment;
        loop {
            self.fill(want).map_err(ReadError::Io)?;
            if self.carry.is_empty() {
                return Ok(false);
            }
            block.segments.clear();
            let line0 = self.line;
            let mut seg_start = 0usize;
            let mut seg_line = line0;
            let segments = &mut block.segments;
            // The limit holds for every record, however the reads fell.
            let (mut rec_start, mut rec_line, mut too_long) = (0usize, line0, None);
            let (end, line) = boundaries(&self.carry, self.eof, self.delim, line0, |at, next| {
                if at - rec_start > MAX_RECORD && too_long.is_none() {
                    too_long = Some(rec_line);
                }
                rec_start = at;
                rec_line = next;
                if at - seg_start >= segment {
                    segments.push(Segment {
                        start: seg_start,
                        end: at,
                        line: seg_line,
                    });
                    seg_start = at;
                    seg_line = next;
                }
            });
            if let Some(line) = too_long {
                return Err(ReadError::TooLong { line });
            }
            if end == 0 {
                // Not one whole record yet: read on (up to the limit).
                if self.eof {
                    return Ok(false);
                }
                if self.carry.len() > MAX_RECORD {
                    return Err(ReadError::TooLong { line: self.line });
                }
                // Grow to one byte past the limit at most, so every record
                // longer than the limit is refused wherever it lies.
                want = (self.carry.len() * 2).min(MAX_RECORD + 1);
                continue;
            }
            if end > seg_start {
                block.segments.push(Segment {
                    start: seg_start,
                    end,
                    line: seg_line,
                });
            }
            // A read may bring more than a block: hand out one block's
            // segments and keep the rest for the next call.
            let (end, line) = if block.segments.len() > SEGMENTS_PER_BLOCK {
                let next = block.segments[SEGMENTS_PER_BLOCK];
                block.segments.truncate(SEGMENTS_PER_BLOCK);
                (next.start, next.line)
            } else {
                (end, line)
            };
            // Hand out carry[..end] without copying it: swap buffers and
            // carry the incomplete tail over.
            block.data.clear();
            block.data.extend_from_slice(&self.carry[end..]);
            std::mem::swap(&mut block.data, &mut self.carry);
            block.data.truncate(end);
            self.offset += end as u64;
            self.line = line;
            block.end_offset = self.offset;
            return Ok(true);
        }
    }

    /// Input bytes handed out so far.
    pub fn offset(&self) -> u64 {
        self.offset
    }

    /// Next records (at least one block's worth) into `out`; 0 at the end.
    pub fn next_records(
        &mut self,
        block: &mut Block,
        out: &mut Records,
    ) -> Result<usize, ReadError> {
        out.clear();
        // A block may hold only comments and blank lines: read on.
        while out.is_empty() {
            if !self.next_block(block)? {
                return Ok(0);
            }
            for s in &block.segments {
                parse(&block.data[s.start..s.end], self.delim, s.line, out, None);
            }
        }
        Ok(out.len())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn all(data: &[u8]) -> Vec<(u64, Vec<String>, Option<Fault>)> {
        let mut r = Records::default();
        parse(data, b',', 1, &mut r, None);
        r.iter()
            .map(|x| {
                (
                    x.line(),
                    x.iter()
                        .map(|f| String::from_utf8_lossy(f).into_owned())
                        .collect(),
                    x.fault(),
                )
            })
            .collect()
    }

    #[test]
    fn line_numbers_count_every_kind_of_break() {
        let v = all(b"a,b\r\n# c\r\n\r\nd,e\r\nf,g\r\n");
        assert_eq!(v.iter().map(|x| x.0).collect::<Vec<_>>(), vec![1, 4, 5]);
        let v = all(b"# c\ra,b\rc,d\r");
        assert_eq!(v.iter().map(|x| x.0).collect::<Vec<_>>(), vec![2, 3]);
        let v = all(b"a,\"x\ny\"\n  \n\t\nb,c");
        assert_eq!(v[0].1, vec!["a", "x\ny"]);
        assert_eq!(v[1].0, 5);
    }

    #[test]
    fn quotes_only_at_field_start() {
        let v = all(b"W 12\" x,\"a,\"\"b\"\"\"\n");
        assert_eq!(v[0].1, vec!["W 12\" x", "a,\"b\""]);
        let v = all(b"\"open,never closed\nx,y\n");
        assert_eq!(v.len(), 1);
        assert_eq!(v[0].2, Some(Fault::UnclosedQuote));
    }
}
