//! I-shapes: doubly symmetric welded (plate girder), rolled with root
//! fillets, and mono-symmetric welded (unequal flanges).
//!
//! Area, centroid, Ix, Iy, Q and Zx are integrated exactly over the plates
//! and the four root-fillet spandrels (see `composite`). Thin-walled
//! torsion and warping constants, without fillets (so slightly low, which is
//! conservative for lateral-torsional buckling):
//!
//! * J = (bf_top·tf_top³ + bf_bot·tf_bot³ + hw·tw³)/3 (Σ b·t³/3 for open
//!   thin-walled sections; Timoshenko & Gere, *Theory of Elastic Stability*,
//!   §5.2; AISC Design Guide 9, eq. 3.4).
//! * Cw = h0²·Iyc·Iyt/(Iyc + Iyt), which for equal flanges is
//!   tf·bf³·h0²/24 (AISC Design Guide 9, Appendix A), with h0 the distance
//!   between flange centroids and Iyc, Iyt the flanges' own second moments
//!   about the web axis.

use super::composite::{Composite, Part, add};
use super::{IGeometry, Properties, from_composite, mm, non_negative, positive};
use crate::error::{Error, Result};

fn check_web(hw: f64, tw: f64) -> Result<()> {
    positive("hw", hw)?;
    positive("tw", tw)?;
    if tw >= hw {
        return Err(Error::msg(format!(
            "web thickness tw = {} is not less than the web height hw = {}: expected a web taller than it is thick",
            mm(tw),
            mm(hw)
        ))
        .in_field("tw"));
    }
    Ok(())
}

fn check_flange(which: &str, bf: f64, tf: f64, tw: f64) -> Result<()> {
    positive(&format!("bf{which}"), bf)?;
    positive(&format!("tf{which}"), tf)?;
    if bf < tw {
        return Err(Error::msg(format!(
            "flange width bf{which} = {} is narrower than the web thickness tw = {}: expected bf ≥ tw",
            mm(bf),
            mm(tw)
        ))
        .in_field(&format!("bf{which}")));
    }
    Ok(())
}

pub(crate) fn validate_welded(bf: f64, tf: f64, hw: f64, tw: f64) -> Result<()> {
    check_web(hw, tw)?;
    check_flange("", bf, tf, tw)
}

pub(crate) fn validate_mono(
    bf_top: f64,
    tf_top: f64,
    bf_bot: f64,
    tf_bot: f64,
    hw: f64,
    tw: f64,
) -> Result<()> {
    check_web(hw, tw)?;
    check_flange("_top", bf_top, tf_top, tw)?;
    check_flange("_bot", bf_bot, tf_bot, tw)
}

pub(crate) fn validate_rolled(d: f64, bf: f64, tf: f64, tw: f64, r: f64) -> Result<()> {
    positive("d", d)?;
    positive("tf", tf)?;
    non_negative("r", r)?;
    if 2.0 * tf >= d {
        return Err(Error::msg(format!(
            "two flanges of tf = {} do not fit in the depth d = {}: expected d > 2·tf",
            mm(tf),
            mm(d)
        ))
        .in_field("tf"));
    }
    let hw = d - 2.0 * tf;
    check_web(hw, tw)?;
    check_flange("", bf, tf, tw)?;
    if tw + 2.0 * r > bf {
        return Err(Error::msg(format!(
            "root fillets r = {} do not fit on the flange: expected tw + 2·r ≤ bf (here {} > {})",
            mm(r),
            mm(tw + 2.0 * r),
            mm(bf)
        ))
        .in_field("r"));
    }
    if 2.0 * r > hw {
        return Err(Error::msg(format!(
            "root fillets r = {} do not fit in the web height d − 2·tf = {}: expected 2·r ≤ d − 2·tf",
            mm(r),
            mm(hw)
        ))
        .in_field("r"));
    }
    Ok(())
}

pub(crate) fn composite(
    bf_top: f64,
    tf_top: f64,
    bf_bot: f64,
    tf_bot: f64,
    hw: f64,
    tw: f64,
    r: f64,
) -> Composite {
    let mut parts = vec![
        add(Part::Rect {
            xc: 0.0,
            yb: 0.0,
            b: bf_bot,
            h: tf_bot,
        }),
        add(Part::Rect {
            xc: 0.0,
            yb: tf_bot,
            b: tw,
            h: hw,
        }),
        add(Part::Rect {
            xc: 0.0,
            yb: tf_bot + hw,
            b: bf_top,
            h: tf_top,
        }),
    ];
    if r > 0.0 {
        for sx in [-1.0, 1.0] {
            let x = sx * tw / 2.0;
            parts.push(add(Part::Spandrel {
                x,
                y: tf_bot,
                sx,
                sy: 1.0,
                r,
            }));
            parts.push(add(Part::Spandrel {
                x,
                y: tf_bot + hw,
                sx,
                sy: -1.0,
                r,
            }));
        }
    }
    Composite::new(parts)
}

pub(crate) fn properties_mono(
    bf_top: f64,
    tf_top: f64,
    bf_bot: f64,
    tf_bot: f64,
    hw: f64,
    tw: f64,
    r: f64,
) -> Properties {
    let c = composite(bf_top, tf_top, bf_bot, tf_bot, hw, tw, r);
    let depth = tf_top + hw + tf_bot;
    let h0 = depth - tf_top / 2.0 - tf_bot / 2.0;
    let j = (bf_top * tf_top.powi(3) + bf_bot * tf_bot.powi(3) + hw * tw.powi(3)) / 3.0;
    let iyc = tf_top * bf_top.powi(3) / 12.0;
    let iyt = tf_bot * bf_bot.powi(3) / 12.0;
    let cw = h0 * h0 * iyc * iyt / (iyc + iyt);
    let geom = IGeometry {
        d: depth,
        bf_top,
        tf_top,
        bf_bot,
        tf_bot,
        tw,
        hw,
        h0,
        r,
    };
    from_composite(&c, depth, bf_top.max(bf_bot), Some(j), Some(cw), Some(geom))
}
