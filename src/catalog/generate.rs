//! Generating catalogues of every combination of given dimensions: welded
//! I-sections from plate widths and thicknesses (with slenderness and
//! proportion rules applied), or timber rectangles from widths × depths ×
//! grades, priced from per-unit rates. Writes our CSV format to any
//! `io::Write`.

use crate::error::{Error, Result};
use std::io::Write;

/// What to generate.
#[derive(Clone, Debug)]
pub enum Spec {
    /// Welded doubly symmetric I from plate lists (mm).
    WeldedI {
        bf: Vec<f64>,
        tf: Vec<f64>,
        hw: Vec<f64>,
        tw: Vec<f64>,
        /// Largest bf/(2tf) and hw/tw (None = no limit).
        lambda_f: Option<f64>,
        lambda_w: Option<f64>,
        /// Steel density kg/m³ and price per kg.
        density: f64,
        price_per_kg: Option<f64>,
    },
    /// Timber rectangles: widths × depths × (grade, price per m³).
    Rect {
        b: Vec<f64>,
        d: Vec<f64>,
        grades: Vec<(String, Option<f64>)>,
        max_aspect: Option<f64>,
    },
}

/// Most rows one generation writes (about 1 GB of CSV): a larger grid is
/// almost surely a mistyped range.
pub const MAX_ROWS: u64 = 20_000_000;

fn too_many(planned: u64) -> Error {
    Error::msg(format!(
        "the ranges give {} rows, more than the {} one catalogue may hold (about 1 GB of CSV): narrow the ranges or use coarser steps",
        crate::units::count(planned),
        crate::units::count(MAX_ROWS)
    ))
}

/// Most list combinations looked at before the rules (the count walks them
/// all): beyond this the lists are almost surely mistyped.
pub const MAX_COMBINATIONS: u128 = 1_000_000_000;

/// Visit every row the rules keep, in output order. Welded I rows give
/// (bf, tf, hw, tw) and no grade; rectangles give (b, d) and their grade.
fn each_row(spec: &Spec, mut f: impl FnMut(Row<'_>) -> Result<()>) -> Result<()> {
    match spec {
        Spec::WeldedI {
            bf,
            tf,
            hw,
            tw,
            lambda_f,
            lambda_w,
            ..
        } => {
            for &b in bf {
                for &t in tf {
                    if lambda_f.is_some_and(|l| b / (2.0 * t) > l) {
                        continue;
                    }
                    for &h in hw {
                        if b > h {
                            continue;
                        }
                        for &w in tw {
                            if w > t || lambda_w.is_some_and(|l| h / w > l) || w >= h {
                                continue;
                            }
                            f(Row::WeldedI { b, t, h, w })?;
                        }
                    }
                }
            }
        }
        Spec::Rect {
            b,
            d,
            grades,
            max_aspect,
        } => {
            for (g, rate) in grades {
                for &bb in b {
                    for &dd in d {
                        if max_aspect.is_some_and(|k| dd / bb > k) {
                            continue;
                        }
                        f(Row::Rect {
                            grade: g,
                            rate: *rate,
                            b: bb,
                            d: dd,
                        })?;
                    }
                }
            }
        }
    }
    Ok(())
}

enum Row<'a> {
    WeldedI {
        b: f64,
        t: f64,
        h: f64,
        w: f64,
    },
    Rect {
        grade: &'a str,
        rate: Option<f64>,
        b: f64,
        d: f64,
    },
}

/// How many rows `generate` would write (the same rules, nothing written).
/// Refused when the lists combine into more than [`MAX_COMBINATIONS`].
pub fn count(spec: &Spec) -> Result<u64> {
    let raw: u128 = match spec {
        Spec::WeldedI { bf, tf, hw, tw, .. } => {
            [bf, tf, hw, tw].iter().map(|v| v.len() as u128).product()
        }
        Spec::Rect { b, d, grades, .. } => (b.len() * d.len()) as u128 * grades.len() as u128,
    };
    if raw > MAX_COMBINATIONS {
        return Err(Error::msg(format!(
            "the lists combine into {} candidates before the rules, more than {}: narrow the ranges or use coarser steps",
            crate::units::count(raw),
            crate::units::count(MAX_COMBINATIONS)
        )));
    }
    let mut n = 0u64;
    each_row(spec, |_| {
        n += 1;
        Ok(())
    })?;
    Ok(n)
}

/// Write the catalogue; returns the number of rows. Rules applied to welded
/// I-shapes (common practice, stated in the header comment): tw ≤ tf, bf ≤
/// hw, and the slenderness limits given. Refused before anything is written
/// when the grid gives more than [`MAX_ROWS`] rows.
pub fn generate<W: Write>(spec: &Spec, currency: &str, out_name: &str, out: &mut W) -> Result<u64> {
    let io = |e: std::io::Error| Error::io(out_name, e);
    let planned = count(spec)?;
    if planned > MAX_ROWS {
        return Err(too_many(planned));
    }
    let (density, price_per_kg, has_cost) = match spec {
        Spec::WeldedI {
            lambda_f,
            lambda_w,
            density,
            price_per_kg,
            ..
        } => {
            writeln!(out, "# Generated by beamsift: every welded I of the given plates with tw <= tf, bf <= hw{}{}.",
                lambda_f.map(|l| format!(", bf/(2tf) <= {l:.2}")).unwrap_or_default(),
                lambda_w.map(|l| format!(", hw/tw <= {l:.2}")).unwrap_or_default()).map_err(io)?;
            writeln!(out, "# Mass from the plate areas at {density} kg/m3 (no weld metal); prices from a rate per kg.").map_err(io)?;
            let cost_col = if price_per_kg.is_some() {
                format!(",cost [{currency}/m]")
            } else {
                String::new()
            };
            writeln!(
                out,
                "name,shape,bf [mm],tf [mm],hw [mm],tw [mm],mass [kg/m]{cost_col}"
            )
            .map_err(io)?;
            (*density, *price_per_kg, price_per_kg.is_some())
        }
        Spec::Rect {
            grades, max_aspect, ..
        } => {
            writeln!(out, "# Generated by beamsift: every width x depth x grade{}; prices from a rate per m3.",
                max_aspect.map(|k| format!(" with d/b <= {k}")).unwrap_or_default()).map_err(io)?;
            let has_cost = grades.iter().any(|g| g.1.is_some());
            let cost_col = if has_cost {
                format!(",cost [{currency}/m]")
            } else {
                String::new()
            };
            writeln!(out, "name,shape,grade,b [mm],d [mm]{cost_col}").map_err(io)?;
            (0.0, None, has_cost)
        }
    };
    let mut n = 0u64;
    let mut buf = Vec::with_capacity(256);
    each_row(spec, |row| {
        buf.clear();
        match row {
            Row::WeldedI { b, t, h, w } => {
                let mass = (2.0 * b * t + h * w) * 1e-6 * density;
                write!(buf, "WI {b}x{t}-{h}x{w},welded-i,{b},{t},{h},{w},{mass:.3}").map_err(io)?;
                if let Some(p) = price_per_kg {
                    write!(buf, ",{:.2}", mass * p).map_err(io)?;
                }
            }
            Row::Rect { grade, rate, b, d } => {
                if grade.is_empty() {
                    write!(buf, "{b}x{d},rect,,{b},{d}").map_err(io)?;
                } else {
                    write!(buf, "{b}x{d} {grade},rect,{grade},{b},{d}").map_err(io)?;
                }
                if has_cost {
                    match rate {
                        Some(r) => write!(buf, ",{:.2}", b * d * 1e-6 * r).map_err(io)?,
                        None => buf.push(b','),
                    }
                }
            }
        }
        buf.push(b'\n');
        out.write_all(&buf).map_err(io)?;
        n += 1;
        Ok(())
    })?;
    out.flush().map_err(io)?;
    Ok(n)
}
