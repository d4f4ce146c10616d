//! Progress bars on a terminal, silence in pipes.

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use std::io::IsTerminal;
use std::sync::Mutex;
use std::time::Duration;

/// A [`lodestone::montecarlo::Progress`] that draws on stderr when it is a terminal.
pub struct Bar {
    enabled: bool,
    bar: Mutex<Option<ProgressBar>>,
}

impl Bar {
    /// Enabled only when stderr is a terminal and `quiet` is false.
    pub fn new(quiet: bool) -> Self {
        Self { enabled: !quiet && std::io::stderr().is_terminal(), bar: Mutex::new(None) }
    }
}

impl lodestone::montecarlo::Progress for Bar {
    fn start(&self, label: &str, total: u64) {
        if !self.enabled {
            return;
        }
        // Hidden at first: runs shorter than about a second never show a bar.
        let b = ProgressBar::with_draw_target(Some(total), ProgressDrawTarget::hidden());
        b.set_style(
            ProgressStyle::with_template("{msg} [{bar:30}] {pos}/{len} ({eta})")
                .unwrap_or_else(|_| ProgressStyle::default_bar()),
        );
        b.set_message(label.to_string());
        *self.bar.lock().unwrap_or_else(|e| e.into_inner()) = Some(b);
    }
    fn advance(&self, n: u64) {
        if let Some(b) = self.bar.lock().unwrap_or_else(|e| e.into_inner()).as_ref() {
            b.inc(n);
            if b.is_hidden() && b.elapsed() > Duration::from_secs(1) {
                b.set_draw_target(ProgressDrawTarget::stderr_with_hz(8));
            }
        }
    }
    fn finish(&self) {
        if let Some(b) = self.bar.lock().unwrap_or_else(|e| e.into_inner()).take() {
            b.finish_and_clear();
        }
    }
}
