//! `rate`: can a core carry a wattage. The capacity search of `capacity`, the verdict against a
//! target VA with its margin, the changes that would help when it does not carry, and the
//! capacity-against-flux curve for the chart.
//!
//! Margin = (capacity − target)/target. The target is `--va`, else the job's own output VA when
//! the core came from a job file (from flags there is no load to compare with).

use crate::capacity::{
    capacity, flux_sweep, options, scan, usable_flux_range, Capacity, Improvement,
};
use crate::job::Job;

/// What a person asked of `rate`.
#[derive(Debug, Clone, PartialEq)]
pub struct RateRequest {
    /// Target output, VA.
    pub va: Option<f64>,
    /// Fraction of the time the load is on.
    pub duty: f64,
    /// Verify by the dense scan instead of the search.
    pub scan: bool,
    /// Compute the capacity-against-flux curve.
    pub curve: bool,
    /// Compare with the job's own output VA when no `va` is given.
    pub target_from_job: bool,
}

/// The verdict against a target.
#[derive(Debug, Clone, PartialEq)]
pub struct RateVerdict {
    /// The target is carried.
    pub ok: bool,
    /// Headroom, % of the target (negative when short).
    pub margin_pct: f64,
    /// The target, VA.
    pub target_va: f64,
}

/// A note on a rating.
#[derive(Debug, Clone, PartialEq)]
pub enum RateNote {
    /// Heating is rated on the time-averaged loss of an intermittent load.
    IntermittentDuty {
        /// The duty.
        duty: f64,
    },
    /// The area-product and rule-of-thumb figures are quick estimates.
    QuickEstimates,
    /// Rectified outputs count by their DC watts; their windings carry more VA.
    RectifiedOutputs {
        /// The largest winding VA over DC watts among them, at the job's load.
        va_per_dc_w: f64,
    },
}

/// Capacity against flux density: (flux T, capacity VA, total loss at capacity W).
#[derive(Debug, Clone, PartialEq)]
pub struct FluxCurve {
    /// The points.
    pub points: Vec<(f64, f64, f64)>,
    /// The flux the capacity was found at, T.
    pub chosen_t: f64,
}

/// Everything `ironwind rate` reports.
#[derive(Debug, Clone, PartialEq)]
pub struct Rating {
    /// The job's name.
    pub name: String,
    /// The capacity and what binds.
    pub capacity: Capacity,
    /// Against a target, when there is one.
    pub verdict: Option<RateVerdict>,
    /// What would change it (only when the target is not carried).
    pub options: Vec<Improvement>,
    /// The duty rated at.
    pub duty: f64,
    /// Notes.
    pub notes: Vec<RateNote>,
    /// Capacity against flux, when asked for.
    pub curve: Option<FluxCurve>,
    /// The cautions.
    pub cautions: &'static [&'static str],
}

impl Rating {
    /// Whether the target (if any) is carried.
    pub fn carried(&self) -> bool {
        self.verdict.as_ref().is_none_or(|v| v.ok)
    }
}

/// Rates a job's core.
pub fn rate(job: &Job, req: &RateRequest) -> Rating {
    let mut job = job.clone();
    job.load_duty = req.duty;
    let cap = if req.scan { scan(&job) } else { capacity(&job) };
    let base_va = crate::plan::output_va(&job);
    let target = req.va.or(req.target_from_job.then_some(base_va));
    let verdict = target.map(|t| RateVerdict {
        ok: t <= cap.max_va * (1.0 + 1e-12),
        margin_pct: (cap.max_va - t) / t * 100.0,
        target_va: t,
    });
    let opts = match &verdict {
        Some(v) if !v.ok => options(&job, &cap),
        _ => Vec::new(),
    };
    let mut notes = Vec::new();
    if req.duty < 1.0 {
        notes.push(RateNote::IntermittentDuty { duty: req.duty });
    }
    notes.push(RateNote::QuickEstimates);
    if job.windings.iter().any(|w| w.dc.is_some()) {
        let p = crate::plan::plan(&job);
        let ratio = p
            .windings
            .iter()
            .filter_map(|w| w.dc.as_ref().map(|d| d.va_per_dc_w))
            .fold(0.0, f64::max);
        notes.push(RateNote::RectifiedOutputs { va_per_dc_w: ratio });
    }
    let curve = req.curve.then(|| {
        let (lo, hi) = usable_flux_range(&job.steel.kind);
        FluxCurve {
            points: flux_sweep(&job, lo, hi, 18),
            chosen_t: cap.flux_density_t,
        }
    });
    Rating {
        name: job.name.clone(),
        capacity: cap,
        verdict,
        options: opts,
        duty: req.duty,
        notes,
        curve,
        cautions: crate::plan::CAUTIONS,
    }
}
