//! The streaming loop: one thread reads chunks of records, the rayon pool
//! values and encodes each chunk, and a writer thread writes the encoded
//! chunks in input order.
//!
//! At most three chunks of records exist at a time (one being read, one
//! waiting, one being valued) and three chunks of output (one being encoded,
//! one waiting, one being written), all reused, so memory stays flat however
//! long the input is.

use std::fmt;
use std::io::{self, Read, Write};
use std::sync::mpsc;

use csv::ByteRecord;
use rayon::prelude::*;

use super::decode::{Header, HeaderError};
use super::encode::{self, Format};
use super::read::RecordReader;
use super::value::value_record;

/// Records per chunk handed to the pool: large enough to keep every core busy,
/// small enough that three chunks stay a few MiB.
pub const CHUNK_ROWS: usize = 16_384;

/// Records per piece of a chunk that one worker values and encodes in one go.
const PIECE_ROWS: usize = 1_024;

/// Counts of a finished run.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Summary {
    /// Data rows read (the header not counted).
    pub rows: u64,
    /// Rows with status `ok`.
    pub ok: u64,
    /// Rows with an error status.
    pub bad: u64,
}

/// Why a run stopped.
#[derive(Debug)]
pub enum BatchError {
    /// The header cannot start a batch (exit code 2).
    Header(HeaderError),
    /// Reading the input failed.
    Read(io::Error),
    /// Writing the output failed.
    Write(io::Error),
}

impl fmt::Display for BatchError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            BatchError::Header(e) => e.fmt(f),
            BatchError::Read(e) => write!(f, "input: {e}"),
            BatchError::Write(e) => write!(f, "output: {e}"),
        }
    }
}

impl std::error::Error for BatchError {}

/// An input whose header has been read and accepted; nothing written yet.
pub struct Started<R> {
    reader: RecordReader<R>,
    header: Header,
}

impl<R: Read + Send> Started<R> {
    /// Reads and checks the header of `input`.
    ///
    /// The CSV dialect: comma-separated, `"` quotes, LF, CR or CRLF line ends,
    /// blank lines skipped, rows of any length (a wrong length is the row's
    /// error, not the run's); see [`RecordReader`].
    ///
    /// # Errors
    /// [`BatchError::Header`] for a missing or unusable header,
    /// [`BatchError::Read`] if reading fails.
    pub fn new(input: R) -> Result<Started<R>, BatchError> {
        let mut reader = RecordReader::new(input);
        let mut first = ByteRecord::new();
        if !reader.read_record(&mut first).map_err(BatchError::Read)? {
            return Err(BatchError::Header(HeaderError::Empty));
        }
        let header = Header::new(&first).map_err(BatchError::Header)?;
        Ok(Started { reader, header })
    }

    /// The accepted header.
    pub fn header(&self) -> &Header {
        &self.header
    }

    /// Values every row and writes the results to `output` in input order.
    ///
    /// # Errors
    /// [`BatchError::Read`] or [`BatchError::Write`] on an I/O failure; rows
    /// never stop the run.
    pub fn finish<W: Write + Send>(
        self,
        output: &mut W,
        format: Format,
    ) -> Result<Summary, BatchError> {
        let Started { mut reader, header } = self;
        let mut head = Vec::new();
        encode::header_line(&header, format, &mut head);
        output.write_all(&head).map_err(BatchError::Write)?;
        let mut summary = Summary::default();
        std::thread::scope(|scope| {
            let (full_tx, full_rx) = mpsc::sync_channel::<Result<Chunk, io::Error>>(1);
            let (empty_tx, empty_rx) = mpsc::channel::<Chunk>();
            scope.spawn(move || loop {
                let mut chunk = empty_rx.try_recv().unwrap_or_default();
                let filled = chunk.fill(&mut reader);
                let done = !matches!(filled, Ok(true));
                if full_tx.send(filled.map(|_| chunk)).is_err() || done {
                    break;
                }
            });
            // The writer: a chunk's output (one buffer per piece) is written
            // while the next chunk is valued, so a write that waits on the
            // disk does not hold up the valuation. The buffers come back for
            // reuse.
            let (encoded_tx, encoded_rx) = mpsc::sync_channel::<Vec<Vec<u8>>>(1);
            let (written_tx, written_rx) = mpsc::channel::<Vec<Vec<u8>>>();
            let writer = scope.spawn(move || {
                for buffers in encoded_rx {
                    for bytes in &buffers {
                        output.write_all(bytes)?;
                    }
                    let _ = written_tx.send(buffers);
                }
                output.flush()
            });
            for chunk in full_rx {
                let chunk = chunk.map_err(BatchError::Read)?;
                let records = chunk.records();
                let mut buffers = written_rx.try_recv().unwrap_or_default();
                buffers.resize_with(records.len().div_ceil(PIECE_ROWS), Vec::new);
                let counts: Vec<(u64, u64)> = records
                    .par_chunks(PIECE_ROWS)
                    .zip(buffers.par_iter_mut())
                    .map(|(records, bytes)| encode_piece(&header, records, format, bytes))
                    .collect();
                for (ok, bad) in counts {
                    summary.ok += ok;
                    summary.bad += bad;
                }
                summary.rows += chunk.len as u64;
                // A writer that stopped has failed; its error is reported below.
                if encoded_tx.send(buffers).is_err() {
                    break;
                }
                // The reader may have finished; then the chunk is just dropped.
                let _ = empty_tx.send(chunk);
            }
            drop(encoded_tx);
            match writer.join() {
                Ok(written) => written.map_err(BatchError::Write),
                Err(panic) => std::panic::resume_unwind(panic),
            }
        })?;
        Ok(summary)
    }
}

/// Up to [`CHUNK_ROWS`] records; the first `len` are this chunk's, the rest are
/// kept from an earlier use so their buffers are reused.
#[derive(Default)]
struct Chunk {
    records: Vec<ByteRecord>,
    len: usize,
}

impl Chunk {
    /// Reads up to [`CHUNK_ROWS`] records; `Ok(false)` once the input is exhausted.
    fn fill<R: Read>(&mut self, reader: &mut RecordReader<R>) -> io::Result<bool> {
        self.len = 0;
        while self.len < CHUNK_ROWS {
            if self.records.len() == self.len {
                self.records.push(ByteRecord::new());
            }
            let Some(record) = self.records.get_mut(self.len) else {
                break;
            };
            if !reader.read_record(record)? {
                return Ok(false);
            }
            self.len += 1;
        }
        Ok(true)
    }

    fn records(&self) -> &[ByteRecord] {
        self.records.get(..self.len).unwrap_or_default()
    }
}

/// Values and encodes consecutive records into `bytes` (cleared first);
/// returns the counts of ok and bad rows.
fn encode_piece(
    header: &Header,
    records: &[ByteRecord],
    format: Format,
    bytes: &mut Vec<u8>,
) -> (u64, u64) {
    bytes.clear();
    let mut scratch = String::new();
    let (mut ok, mut bad) = (0, 0);
    for record in records {
        let outcome = value_record(header, record);
        if outcome.failure.is_none() {
            ok += 1;
        } else {
            bad += 1;
        }
        encode::row(header, record, &outcome, format, &mut scratch, bytes);
    }
    (ok, bad)
}

/// Runs a whole batch from bytes to bytes, in memory: for tests and fuzzing.
///
/// # Errors
/// As [`Started::new`] and [`Started::finish`].
///
/// # Examples
/// ```
/// use calor_harness::batch::{run_bytes, Format};
/// let book = b"id,kind,spot,strike,expiry,rate,vol\nngx-1,call,42,40,0.5,0.1,0.2\n";
/// let (out, summary) = run_bytes(book, Format::Csv)?;
/// assert_eq!(summary.ok, 1);
/// assert!(String::from_utf8(out)?.lines().nth(1).is_some_and(|l| l.starts_with("ngx-1,call,42,40,0.5,0.1,0.2,4.759422392871")));
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
pub fn run_bytes(input: &[u8], format: Format) -> Result<(Vec<u8>, Summary), BatchError> {
    let mut out = Vec::new();
    let summary = Started::new(input)?.finish(&mut out, format)?;
    Ok((out, summary))
}
