//! Hollow and round sections: rectangular hollow (sharp or rounded
//! corners), circular hollow, solid round.
//!
//! RHS properties are integrated exactly over the outer rounded rectangle
//! minus the inner one (corner radii r_out and r_in = max(r_out − t, 0)).
//! Torsion constant of an RHS by the thin-walled closed-section formula of
//! EN 10219-2:2006, Annex B: J = t³·p/3 + 4·A_m²·t/p, with the mid-line
//! perimeter p = 2((b − t) + (h − t)) − 2·R_c·(4 − π) and enclosed area
//! A_m = (b − t)(h − t) − R_c²·(4 − π), R_c = (r_out + r_in)/2.
//!
//! Circles: A = π(D² − d²)/4, I = π(D⁴ − d⁴)/64, Z = (D³ − d³)/6,
//! Q_NA = (D³ − d³)/12, J = π(D⁴ − d⁴)/32 (standard closed forms; Roark,
//! Table A.1); circles do not warp (C_w = 0).

use super::composite::{Composite, Part, add, sub};
use super::{Properties, from_composite, len, non_negative, positive};
use crate::error::{Error, Result};
use crate::units::System;
use std::f64::consts::PI;

pub(crate) fn validate_rhs(b: f64, h: f64, t: f64, r_out: f64, sys: System) -> Result<()> {
    positive("b", b, sys)?;
    positive("h", h, sys)?;
    positive("t", t, sys)?;
    non_negative("r_out", r_out, sys)?;
    let half = b.min(h) / 2.0;
    if t >= half {
        return Err(Error::msg(format!(
            "wall t = {} is not less than half the smaller side ({}): expected a hollow section (use `rect` for a solid one)",
            len(t, sys),
            len(half, sys)
        ))
        .in_field("t"));
    }
    if r_out > half {
        return Err(Error::msg(format!(
            "corner radius r_out = {} exceeds half the smaller side ({}): expected r_out ≤ {}",
            len(r_out, sys),
            len(half, sys),
            len(half, sys)
        ))
        .in_field("r_out"));
    }
    Ok(())
}

pub(crate) fn validate_chs(d: f64, t: f64, sys: System) -> Result<()> {
    positive("d", d, sys)?;
    positive("t", t, sys)?;
    if t >= d / 2.0 {
        return Err(Error::msg(format!(
            "wall t = {} is not less than the radius {}: expected a hollow tube (use `round` for a solid bar)",
            len(t, sys),
            len(d / 2.0, sys)
        ))
        .in_field("t"));
    }
    Ok(())
}

/// Rounded rectangle of width b, height h, bottom at yb, corner radius r,
/// added with sign `s` (+1) or removed (−1).
fn rounded_rect(parts: &mut Composite, b: f64, h: f64, yb: f64, r: f64, s: f64) {
    let rect = Part::Rect { xc: 0.0, yb, b, h };
    parts.push(if s > 0.0 { add(rect) } else { sub(rect) });
    if r > 0.0 {
        for sx in [-1.0, 1.0] {
            for (y, sy) in [(yb, 1.0), (yb + h, -1.0)] {
                let p = Part::Spandrel {
                    x: sx * b / 2.0,
                    y,
                    sx: -sx,
                    sy,
                    r,
                };
                parts.push(if s > 0.0 { sub(p) } else { add(p) });
            }
        }
    }
}

pub(crate) fn composite_rhs(b: f64, h: f64, t: f64, r_out: f64) -> Composite {
    let r_in = (r_out - t).max(0.0);
    let mut parts = Composite::new();
    rounded_rect(&mut parts, b, h, 0.0, r_out, 1.0);
    rounded_rect(&mut parts, b - 2.0 * t, h - 2.0 * t, t, r_in, -1.0);
    parts
}

/// EN 10219-2 Annex B torsion constant of a rectangular hollow section.
pub fn rhs_torsion_constant(b: f64, h: f64, t: f64, r_out: f64) -> f64 {
    let r_in = (r_out - t).max(0.0);
    let rc = (r_out + r_in) / 2.0;
    let p = 2.0 * ((b - t) + (h - t)) - 2.0 * rc * (4.0 - PI);
    let am = (b - t) * (h - t) - rc * rc * (4.0 - PI);
    t.powi(3) * p / 3.0 + 4.0 * am * am * t / p
}

/// Warping constant of a rectangular hollow section, thin-walled and of
/// uniform wall on the mid-line rectangle b_m × h_m (b_m = b − t):
/// Γ = t·b_m²·h_m²·(b_m − h_m)²/(24·(b_m + h_m)) (a stated approximation,
/// from memory of the thin-walled box result; zero for a square tube; within
/// 5 % of a finite-element value for 300 × 200 × 6, tests/sections.rs).
pub fn rhs_warping_constant(b: f64, h: f64, t: f64) -> f64 {
    let (bm, hm) = (b - t, h - t);
    t * bm * bm * hm * hm * (bm - hm).powi(2) / (24.0 * (bm + hm))
}

pub(crate) fn properties_rhs(b: f64, h: f64, t: f64, r_out: f64) -> Properties {
    let mut p = from_composite(
        &composite_rhs(b, h, t, r_out),
        h,
        b,
        Some(rhs_torsion_constant(b, h, t, r_out)),
        Some(rhs_warping_constant(b, h, t)),
        None,
    );
    // Plastic modulus about the vertical axis of the sharp-cornered tube
    // (rounded corners remove a little: about 1 % for r_out = 2t).
    let (bi, hi) = (b - 2.0 * t, h - 2.0 * t);
    p.zy = Some(h * b * b / 4.0 - hi * bi * bi / 4.0);
    p
}

/// Closed forms for a tube of outside diameter `d` and wall `t`
/// (t = d/2 gives the solid bar).
pub(crate) fn properties_chs(d: f64, t: f64) -> Properties {
    let di = (d - 2.0 * t).max(0.0);
    let area = PI * (d * d - di * di) / 4.0;
    let i = PI * (d.powi(4) - di.powi(4)) / 64.0;
    let c = d / 2.0;
    let s = i / c;
    let r = (i / area).sqrt();
    Properties {
        area,
        depth: d,
        width: d,
        y_c: c,
        ix: i,
        iy: Some(i),
        c_top: c,
        c_bot: c,
        s_top: s,
        s_bot: s,
        zx: Some((d.powi(3) - di.powi(3)) / 6.0),
        rx: r,
        ry: Some(r),
        q_na: Some((d.powi(3) - di.powi(3)) / 12.0),
        t_na: Some(d - di),
        j: Some(2.0 * i),
        // A circular section does not warp.
        cw: Some(0.0),
        web_area: None,
        i_geometry: None,
        sy: Some(s),
        zy: Some((d.powi(3) - di.powi(3)) / 6.0),
        y_sc: Some(c),

        form: super::Form::Given,
    }
}

/// Chord width of a disc of diameter d (bottom at y = 0) at height y.
pub(crate) fn circle_width(d: f64, y: f64) -> f64 {
    let r = d / 2.0;
    let u = y - r;
    if u.abs() > r {
        0.0
    } else {
        2.0 * (r * r - u * u).sqrt()
    }
}

/// Chord width of the bore of a tube at height y.
pub(crate) fn circle_width_inner(d: f64, t: f64, y: f64) -> f64 {
    let ri = d / 2.0 - t;
    let u = y - d / 2.0;
    if ri <= 0.0 || u.abs() > ri {
        0.0
    } else {
        2.0 * (ri * ri - u * u).sqrt()
    }
}
