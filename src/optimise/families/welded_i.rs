//! Doubly symmetric welded I: two equal flanges bf × tf and a web hw × tw.

use super::{Axis, FamilyKind, I_SHAPE_LIMITS, Limits, i_shape_limits, plate_cost};
use crate::optimise::{Constraint, Problem};
use crate::section::Shape;

/// Doubly symmetric welded I: bf, tf, hw, tw.
pub struct WeldedI;

impl FamilyKind for WeldedI {
    fn name(&self) -> &'static str {
        "welded I"
    }

    fn variables(&self) -> &'static [&'static str] {
        &["bf", "tf", "hw", "tw"]
    }

    fn axes(&self) -> &'static [Axis] {
        &[Axis::Width, Axis::Thickness, Axis::Depth, Axis::Thickness]
    }

    fn default_bounds(&self) -> &'static [(f64, f64)] {
        &[(100.0, 600.0), (6.0, 50.0), (150.0, 2000.0), (5.0, 30.0)]
    }

    fn shape(&self, x: &[f64]) -> Shape {
        Shape::WeldedI {
            bf: x[0],
            tf: x[1],
            hw: x[2],
            tw: x[3],
        }
    }

    fn limits(&self) -> &'static Limits {
        &I_SHAPE_LIMITS
    }

    /// bf/(2tf) ≤ λf, hw/tw ≤ λw.
    fn geometry(&self, prob: &Problem, x: &[f64], g: &mut Vec<(Constraint, f64)>) {
        i_shape_limits(prob, x[0] / (2.0 * x[1]), x[2], x[3], g);
    }

    /// Two flanges and the web, each at the rate of its thickness.
    fn cost(&self, x: &[f64], kg_per_mm3: f64, price: &dyn Fn(f64) -> f64) -> f64 {
        2.0 * plate_cost(x[0], x[1], kg_per_mm3, price) + plate_cost(x[2], x[3], kg_per_mm3, price)
    }
}
