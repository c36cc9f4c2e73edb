//! What the batch test files share: running the built `calor batch` on bytes.

use std::io::Write;
use std::process::{Command, Output, Stdio};

/// `calor batch --input - --output - <extra>` with `input` on stdin; stdin is
/// written from its own thread so that a large output cannot stall it.
pub fn batch_stdin(input: &[u8], extra: &[&str]) -> Output {
    let mut child = Command::new(env!("CARGO_BIN_EXE_calor"))
        .args(["batch", "--input", "-", "--output", "-"])
        .args(extra)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("the calor binary runs");
    let mut stdin = child.stdin.take().expect("stdin is piped");
    let input = input.to_vec();
    let writer = std::thread::spawn(move || {
        let _ = stdin.write_all(&input);
    });
    let out = child.wait_with_output().expect("calor batch finishes");
    writer.join().expect("stdin writer");
    out
}
