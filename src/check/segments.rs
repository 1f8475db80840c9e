//! Bracing segments: the pieces of the beam between lateral restraints,
//! split at the braces, with their effective-length factors and the mesh
//! nodes a section's check reads them at.

use super::{BracedFlange, Bracing, Criteria};
use crate::beam::Beam;
use serde::{Deserialize, Serialize};

/// An unbraced segment for lateral stability.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Segment {
    pub x1: f64,
    pub x2: f64,
    /// Mesh nodes at x1, the quarter points and x2.
    pub nodes: [usize; 5],
    /// Elements inside the segment.
    pub elems: (usize, usize),
    /// One end is a free (cantilever) tip: C_b = 1 (AISC 360-16 F1).
    pub free_end: bool,
    /// C_b is taken as 1.0: a free tip, or the bottom flange under hogging
    /// between supports with only the top flange braced (conservative:
    /// eq. F1-1 assumes both flanges restrained at the segment's ends and
    /// says nothing of the restraint the top-flange braces give).
    pub cb_unity: bool,
    /// Checked under sagging (top flange unbraced here) / hogging.
    pub sagging: bool,
    pub hogging: bool,
    /// Effective-length factor on x2 − x1.
    pub k: f64,
    /// Neither end is restrained laterally (no rigid support, no brace):
    /// lateral stability cannot be assessed.
    pub unrestrained: bool,
}

/// Lateral restraint segments: (x1, x2, free end, sagging, hogging, k,
/// unrestrained at both ends).
pub(super) type RawSegment = (f64, f64, bool, bool, bool, f64, bool);

/// The pieces of the beam between lateral restraints: rigid supports
/// (pinned, roller, fixed) restrain the member laterally and against
/// twist; a spring support does not (it may be another flexible member:
/// conservative), nor does a free end. (x1, x2, left end free, right end
/// free).
fn lateral_pieces(beam: &Beam) -> Vec<(f64, f64, bool, bool)> {
    use crate::beam::Support;
    let xs = beam.node_x();
    let rigid: Vec<f64> = beam
        .supports
        .iter()
        .zip(&xs)
        .filter(|(s, _)| matches!(s, Support::Pinned | Support::Roller | Support::Fixed))
        .map(|(_, x)| *x)
        .collect();
    let length = beam.length();
    let mut out = Vec::new();
    match (rigid.first(), rigid.last()) {
        (Some(&first), Some(&last)) => {
            if first > 0.0 {
                out.push((0.0, first, true, false));
            }
            for w in rigid.windows(2) {
                out.push((w[0], w[1], false, false));
            }
            if last < length {
                out.push((last, length, false, true));
            }
        }
        _ => out.push((0.0, length, true, true)),
    }
    out
}

/// The unbraced segments of the beam under these criteria.
pub(super) fn segments_of(beam: &Beam, c: &Criteria) -> Vec<RawSegment> {
    let mut out = Vec::new();
    let both = c.braced_flange == BracedFlange::Both;
    for (x1, x2, free_l, free_r) in lateral_pieces(beam) {
        let len = x2 - x1;
        let from_right = free_l && !free_r;
        // A free end's segment rooted at a brace rather than at a support:
        // a brace on the top flange alone gives no torsional restraint.
        let k_of = |free: bool, brace_root: bool| {
            if free && brace_root && !both {
                c.brace_rooted_factor()
            } else if free {
                c.overhang_factor()
            } else {
                c.span_factor()
            }
        };
        // Split the piece at `spacing` from its restrained end.
        let mut split = |spacing: f64, sag: bool, hog: bool, braces: bool| {
            let n = (len / spacing - 1e-9).ceil().max(1.0) as usize;
            for k in 0..n {
                let (a, b) = if from_right {
                    let b = x2 - k as f64 * spacing;
                    ((b - spacing).max(x1), b)
                } else {
                    let a = x1 + k as f64 * spacing;
                    (a, (a + spacing).min(x2))
                };
                let at_left = if from_right { k == n - 1 } else { k == 0 };
                let at_right = if from_right { k == 0 } else { k == n - 1 };
                let free = (free_l && at_left) || (free_r && at_right);
                // Free at both ends and no brace in between: nothing holds
                // it laterally.
                let unrestrained = free_l && free_r && n == 1 && !braces;
                let brace_root = braces && (n > 1 || (free_l && free_r));
                out.push((a, b, free, sag, hog, k_of(free, brace_root), unrestrained));
            }
        };
        match c.bracing {
            Bracing::Continuous => {
                if !both {
                    split(len, false, true, false);
                }
            }
            Bracing::Supports | Bracing::NotGiven => split(len, true, true, false),
            Bracing::Spacing(sp) => {
                if both || sp >= len {
                    split(sp.min(len), true, true, sp < len);
                } else {
                    split(sp, true, false, true);
                    split(len, false, true, false);
                }
            }
        }
    }
    out
}

/// Each segment's mesh nodes (at its ends and quarter points: the nearest
/// of `mesh_x`, which holds them) and its C_b rule.
pub(super) fn place(segs: &[RawSegment], mesh_x: &[f64], c: &Criteria) -> Vec<Segment> {
    let node_of = |x: f64| -> usize {
        match mesh_x.binary_search_by(|p| p.total_cmp(&x)) {
            Ok(i) => i,
            Err(i) => {
                let lo = i.saturating_sub(1);
                let hi = i.min(mesh_x.len() - 1);
                if (mesh_x[hi] - x).abs() < (x - mesh_x[lo]).abs() {
                    hi
                } else {
                    lo
                }
            }
        }
    };
    segs.iter()
        .map(|&(a, b, free, sagging, hogging, k, unrestrained)| {
            let nodes = [0, 1, 2, 3, 4].map(|q| node_of(a + (b - a) * q as f64 / 4.0));
            let top_braced_between = c.braced_flange == BracedFlange::Top
                && matches!(c.bracing, Bracing::Continuous | Bracing::Spacing(_));
            Segment {
                x1: a,
                x2: b,
                nodes,
                elems: (nodes[0], nodes[4]),
                free_end: free,
                cb_unity: free || (hogging && !sagging && top_braced_between),
                sagging,
                hogging,
                k,
                unrestrained,
            }
        })
        .collect()
}
