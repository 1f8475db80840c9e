//! The one progress-bar factory: a bar on stderr for long scans, hidden
//! when stderr is not a terminal or with --quiet. Updated per block of the file.

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use std::io::IsTerminal;

pub fn bytes_bar(total: u64, quiet: bool) -> ProgressBar {
    // Small jobs finish before a bar would be noticed.
    if quiet || !std::io::stderr().is_terminal() || total < 4 << 20 {
        return ProgressBar::with_draw_target(Some(total), ProgressDrawTarget::hidden());
    }
    let pb = ProgressBar::new(total);
    pb.set_style(
        ProgressStyle::with_template(
            "{spinner} checking sections {bar:40} {bytes}/{total_bytes} ({eta} left) {msg}",
        )
        .unwrap_or_else(|_| ProgressStyle::default_bar()),
    );
    pb
}

pub fn count_bar(total: u64, quiet: bool, what: &str) -> ProgressBar {
    if quiet || !std::io::stderr().is_terminal() || total < 50 {
        return ProgressBar::with_draw_target(Some(total), ProgressDrawTarget::hidden());
    }
    let pb = ProgressBar::new(total);
    pb.set_style(
        ProgressStyle::with_template(&format!(
            "{{spinner}} {what} {{bar:40}} {{pos}}/{{len}} ({{eta}} left)"
        ))
        .unwrap_or_else(|_| ProgressStyle::default_bar()),
    );
    pb
}
