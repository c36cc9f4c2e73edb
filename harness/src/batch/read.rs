//! Reading CSV records: lines without a quote are split on commas directly,
//! the rest go through the `csv_core` state machine.
//!
//! The dialect is the `csv` crate's default, which this reader reproduces
//! (`prop_read_matches_csv_crate` compares the two): comma-separated, `"`
//! quotes with doubled quotes inside, records ended by LF, CR or CRLF, blank
//! lines skipped, a byte-order mark at the start dropped, rows of any length. A line without a `"` cannot hold a quoted
//! field, so in a plain book almost every record takes the direct path, which
//! costs a fraction of the state machine's per-byte work.
//!
//! Each record carries the 1-based line it starts on (line feeds counted),
//! for the row's error messages.

use std::io::{self, Read};

use csv::{ByteRecord, Position};

/// Bytes requested from the input per read; the buffer grows beyond this only
/// for a record longer than it.
const READ_SIZE: usize = 1 << 20;

/// The UTF-8 byte-order mark.
const BOM: &[u8] = b"\xEF\xBB\xBF";

/// A CSV record reader over any byte source.
pub struct RecordReader<R> {
    inner: R,
    /// `buf[start..end]` is read and not yet consumed.
    buf: Vec<u8>,
    start: usize,
    end: usize,
    eof: bool,
    /// Line (1-based, line feeds counted) and input offset of `buf[start]`.
    line: u64,
    byte: u64,
    /// Records read so far.
    records: u64,
    /// The state machine for records holding a quote, and its output buffers.
    core: csv_core::Reader,
    fields: Vec<u8>,
    ends: Vec<usize>,
}

impl<R: Read> RecordReader<R> {
    /// A reader at the start of `inner`.
    pub fn new(inner: R) -> Self {
        // The state machine drops a byte-order mark from its first input, but
        // it first sees the input at the first quoted record, which may be
        // anywhere: a blank line fed to it now makes that first input past.
        // The mark at the very start is the reader's own business.
        let mut core = csv_core::Reader::new();
        let _ = core.read_record(b"\n", &mut [], &mut []);
        RecordReader {
            inner,
            buf: vec![0; READ_SIZE],
            start: 0,
            end: 0,
            eof: false,
            line: 1,
            byte: 0,
            records: 0,
            core,
            fields: vec![0; 1024],
            ends: vec![0; 64],
        }
    }

    /// Reads the next record into `record`; `Ok(false)` at the end of input.
    ///
    /// # Errors
    /// Any error of the underlying reader other than an interruption.
    pub fn read_record(&mut self, record: &mut ByteRecord) -> io::Result<bool> {
        if self.byte == 0 && self.records == 0 {
            self.skip_byte_order_mark()?;
        }
        loop {
            self.skip_line_ends();
            if self.start == self.end {
                if self.eof || !self.fill()? {
                    return Ok(false);
                }
                continue;
            }
            let pending = self.buf.get(self.start..self.end).unwrap_or_default();
            let line_end = match memchr::memchr2(b'\n', b'\r', pending) {
                Some(i) => self.start + i,
                None if !self.eof => {
                    self.fill()?;
                    continue;
                }
                None => self.end,
            };
            let text = self.buf.get(self.start..line_end).unwrap_or_default();
            record.clear();
            if memchr::memchr(b'"', text).is_some() {
                self.read_quoted(record)?;
            } else {
                for field in text.split(|&b| b == b',') {
                    record.push_field(field);
                }
                self.set_position(record);
                // One terminator byte; a LF after a CR is then a blank line.
                let feed = self.buf.get(line_end) == Some(&b'\n');
                let next = (line_end + 1).min(self.end);
                self.byte += (next - self.start) as u64;
                self.line += u64::from(feed);
                self.start = next;
            }
            self.records += 1;
            return Ok(true);
        }
    }

    /// Drops a UTF-8 byte-order mark at the very start of the input, as the
    /// `csv` crate does (it is not part of the first cell).
    fn skip_byte_order_mark(&mut self) -> io::Result<()> {
        while self.end - self.start < BOM.len() && !self.eof {
            self.fill()?;
        }
        if self
            .buf
            .get(self.start..self.end)
            .is_some_and(|b| b.starts_with(BOM))
        {
            self.start += BOM.len();
            self.byte += BOM.len() as u64;
        }
        Ok(())
    }

    /// Passes the line ends at the front of the unread bytes (blank lines).
    fn skip_line_ends(&mut self) {
        while let Some(&b) = self.buf.get(self.start).filter(|_| self.start < self.end) {
            if b != b'\n' && b != b'\r' {
                break;
            }
            self.line += u64::from(b == b'\n');
            self.byte += 1;
            self.start += 1;
        }
    }

    /// Marks `buf[start..to]` consumed, counting its line feeds (the quoted
    /// path, whose fields may hold line ends).
    fn consume(&mut self, to: usize) {
        let passed = self.buf.get(self.start..to).unwrap_or_default();
        self.line += memchr::memchr_iter(b'\n', passed).count() as u64;
        self.byte += passed.len() as u64;
        self.start = to;
    }

    fn set_position(&self, record: &mut ByteRecord) {
        let mut position = Position::new();
        position
            .set_byte(self.byte)
            .set_line(self.line)
            .set_record(self.records);
        record.set_position(Some(position));
    }

    /// Reads one record that holds a quote with the state machine, from the
    /// record's first byte; it may run over several lines.
    fn read_quoted(&mut self, record: &mut ByteRecord) -> io::Result<()> {
        self.set_position(record);
        // No reset between records: it would make the state machine strip a
        // byte-order mark again, mid-input.
        let (mut out, mut ends) = (0, 0);
        loop {
            let input = self.buf.get(self.start..self.end).unwrap_or_default();
            let (result, read, written, ended) = self.core.read_record(
                input,
                self.fields.get_mut(out..).unwrap_or_default(),
                self.ends.get_mut(ends..).unwrap_or_default(),
            );
            self.consume(self.start + read);
            out += written;
            ends += ended;
            match result {
                csv_core::ReadRecordResult::InputEmpty => {
                    if !self.eof {
                        self.fill()?;
                    }
                }
                csv_core::ReadRecordResult::OutputFull => {
                    self.fields.resize(self.fields.len() * 2, 0);
                }
                csv_core::ReadRecordResult::OutputEndsFull => {
                    self.ends.resize(self.ends.len() * 2, 0);
                }
                csv_core::ReadRecordResult::Record | csv_core::ReadRecordResult::End => break,
            }
        }
        let mut from = 0;
        for &to in self.ends.get(..ends).unwrap_or_default() {
            record.push_field(self.fields.get(from..to).unwrap_or_default());
            from = to;
        }
        Ok(())
    }

    /// Moves the unread bytes to the front and reads more after them, growing
    /// the buffer when a record fills it; `Ok(false)` at the end of input.
    fn fill(&mut self) -> io::Result<bool> {
        self.buf.copy_within(self.start..self.end, 0);
        self.end -= self.start;
        self.start = 0;
        if self.buf.len() - self.end < READ_SIZE / 2 {
            self.buf.resize(self.buf.len() * 2, 0);
        }
        loop {
            match self
                .inner
                .read(self.buf.get_mut(self.end..).unwrap_or_default())
            {
                Ok(0) => {
                    self.eof = true;
                    return Ok(false);
                }
                Ok(n) => {
                    self.end += n;
                    return Ok(true);
                }
                Err(e) if e.kind() == io::ErrorKind::Interrupted => {}
                Err(e) => return Err(e),
            }
        }
    }
}
