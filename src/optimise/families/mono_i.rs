//! Mono-symmetric welded I: flanges of their own width and thickness top
//! and bottom, and a web hw × tw.

use super::{Axis, FamilyKind, I_SHAPE_LIMITS, Limits, i_shape_limits, plate_cost};
use crate::optimise::{Constraint, Problem};
use crate::section::Shape;

/// Mono-symmetric welded I: bf_top, tf_top, bf_bot, tf_bot, hw, tw.
pub struct MonoI;

impl FamilyKind for MonoI {
    fn name(&self) -> &'static str {
        "mono-symmetric I"
    }

    fn variables(&self) -> &'static [&'static str] {
        &["bf_top", "tf_top", "bf_bot", "tf_bot", "hw", "tw"]
    }

    fn axes(&self) -> &'static [Axis] {
        &[
            Axis::Width,
            Axis::Thickness,
            Axis::Width,
            Axis::Thickness,
            Axis::Depth,
            Axis::Thickness,
        ]
    }

    fn default_bounds(&self) -> &'static [(f64, f64)] {
        &[
            (100.0, 600.0),
            (6.0, 50.0),
            (100.0, 600.0),
            (6.0, 50.0),
            (150.0, 2000.0),
            (5.0, 30.0),
        ]
    }

    fn shape(&self, x: &[f64]) -> Shape {
        Shape::MonoI {
            bf_top: x[0],
            tf_top: x[1],
            bf_bot: x[2],
            tf_bot: x[3],
            hw: x[4],
            tw: x[5],
        }
    }

    fn limits(&self) -> &'static Limits {
        &I_SHAPE_LIMITS
    }

    /// The worse flange bf/(2tf) ≤ λf, hw/tw ≤ λw, and the flange
    /// proportion of AISC 360-16 F13-2.
    fn geometry(&self, prob: &Problem, x: &[f64], g: &mut Vec<(Constraint, f64)>) {
        let worst_f = (x[0] / (2.0 * x[1])).max(x[2] / (2.0 * x[3]));
        i_shape_limits(prob, worst_f, x[4], x[5], g);
        // AISC 360-16 F13-2: 0.1 ≤ Iyc/Iy ≤ 0.9 for either flange in
        // compression (as a bound the solver can follow; beyond it the
        // check is not verified anyway).
        let it = x[1] * x[0].powi(3);
        let ib = x[3] * x[2].powi(3);
        let r = it / (it + ib);
        g.push((Constraint::FlangeProportion, (0.1 - r).max(r - 0.9) / 0.1));
    }

    /// Both flanges and the web, each at the rate of its thickness.
    fn cost(&self, x: &[f64], kg_per_mm3: f64, price: &dyn Fn(f64) -> f64) -> f64 {
        plate_cost(x[0], x[1], kg_per_mm3, price)
            + plate_cost(x[2], x[3], kg_per_mm3, price)
            + plate_cost(x[4], x[5], kg_per_mm3, price)
    }
}
