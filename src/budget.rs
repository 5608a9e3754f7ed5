//! Budgets: how much memory and time one command may use.
//!
//! Work is estimated before it starts and refused, with the estimate and
//! advice, when it would exceed the budget, instead of exhausting the
//! machine or running for hours.
//!
//! - **Memory** is estimated from the inputs before anything large is
//!   allocated. An estimate is the process's baseline ([`BASELINE_BYTES`]),
//!   plus the working memory of the computation, plus what every listed
//!   level and state costs downstream: the answer's rows, the text table or
//!   JSON made from them, and the output. Listings set that downstream cost
//!   ([`Budget::with_output`]); models count their levels and states.
//!   Estimates are upper bounds: `tests/budgets.rs` measures the process's
//!   peak (`ZSUM_PEAK_MEMORY`) over a range of sizes and requires it below
//!   the estimate, and the estimate within a factor of 2 of it at the
//!   largest size.
//! - **Time** is estimated in elementary operations converted to seconds
//!   on a reference machine ([`Budget::check_work`]) where the work is known
//!   from the inputs (counting tables, listings), and by a [`Meter`] where
//!   it is not (certified sums, whose cost depends on the precision and the
//!   levels a temperature reaches): the most expensive step is done first,
//!   timed, and the whole projected from it; a projection beyond the budget
//!   is refused before the rest is done.

use crate::error::{Error, Result};
use std::cell::Cell;
use std::sync::atomic::{AtomicU64, Ordering};
use std::time::Instant;

/// The largest memory estimate any budget check of this process has made,
/// in bytes: a diagnostic the budget tests compare with the measured peak.
static LARGEST_ESTIMATE: AtomicU64 = AtomicU64::new(0);

/// The largest memory estimate checked so far in this process, in bytes
/// (every stage of a command is estimated and checked; this is the
/// largest).
pub fn largest_estimate() -> u64 {
    LARGEST_ESTIMATE.load(Ordering::Relaxed)
}

/// Memory of a running zsum before any work: code, libraries, allocator
/// (measured: 5 MiB alone, up to 8.6 MiB with the worker threads and the
/// species database; counted with room).
pub const BASELINE_BYTES: f64 = 10.0 * 1024.0 * 1024.0;

/// Elementary operations per second of the reference machine: one core of
/// the 2-core development machine (zsum's README lists it), for the
/// operations the work estimates count (a machine-word update of a table
/// cell, a comparison, a short copy).
pub const REFERENCE_OPS_PER_SECOND: f64 = 2e8;

/// A limit on the memory and the time that one command may use.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Budget {
    bytes: u64,
    seconds: f64,
    per_level: f64,
    per_state: f64,
}

impl Budget {
    /// The default memory budget, 2 GiB.
    pub const DEFAULT_BYTES: u64 = 2 << 30;

    /// The default time budget, 5 minutes.
    pub const DEFAULT_SECONDS: f64 = 300.0;

    /// A budget of `bytes` bytes (and the default time).
    pub fn bytes(bytes: u64) -> Self {
        Budget {
            bytes,
            ..Budget::default()
        }
    }

    /// The same budget with `seconds` of time.
    pub fn with_seconds(self, seconds: f64) -> Self {
        Budget { seconds, ..self }
    }

    /// The same budget, every listed level costing `per_level` and every
    /// listed state `per_state` bytes downstream (the answer's rows and
    /// their rendering).
    pub fn with_output(self, per_level: f64, per_state: f64) -> Self {
        Budget {
            per_level,
            per_state,
            ..self
        }
    }

    /// The memory budget in bytes.
    pub fn limit(&self) -> u64 {
        self.bytes
    }

    /// The time budget in seconds.
    pub fn seconds(&self) -> f64 {
        self.seconds
    }

    /// Refuses work estimated at `estimate` bytes of working memory (the
    /// baseline is added here) if it exceeds the budget; `what` names the
    /// work (formatted only when refusing) and `advice` says how to
    /// proceed.
    pub fn check(&self, what: impl std::fmt::Display, estimate: f64, advice: &str) -> Result<()> {
        self.check_listing(what, estimate, 0.0, 0.0, advice)
    }

    /// As [`Budget::check`] for a listing: `working` bytes of working
    /// memory, then `levels` levels and `states` states listed, each with
    /// its downstream cost.
    pub fn check_listing(
        &self,
        what: impl std::fmt::Display,
        working: f64,
        levels: f64,
        states: f64,
        advice: &str,
    ) -> Result<()> {
        let estimate = BASELINE_BYTES + working + levels * self.per_level + states * self.per_state;
        if estimate.is_finite() {
            LARGEST_ESTIMATE.fetch_max(estimate as u64, Ordering::Relaxed);
        }
        if estimate > self.bytes as f64 || estimate.is_nan() {
            Err(Error::budget(format!(
                "{what} would need about {} of memory, more than the memory budget of {}; \
                 {advice}",
                human_bytes(estimate),
                human_bytes(self.bytes as f64)
            )))
        } else {
            Ok(())
        }
    }

    /// As [`Budget::check`] for listing `levels` levels of `bytes_each`
    /// bytes of working memory each (plus their downstream cost).
    pub fn check_levels(
        &self,
        what: impl std::fmt::Display,
        levels: f64,
        bytes_each: f64,
        advice: &str,
    ) -> Result<()> {
        self.check_listing(what, levels * bytes_each, levels, 0.0, advice)
    }

    /// Refuses work of `ops` elementary operations if, at the reference
    /// machine's speed, it would take longer than the time budget.
    pub fn check_work(&self, what: impl std::fmt::Display, ops: f64, advice: &str) -> Result<()> {
        let seconds = ops / REFERENCE_OPS_PER_SECOND;
        if seconds > self.seconds || seconds.is_nan() {
            Err(Error::budget(format!(
                "{what} would take about {} (about {ops:.1e} operations at {:.0e} a second), \
                 more than the time budget of {}; {advice}",
                human_seconds(seconds),
                REFERENCE_OPS_PER_SECOND,
                human_seconds(self.seconds)
            )))
        } else {
            Ok(())
        }
    }
}

impl Default for Budget {
    fn default() -> Self {
        Budget {
            bytes: Self::DEFAULT_BYTES,
            seconds: Self::DEFAULT_SECONDS,
            per_level: 0.0,
            per_state: 0.0,
        }
    }
}

/// Writes a byte count as e.g. `"1.5 GiB"`.
pub fn human_bytes(b: f64) -> String {
    const UNITS: [&str; 6] = ["B", "KiB", "MiB", "GiB", "TiB", "PiB"];
    let mut v = b;
    let mut i = 0;
    while v >= 1024.0 && i + 1 < UNITS.len() {
        v /= 1024.0;
        i += 1;
    }
    if i == UNITS.len() - 1 && v >= 1024.0 {
        return format!("{b:.1e} B");
    }
    format!("{v:.1} {}", UNITS[i])
}

/// Writes a duration as e.g. `"4.2 s"`, `"12 min"`, `"3.1 h"`.
pub fn human_seconds(s: f64) -> String {
    if !s.is_finite() {
        "forever".into()
    } else if s < 120.0 {
        format!("{s:.1} s")
    } else if s < 7200.0 {
        format!("{:.0} min", s / 60.0)
    } else if s < 172800.0 {
        format!("{:.1} h", s / 3600.0)
    } else {
        format!("{:.0} days", s / 86400.0)
    }
}

/// Times a loop of `total` steps whose cost is not known in advance and
/// refuses it once the time it projects exceeds the budget. Steps are done
/// most expensive first where the caller can (the hottest temperature
/// first), so the projection from the steps done is an upper bound; a
/// partial step (a part of a product) counts as a fraction. The first whole
/// step is projected apart from the rest: it lists the levels that later
/// steps reuse, so it is counted once and the rest at the rate of the steps
/// after it. Also tells an observer how far the work is, for a progress
/// bar.
pub struct Meter<'a> {
    what: String,
    seconds: f64,
    total: f64,
    done: Cell<f64>,
    /// Position and elapsed time when the first whole step was done.
    first: Cell<Option<(f64, f64)>>,
    start: Instant,
    observer: Option<&'a dyn Fn(f64, f64)>,
}

impl<'a> Meter<'a> {
    /// A meter of `total` steps of `what` within `budget`'s time.
    pub fn new(what: impl Into<String>, total: usize, budget: &Budget) -> Self {
        Meter {
            what: what.into(),
            seconds: budget.seconds,
            total: total as f64,
            done: Cell::new(0.0),
            first: Cell::new(None),
            start: Instant::now(),
            observer: None,
        }
    }

    /// A meter that never refuses and tells no one (library calls without
    /// a budget).
    pub fn unlimited() -> Self {
        Meter {
            what: String::new(),
            seconds: f64::INFINITY,
            total: 1.0,
            done: Cell::new(0.0),
            first: Cell::new(None),
            start: Instant::now(),
            observer: None,
        }
    }

    /// The same meter, telling `observer(done, total)` after every step.
    pub fn observed(mut self, observer: &'a dyn Fn(f64, f64)) -> Self {
        self.observer = Some(observer);
        self
    }

    /// Records that the work has reached `position` steps (a fraction
    /// within a step for a part of a product), tells the observer, and
    /// refuses the rest if the projection exceeds the budget.
    pub fn at(&self, position: f64) -> Result<()> {
        self.done.set(position);
        if let Some(o) = self.observer {
            o(position, self.total);
        }
        self.check()
    }

    /// Refuses the rest of the work if the time it projects from the steps
    /// done so far exceeds the budget.
    pub fn check(&self) -> Result<()> {
        let done = self.done.get();
        if done <= 0.0 || done >= self.total {
            return Ok(());
        }
        let elapsed = self.start.elapsed().as_secs_f64();
        // Below a tenth of a second the projection is noise.
        if elapsed < 0.1 {
            return Ok(());
        }
        let projected = match self.first.get() {
            // Within the first step: it alone, scaled to the whole.
            None if done < 1.0 => elapsed * self.total / done,
            // The first step is done: it costs what it cost, once.
            None => {
                self.first.set(Some((done, elapsed)));
                elapsed
            }
            Some((d0, t0)) if done > d0 => t0 + (elapsed - t0) * (self.total - d0) / (done - d0),
            Some(_) => elapsed,
        };
        if projected > self.seconds {
            return Err(Error::budget(format!(
                "{} would take about {} ({} for the first {} of it, the costliest part \
                 first), more than the time budget of {}; give less work (fewer \
                 temperatures or parts, fewer digits), or raise the time budget",
                self.what,
                human_seconds(projected),
                human_seconds(elapsed),
                share(done / self.total),
                human_seconds(self.seconds)
            )));
        }
        Ok(())
    }
}

/// A share of the work as text: `1 of 100000 steps`-like fractions as a
/// percentage with two significant digits (`0.0010%`, `25%`).
fn share(f: f64) -> String {
    let pct = f * 100.0;
    let digits = (1 - pct.abs().log10().floor() as i32).max(0) as usize;
    format!("{pct:.digits$}%")
}

/// Runs `work` over the points `order` (costliest first) on every core and
/// returns each point's answer beside its index, in `order`'s order.
///
/// The first point runs alone on this thread with `meter` passed to it
/// (so its parts can report progress and the meter projects the grid's time
/// from the costliest point); the rest run in rounds of one point per core,
/// each core keeping its own state from `init` (a level cache: its first
/// listing, the hottest of its points, serves every later one; the first
/// point's state is reused). Between rounds the meter counts the points done
/// and refuses the rest once the projected time exceeds its budget.
///
/// ```
/// use zsum::budget::{sweep, Meter};
/// let squares = sweep(&[3, 1, 2], || (), |_, i, _| Ok(i * i), &Meter::unlimited())?;
/// assert_eq!(squares, [(3, 9), (1, 1), (2, 4)]);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn sweep<C, T, I, W>(
    order: &[usize],
    init: I,
    work: W,
    meter: &Meter,
) -> Result<Vec<(usize, T)>>
where
    C: Send,
    T: Send,
    I: Fn() -> C + Sync,
    W: Fn(&C, usize, Option<(&Meter, f64)>) -> Result<T> + Sync,
{
    use rayon::prelude::*;
    let Some((&first, rest)) = order.split_first() else {
        return Ok(Vec::new());
    };
    let mut out = Vec::with_capacity(order.len());
    let first_state = init();
    out.push((first, work(&first_state, first, Some((meter, 0.0)))?));
    meter.at(1.0)?;
    let cores = rayon::current_num_threads().max(1);
    let mut states: Vec<C> = Vec::with_capacity(cores);
    states.push(first_state);
    states.extend((1..cores.min(rest.len().max(1))).map(|_| init()));
    for round in rest.chunks(states.len()) {
        let answers: Vec<Result<T>> = states
            .par_iter_mut()
            .zip(round.par_iter())
            .map(|(state, &i)| work(state, i, None))
            .collect();
        for (&i, a) in round.iter().zip(answers) {
            out.push((i, a?));
        }
        meter.at(out.len() as f64)?;
    }
    Ok(out)
}
