//! Standard output and standard error for every command.
//!
//! A reader that goes away early (`syz ephemeris … | head -3`) closes the pipe under us:
//! the command then ends at once, quietly, with status 0, as if it had finished (the reader
//! asked for no more). Any other failure to write standard output (a full disk) ends it with
//! a message and status 2. A line that cannot be written to standard error is lost rather
//! than a panic.
//!
//! `main.rs` routes `print!`, `println!` and `eprintln!` through here for every module, so
//! no command can panic on a closed pipe; [`stdout`] is the handle for `write!`.

use std::io::{ErrorKind, Write};

/// Status when standard output fails for another reason than a reader gone away.
const WRITE_FAILED: i32 = 2;

/// End the process because standard output failed with `e`.
fn stop(e: &std::io::Error) -> ! {
    if e.kind() != ErrorKind::BrokenPipe {
        error_line(format_args!("syz: error: writing the output failed: {e}"));
        std::process::exit(WRITE_FAILED);
    }
    std::process::exit(0)
}

/// Standard output, locked. A write either succeeds or ends the process as the module
/// says, so callers need not look at the result.
pub struct Stdout(std::io::StdoutLock<'static>);

pub fn stdout() -> Stdout {
    Stdout(std::io::stdout().lock())
}

impl Write for Stdout {
    fn write(&mut self, buf: &[u8]) -> std::io::Result<usize> {
        match self.0.write(buf) {
            Err(e) if e.kind() != ErrorKind::Interrupted => stop(&e),
            r => r,
        }
    }

    fn flush(&mut self) -> std::io::Result<()> {
        self.0.flush().or_else(|e| stop(&e))
    }
}

/// What `print!` expands to.
pub fn text(args: std::fmt::Arguments) {
    let _ = stdout().write_fmt(args);
}

/// What `println!` expands to.
pub fn line(args: std::fmt::Arguments) {
    let mut out = stdout();
    let _ = out.write_fmt(args);
    let _ = out.write_all(b"\n");
}

/// What `eprintln!` expands to: the line is lost if standard error is closed.
pub fn error_line(args: std::fmt::Arguments) {
    let mut err = std::io::stderr().lock();
    let _ = err.write_fmt(args);
    let _ = err.write_all(b"\n");
}
