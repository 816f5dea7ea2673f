//! A progress bar on stderr for `split` over a file: shown only when stderr
//! is a terminal, standard output is not (the records would run into the
//! bar), and standard input is a regular file (so its size is known); it
//! measures the bytes read of that size.

use std::io::{IsTerminal, Write};
use std::time::{Duration, Instant};

/// How often the bar is redrawn.
const EVERY: Duration = Duration::from_millis(100);

/// Width of the bar itself, in characters.
const WIDTH: usize = 30;

/// The progress of reading a file of known size.
pub struct Progress {
    total: u64,
    read: u64,
    lines: u64,
    started: Instant,
    drawn: Option<Instant>,
}

impl Progress {
    /// A bar for standard input, when `wanted`, stderr is a terminal,
    /// stdout is not, and stdin is a regular file that is not empty; `None`
    /// otherwise.
    pub fn for_stdin(wanted: bool) -> Option<Progress> {
        if !wanted || !std::io::stderr().is_terminal() || std::io::stdout().is_terminal() {
            return None;
        }
        let total = stdin_file_size()?;
        Some(Progress::new(total))
    }

    fn new(total: u64) -> Progress {
        Progress {
            total,
            read: 0,
            lines: 0,
            started: Instant::now(),
            drawn: None,
        }
    }

    /// Counts one line of `bytes` bytes (its newline included) and redraws
    /// the bar when it is due.
    pub fn advance(&mut self, bytes: usize) {
        self.read += bytes as u64;
        self.lines += 1;
        let now = Instant::now();
        if self.drawn.map_or(true, |t| now.duration_since(t) >= EVERY) {
            self.drawn = Some(now);
            draw(&self.line(now));
        }
    }

    /// Removes the bar (at the end of the input).
    pub fn finish(&self) {
        if self.drawn.is_some() {
            draw("");
        }
    }

    /// The text of the bar: `[#####-----]  42%  1.2 MB / 2.9 MB  3,100 lines/s`.
    fn line(&self, now: Instant) -> String {
        let fraction = if self.total == 0 {
            1.0
        } else {
            (self.read as f64 / self.total as f64).min(1.0)
        };
        let filled = ((fraction * WIDTH as f64).round() as usize).min(WIDTH);
        let seconds = now.duration_since(self.started).as_secs_f64();
        let rate = if seconds > 0.0 {
            (self.lines as f64 / seconds).round() as u64
        } else {
            0
        };
        format!(
            "[{}{}] {:>3}%  {} / {}  {} lines/s",
            "#".repeat(filled),
            "-".repeat(WIDTH - filled),
            (fraction * 100.0).floor() as u64,
            megabytes(self.read),
            megabytes(self.total),
            grouped(rate)
        )
    }
}

/// Overwrites the current stderr line with `text`.
fn draw(text: &str) {
    let mut err = std::io::stderr().lock();
    // A failing stderr must not stop the analysis.
    let _ = write!(err, "\r\x1b[2K{text}");
    let _ = err.flush();
}

/// The size of standard input when it is a regular file.
fn stdin_file_size() -> Option<u64> {
    use std::os::fd::AsFd;
    let fd = std::io::stdin().as_fd().try_clone_to_owned().ok()?;
    let meta = std::fs::File::from(fd).metadata().ok()?;
    (meta.is_file() && meta.len() > 0).then(|| meta.len())
}

fn megabytes(bytes: u64) -> String {
    format!("{:.1} MB", bytes as f64 / 1_000_000.0)
}

/// `1234567` → `1,234,567`.
fn grouped(n: u64) -> String {
    let digits = n.to_string();
    let mut out = String::new();
    for (i, c) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(c);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bar_shows_the_fraction_read() {
        let mut p = Progress::new(2_000_000);
        p.read = 500_000;
        p.lines = 10;
        let line = p.line(p.started);
        assert!(line.starts_with(&format!("[{}{}]", "#".repeat(8), "-".repeat(22))));
        assert!(line.contains(" 25%"), "{line}");
        assert!(line.contains("0.5 MB / 2.0 MB"), "{line}");
        p.read = 3_000_000;
        assert!(p.line(p.started).contains("100%"));
    }

    #[test]
    fn numbers_are_grouped() {
        assert_eq!(grouped(0), "0");
        assert_eq!(grouped(999), "999");
        assert_eq!(grouped(1000), "1,000");
        assert_eq!(grouped(1234567), "1,234,567");
    }
}
