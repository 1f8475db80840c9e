//! A row's shape and its properties: the shape built from the row's
//! dimensions, its computed properties cross-checked against the values
//! the row gives (given values win), or the given values alone.

use super::row::{CellError, cell_err, rel_diff};
use super::schema::{
    B, BF, BF_BOT, BF_TOP, Col, D, DIMS, H, HW, R, R_OUT, Schema, T, TF, TF_BOT, TF_TOP, TW,
    column_of,
};
use crate::section::spec::normalise_family;
use crate::section::{Given, Properties, Shape};
use crate::units;

/// The row's shape (when it names a family) and its properties.
#[inline]
pub(super) fn shape_and_properties(
    schema: &Schema,
    family: &str,
    given: &mut Given,
    dims: &[(f64, bool); 14],
    name_col: usize,
    props: &mut Properties,
) -> std::result::Result<Option<Shape>, CellError> {
    let dim = |i: usize| dims[i].1.then_some(dims[i].0);
    let shape_col = schema.shape.unwrap_or(0);
    let shape = if family.is_empty() {
        None
    } else {
        let s = shape_direct(family, &dim).map_err(|m| cell_err(shape_col, schema, m))?;
        // A dimension that cannot be is reported at its own column, in the
        // units the row's header gives.
        s.validate_in(schema.typed_system(crate::units::Show::Dimension))
            .map_err(|e| located(schema, e, shape_col))?;
        Some(s)
    };
    // Properties: computed, given, or both (cross-checked).
    match &shape {
        Some(s) => {
            *props = s.properties_of_valid();
            cross_check(schema, given, props, shape_col)?;
            take_given(given, props);
        }
        None => {
            if dims.iter().any(|d| d.1) && given.ix.is_none() {
                return Err(cell_err(
                    shape_col,
                    schema,
                    "dimensions are given but no shape family".into(),
                ));
            }
            given.depth = dim(D).or(dim(H));
            given.width = dim(B).or(dim(BF));
            given.tw = dim(TW);
            given.bf = dim(BF);
            given.tf = dim(TF);
            *props = given
                .properties_in(schema.typed_system(crate::units::Show::Dimension))
                .map_err(|e| located(schema, e, name_col))?;
        }
    }
    Ok(shape)
}

/// An error of the section module at the column of the field it names
/// (else at `fallback`).
fn located(schema: &Schema, e: crate::error::Error, fallback: usize) -> CellError {
    match e {
        crate::error::Error::Input { location, message } => {
            match location.field.as_deref().and_then(|f| column_of(schema, f)) {
                Some(col) => cell_err(col, schema, message),
                None => cell_err(fallback, schema, message),
            }
        }
        other => cell_err(fallback, schema, other.to_string()),
    }
}

/// Given values must agree with those computed from the dimensions.
/// Tolerances: 2 % for what tables and beamsift compute the same way (they
/// differ by rounding); 10 % for J and C_w, where tables use approximate
/// formulas for the fillets and the junctions.
fn cross_check(
    schema: &Schema,
    given: &Given,
    p: &Properties,
    shape_col: usize,
) -> std::result::Result<(), CellError> {
    // Most catalogues of shapes give no properties (or only a mass,
    // checked with it): nothing to compare then.
    let g = given;
    if [g.area, g.ix, g.iy, g.s_top, g.s_bot, g.zx, g.c_top, g.c_bot]
        .iter()
        .chain([g.q_na, g.j, g.cw].iter())
        .all(Option::is_none)
    {
        return Ok(());
    }
    let checks = [
        ("A", given.area, p.area, 0.02),
        ("Ix", given.ix, p.ix, 0.02),
        ("Iy", given.iy, p.iy.unwrap_or(f64::NAN), 0.02),
        ("S_top", given.s_top, p.s_top, 0.02),
        ("S_bot", given.s_bot, p.s_bot, 0.02),
        ("Zx", given.zx, p.zx.unwrap_or(f64::NAN), 0.02),
        ("c_top", given.c_top, p.c_top, 0.02),
        ("c_bot", given.c_bot, p.c_bot, 0.02),
        ("Q", given.q_na, p.q_na.unwrap_or(f64::NAN), 0.02),
        ("J", given.j, p.j.unwrap_or(f64::NAN), 0.10),
        ("Cw", given.cw, p.cw.unwrap_or(f64::NAN), 0.10),
    ];
    for (label, g, c, tol) in checks {
        if let Some(g) = g {
            // A computed zero (C_w of a round tube) is matched by
            // magnitude against the section's own scale.
            let bad = if c.is_finite() && c > 0.0 {
                rel_diff(g, c) > tol
            } else {
                c == 0.0 && g > tol * p.iy.unwrap_or(p.ix) * p.depth * p.depth
            };
            if bad {
                let col = column_of(schema, label).unwrap_or(shape_col);
                // Both values in the unit the column's header gives.
                let (f, unit) = match (schema.cols.get(col), schema.headers.get(col)) {
                    (Some(Col::Prop(_, f)), Some(h)) => (
                        *f,
                        super::schema::split_header(h)
                            .1
                            .map_or(String::new(), |u| format!(" {u}")),
                    ),
                    _ => (1.0, String::new()),
                };
                return Err(cell_err(
                    col,
                    schema,
                    format!(
                        "given {label} = {}{unit} differs by {:.1} % from {}{unit} computed from the dimensions: expected agreement within {:.0} %",
                        units::fmt_num(g / f),
                        100.0 * rel_diff(g, c).min(9.99e2),
                        units::fmt_num(c / f),
                        100.0 * tol
                    ),
                ));
            }
        }
    }
    Ok(())
}

/// Given values are used where both exist (tables are authoritative for
/// their own rounding; J and Cw from a table include fillets).
fn take_given(given: &Given, p: &mut Properties) {
    if let Some(v) = given.area {
        p.area = v;
    }
    if let Some(v) = given.ix {
        p.ix = v;
        p.rx = (v / p.area).sqrt();
    }
    if let Some(v) = given.iy {
        p.iy = Some(v);
        p.ry = Some((v / p.area).sqrt());
    }
    if let Some(v) = given.s_top {
        p.s_top = v;
    }
    if let Some(v) = given.s_bot {
        p.s_bot = v;
    }
    if let Some(v) = given.zx {
        p.zx = Some(v);
    }
    if let Some(v) = given.j {
        p.j = Some(v);
    }
    if let Some(v) = given.cw {
        p.cw = Some(v);
    }
}

/// Build a shape straight from the row's dimensions (no string round trip:
/// this is on the per-row path of a catalogue scan). Columns a family does
/// not use are ignored, so one file can mix families.
#[inline]
fn shape_direct(
    family: &str,
    dim: &impl Fn(usize) -> Option<f64>,
) -> std::result::Result<Shape, String> {
    // Most rows spell the family canonically: no allocation then.
    let fam: std::borrow::Cow<'_, str> =
        if family.bytes().all(|b| b.is_ascii_lowercase() || b == b'-') {
            std::borrow::Cow::Borrowed(family)
        } else {
            std::borrow::Cow::Owned(normalise_family(family))
        };
    let need = |k: usize| -> std::result::Result<f64, String> {
        dim(k).ok_or_else(|| format!("a {fam} needs the dimension '{}'", DIMS[k]))
    };
    let web = |tf_top: f64, tf_bot: f64| -> std::result::Result<f64, String> {
        match (dim(HW), dim(D)) {
            (Some(hw), _) => Ok(hw),
            (None, Some(d)) if d > tf_top + tf_bot => Ok(d - tf_top - tf_bot),
            (None, Some(_)) => Err("the flanges fill the whole depth d".into()),
            (None, None) => Err(format!("a {fam} needs hw or d")),
        }
    };
    let shape = match &*fam {
        "rect" => Shape::Rect {
            b: need(B)?,
            d: need(D)?,
        },
        "welded-i" => {
            let (bf, tf, tw) = (need(BF)?, need(TF)?, need(TW)?);
            Shape::WeldedI {
                bf,
                tf,
                hw: web(tf, tf)?,
                tw,
            }
        }
        "rolled-i" => Shape::RolledI {
            d: need(D)?,
            bf: need(BF)?,
            tf: need(TF)?,
            tw: need(TW)?,
            r: dim(R).unwrap_or(0.0),
        },
        "mono-i" => {
            let (bf_top, tf_top, bf_bot, tf_bot, tw) = (
                need(BF_TOP)?,
                need(TF_TOP)?,
                need(BF_BOT)?,
                need(TF_BOT)?,
                need(TW)?,
            );
            Shape::MonoI {
                bf_top,
                tf_top,
                bf_bot,
                tf_bot,
                hw: web(tf_top, tf_bot)?,
                tw,
            }
        }
        "rhs" => Shape::Rhs {
            b: need(B)?,
            h: need(H)?,
            t: need(T)?,
            r_out: dim(R_OUT).or(dim(R)).unwrap_or(0.0),
        },
        "chs" => Shape::Chs {
            d: need(D)?,
            t: need(T)?,
        },
        "round" => Shape::Round { d: need(D)? },
        _ => {
            return Err(format!(
                "unknown shape '{family}': expected rect, welded-i, rolled-i, mono-i, rhs, chs or round"
            ));
        }
    };
    Ok(shape)
}
