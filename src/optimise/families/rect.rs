//! Solid rectangle b × d (timber, solid bar).

use super::{Axis, FamilyKind, Limits, cost_by_area};
use crate::optimise::{Constraint, Problem};
use crate::section::Shape;

/// Solid rectangle: b, d.
pub struct Rect;

impl FamilyKind for Rect {
    fn name(&self) -> &'static str {
        "rectangle"
    }

    fn variables(&self) -> &'static [&'static str] {
        &["b", "d"]
    }

    fn axes(&self) -> &'static [Axis] {
        &[Axis::Width, Axis::Depth]
    }

    fn default_bounds(&self) -> &'static [(f64, f64)] {
        &[(38.0, 300.0), (75.0, 1200.0)]
    }

    fn shape(&self, x: &[f64]) -> Shape {
        Shape::Rect { b: x[0], d: x[1] }
    }

    fn limits(&self) -> &'static Limits {
        &Limits {
            aspect: true,
            ..Limits::NONE
        }
    }

    /// d/b ≤ k.
    fn geometry(&self, prob: &Problem, x: &[f64], g: &mut Vec<(Constraint, f64)>) {
        if let Some(k) = prob.aspect {
            g.push((Constraint::Aspect, x[1] / (k * x[0]) - 1.0));
        }
    }

    /// Area × price at the rate listed for its last variable, d (a
    /// rectangle has no plate thickness).
    fn cost(&self, x: &[f64], kg_per_mm3: f64, price: &dyn Fn(f64) -> f64) -> f64 {
        cost_by_area(self.shape(x), x[1], kg_per_mm3, price)
    }
}
