//! Rectangular hollow section b × h × t with sharp corners.

use super::{Axis, FamilyKind, Limits, cost_by_area};
use crate::optimise::{Constraint, Problem};
use crate::section::Shape;

/// Rectangular hollow section (sharp corners): b, h, t.
pub struct Rhs;

impl FamilyKind for Rhs {
    fn name(&self) -> &'static str {
        "hollow section"
    }

    fn variables(&self) -> &'static [&'static str] {
        &["b", "h", "t"]
    }

    fn axes(&self) -> &'static [Axis] {
        &[Axis::Width, Axis::Depth, Axis::Thickness]
    }

    fn default_bounds(&self) -> &'static [(f64, f64)] {
        &[(50.0, 400.0), (50.0, 600.0), (3.0, 20.0)]
    }

    fn shape(&self, x: &[f64]) -> Shape {
        Shape::Rhs {
            b: x[0],
            h: x[1],
            t: x[2],
            r_out: 0.0,
        }
    }

    fn limits(&self) -> &'static Limits {
        &Limits {
            web: true,
            default: rhs_default,
            compact: rhs_compact,
            web_words: (
                "Wall limit (b − 2t)/t",
                " (5.70√(E/Fy): the webs AISC 360-16 F7 covers here)",
            ),
            ..Limits::NONE
        }
    }

    /// The worse wall (b − 2t)/t or (h − 2t)/t ≤ λw.
    fn geometry(&self, prob: &Problem, x: &[f64], g: &mut Vec<(Constraint, f64)>) {
        if let Some(lw) = prob.lambda_w {
            let t = x[2];
            let worst = ((x[0] - 2.0 * t) / t).max((x[1] - 2.0 * t) / t) / lw - 1.0;
            g.push((Constraint::WallSlenderness, worst));
        }
    }

    /// Area × price at the rate of the wall thickness t.
    fn cost(&self, x: &[f64], kg_per_mm3: f64, price: &dyn Fn(f64) -> f64) -> f64 {
        cost_by_area(self.shape(x), x[2], kg_per_mm3, price)
    }
}

/// Walls up to 5.70√(E/F_y), the end of the webs AISC 360-16 F7 covers
/// here; local buckling below it is a constraint through F7.
fn rhs_default(e: f64, fy: f64) -> (Option<f64>, Option<f64>) {
    (None, Some(5.70 * (e / fy).sqrt()))
}

/// AISC 360-16 Table B4.1b λp of walls of rectangular HSS in flexure (case
/// 17), 1.12√(E/Fy), used for both walls (conservative).
fn rhs_compact(e: f64, fy: f64) -> (Option<f64>, Option<f64>) {
    let r = (e / fy).sqrt();
    (None, Some(1.12 * r))
}
