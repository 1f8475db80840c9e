//! The section families the optimiser proportions: one implementation of
//! [`FamilyKind`] per family, one file each.
//!
//! Adding a family: a file here with its `FamilyKind` (variables and how
//! each is rounded, default bounds, the shape at x, the geometric limits
//! and their constraints, cost, words), a variant in [`super::Family`] and
//! its line in `Family::kind` and `Family::ALL`; nothing else in the
//! optimiser, the study or the command line names a family.

mod mono_i;
mod rect;
mod rhs;
mod welded_i;

pub use mono_i::MonoI;
pub use rect::Rect;
pub use rhs::Rhs;
pub use welded_i::WeldedI;

use super::{Constraint, Problem};
use crate::section::Shape;
use serde::Serialize;

/// How a variable is rounded to fabrication sizes (see
/// [`super::discrete::GridOptions`]).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Axis {
    /// A width (flange, wall or solid width): on the step, or a width list.
    Width,
    /// A plate or wall thickness: from the plate list.
    Thickness,
    /// A depth (web height, overall depth): on the step, or a depth list.
    Depth,
}

/// The geometric limits of a family: which of a [`Problem`]'s limits
/// apply (the others are not used, and the command line refuses them),
/// their default and compact values, and their words.
#[derive(Clone, Copy, Debug)]
pub struct Limits {
    /// The largest d/b, [`Problem::aspect`].
    pub aspect: bool,
    /// A flange slenderness limit, [`Problem::lambda_f`].
    pub flange: bool,
    /// A web (or wall) slenderness limit, [`Problem::lambda_w`].
    pub web: bool,
    /// Default slenderness limits (λf, λw) for a modulus E and a yield
    /// stress Fy (MPa).
    pub default: fn(f64, f64) -> (Option<f64>, Option<f64>),
    /// Compact slenderness limits (λf, λw) for E and Fy, AISC 360-16
    /// Table B4.1b λp.
    pub compact: fn(f64, f64) -> (Option<f64>, Option<f64>),
    /// The web (or wall) limit λw in words, and the basis of its default.
    pub web_words: (&'static str, &'static str),
}

impl Limits {
    /// No limit applies, and none has a default.
    pub const NONE: Limits = Limits {
        aspect: false,
        flange: false,
        web: false,
        default: no_limits,
        compact: no_limits,
        web_words: ("Web limit hw/tw", ""),
    };
}

fn no_limits(_e: f64, _fy: f64) -> (Option<f64>, Option<f64>) {
    (None, None)
}

/// What the optimiser needs to know of a section family.
pub trait FamilyKind: Sync {
    /// The family in words, for titles ("welded I").
    fn name(&self) -> &'static str;

    /// Names of the variables, in the order of x.
    fn variables(&self) -> &'static [&'static str];

    /// How each variable is rounded to fabrication sizes (order of x).
    fn axes(&self) -> &'static [Axis];

    /// Default bounds (lower, upper) of each variable, mm (order of x).
    fn default_bounds(&self) -> &'static [(f64, f64)];

    /// The shape at x (mm).
    fn shape(&self, x: &[f64]) -> Shape;

    /// The geometric limits: which apply, their defaults, their words.
    fn limits(&self) -> &'static Limits;

    /// Default slenderness limits (λf, λw) for a modulus `e` and a yield
    /// stress `fy` (MPa).
    fn default_slenderness(&self, e: f64, fy: f64) -> (Option<f64>, Option<f64>) {
        (self.limits().default)(e, fy)
    }

    /// Compact slenderness limits (λf, λw), AISC 360-16 Table B4.1b λp.
    fn compact_slenderness(&self, e: f64, fy: f64) -> (Option<f64>, Option<f64>) {
        (self.limits().compact)(e, fy)
    }

    /// The geometric constraints g ≤ 0 at x (mm) of the limits the problem
    /// sets (aspect, slenderness, proportions), appended to `g` in a fixed
    /// order.
    fn geometry(&self, prob: &Problem, x: &[f64], g: &mut Vec<(Constraint, f64)>);

    /// Cost per mm of length at x (mm), for a mass of `kg_per_mm3` and a
    /// price per kg by thickness (mm).
    fn cost(&self, x: &[f64], kg_per_mm3: f64, price: &dyn Fn(f64) -> f64) -> f64;
}

/// Cost per mm of a section priced as one piece at the rate of the
/// thickness `t` (mm): its area × mass × price(t); an impossible shape
/// costs infinitely much.
fn cost_by_area(shape: Shape, t: f64, kg_per_mm3: f64, price: &dyn Fn(f64) -> f64) -> f64 {
    let a = shape.properties().map(|p| p.area).unwrap_or(f64::INFINITY);
    a * kg_per_mm3 * price(t)
}

/// Cost per mm of a plate b × t (mm) at the rate of its thickness.
fn plate_cost(b: f64, t: f64, kg_per_mm3: f64, price: &dyn Fn(f64) -> f64) -> f64 {
    b * t * kg_per_mm3 * price(t)
}

/// The slenderness constraints of an I-shape: the worst flange bf/(2tf)
/// against λf, the web hw/tw against λw.
fn i_shape_limits(prob: &Problem, worst_f: f64, hw: f64, tw: f64, g: &mut Vec<(Constraint, f64)>) {
    if let Some(lf) = prob.lambda_f {
        g.push((Constraint::FlangeSlenderness, worst_f / lf - 1.0));
    }
    if let Some(lw) = prob.lambda_w {
        g.push((Constraint::WebSlenderness, hw / tw / lw - 1.0));
    }
}

/// Default web limit of I-shapes: h/t_w ≤ min(0.40·E/F_y, 260) (AISC
/// 360-16 §F13.2, unstiffened webs), flanges unlimited (flange local
/// buckling is a constraint through F3–F5).
fn i_shape_default(e: f64, fy: f64) -> (Option<f64>, Option<f64>) {
    (None, Some((0.40 * e / fy).min(260.0)))
}

/// Compact limits of I-shapes, AISC 360-16 Table B4.1b λp: flanges in
/// flexure (case 10) 0.38√(E/Fy), webs (case 15) 3.76√(E/Fy).
fn i_shape_compact(e: f64, fy: f64) -> (Option<f64>, Option<f64>) {
    let r = (e / fy).sqrt();
    (Some(0.38 * r), Some(3.76 * r))
}

/// The limits of I-shapes (welded, mono-symmetric).
const I_SHAPE_LIMITS: Limits = Limits {
    flange: true,
    web: true,
    default: i_shape_default,
    compact: i_shape_compact,
    web_words: (
        "Web limit hw/tw",
        " (AISC 360-16 F13.2, unstiffened web: min(0.40·E/Fy, 260))",
    ),
    ..Limits::NONE
};
