//! The catalogue CSV format: one section per row, one property per column,
//! each numeric column naming its unit in brackets (`Ix [cm4]`,
//! `mass [kg/m]`, `d [in]`), so any supplier's list can be adapted by
//! renaming its headers.
//!
//! A row gives a shape and its dimensions (the section module computes the
//! properties), or the properties directly, or both — then A, Ix, Iy, S and
//! Zx are cross-checked and a difference above 2 % is an error. Given
//! values are used where both exist (tables are authoritative for their own
//! rounding; J and Cw from a table include fillets).
//!
//! This module parses headers and rows; it does not open files (see
//! `read`), and it does not check sections against loads.

pub mod generate;
pub mod read;
pub mod records;

use crate::check::Material;
use crate::error::{Error, Location, Result};
use crate::section::spec::normalise_family;
use crate::section::{Given, Properties, Shape};
use crate::units::{self, Dim, fmt_num};
use records::Record;

/// What a column holds.
#[derive(Clone, Debug, PartialEq)]
pub enum Col {
    Name,
    Shape,
    Series,
    Grade,
    Stock,
    /// Ignored (a column whose name starts with "note").
    Note,
    /// A shape dimension (index into `DIMS`, mm per unit).
    Dim(usize, f64),
    /// A property (key, internal units per unit).
    Prop(Prop, f64),
    /// Cost per length (currency per mm, per unit).
    Cost(f64),
    /// A dimensionless timber adjustment factor of the row (C_F, C_r, ...).
    Factor(Factor),
}

/// Timber adjustment factors a row may give (no unit).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Factor {
    Cd,
    CmFb,
    CmFv,
    CmE,
    Ct,
    Ci,
    CtE,
    CiE,
    Cf,
    Cr,
    Cfu,
}

fn factor_of(key: &str) -> Option<Factor> {
    Some(match key {
        "cd" | "c_d" => Factor::Cd,
        "cm_fb" => Factor::CmFb,
        "cm_fv" => Factor::CmFv,
        "cm_e" => Factor::CmE,
        "ct" | "c_t" => Factor::Ct,
        "ci" | "c_i" => Factor::Ci,
        "ct_e" | "c_t_e" => Factor::CtE,
        "ci_e" | "c_i_e" => Factor::CiE,
        "cf" | "c_f" => Factor::Cf,
        "cr" | "c_r" => Factor::Cr,
        "cfu" | "c_fu" => Factor::Cfu,
        _ => return None,
    })
}

/// Properties a column may give.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Prop {
    Area,
    Ix,
    Iy,
    J,
    Cw,
    S,
    STop,
    SBot,
    Zx,
    CTop,
    CBot,
    Q,
    Mass,
    E,
    Fb,
    Fbt,
    Fbc,
    Fv,
    Fy,
    Density,
    Emin,
}

const DIMS: &[&str] = &[
    "d", "b", "h", "bf", "tf", "tw", "hw", "r", "t", "r_out", "bf_top", "tf_top", "bf_bot",
    "tf_bot",
];
// Indices into DIMS (the per-row path looks dimensions up by index).
const D: usize = 0;
const B: usize = 1;
const H: usize = 2;
const BF: usize = 3;
const TF: usize = 4;
const TW: usize = 5;
const HW: usize = 6;
const R: usize = 7;
const T: usize = 8;
const R_OUT: usize = 9;
const BF_TOP: usize = 10;
const TF_TOP: usize = 11;
const BF_BOT: usize = 12;
const TF_BOT: usize = 13;

/// Known column names, for error messages.
pub const KNOWN: &str = "name, shape, series, grade, stock, cost [CUR/m], dimensions (d, b, h, bf, tf, tw, hw, r, t, r_out, bf_top, tf_top, bf_bot, tf_bot), \
A, Ix, Iy, J, Cw, S (or S_top, S_bot), Zx, c_top, c_bot, Q, mass, E, Fb, Fbt, Fbc, Fv, Fy, density, Emin, \
timber adjustment factors without unit (CD, CM_Fb, CM_Fv, CM_E, Ct, Ci, Ct_E, Ci_E, CF, Cr, Cfu); columns named note... are ignored";

/// The parsed header.
#[derive(Clone, Debug)]
pub struct Schema {
    pub cols: Vec<Col>,
    pub headers: Vec<String>,
    /// Currency named in a cost header (`cost [EUR/m]`).
    pub currency: Option<String>,
    name: Option<usize>,
    shape: Option<usize>,
}

fn split_header(h: &str) -> (String, Option<String>) {
    let h = h.trim();
    match (h.find('['), h.rfind(']')) {
        (Some(a), Some(b)) if b > a => (
            h[..a].trim().to_string(),
            Some(h[a + 1..b].trim().to_string()),
        ),
        _ => (h.to_string(), None),
    }
}

fn prop_of(key: &str) -> Option<(Prop, Dim)> {
    Some(match key {
        "a" | "area" => (Prop::Area, Dim::Area),
        "ix" | "i" | "i_x" => (Prop::Ix, Dim::SecondMoment),
        "iy" | "i_y" => (Prop::Iy, Dim::SecondMoment),
        "j" => (Prop::J, Dim::SecondMoment),
        "cw" => (Prop::Cw, Dim::Warping),
        "s" | "sx" | "s_x" => (Prop::S, Dim::Modulus),
        "s_top" => (Prop::STop, Dim::Modulus),
        "s_bot" => (Prop::SBot, Dim::Modulus),
        "zx" | "z" | "z_x" => (Prop::Zx, Dim::Modulus),
        "c_top" => (Prop::CTop, Dim::Length),
        "c_bot" => (Prop::CBot, Dim::Length),
        "q" => (Prop::Q, Dim::Modulus),
        "mass" | "mass_per_length" | "weight" => (Prop::Mass, Dim::MassPerLength),
        "e" => (Prop::E, Dim::Stress),
        "fb" => (Prop::Fb, Dim::Stress),
        "fbt" => (Prop::Fbt, Dim::Stress),
        "fbc" => (Prop::Fbc, Dim::Stress),
        "fv" => (Prop::Fv, Dim::Stress),
        "fy" => (Prop::Fy, Dim::Stress),
        "density" => (Prop::Density, Dim::Density),
        "emin" | "e_min" => (Prop::Emin, Dim::Stress),
        _ => return None,
    })
}

/// Parse a cost unit: `EUR/m`, `$/ft`, `per m`, `/m`.
fn cost_unit(unit: &str) -> Result<(Option<String>, f64)> {
    let u = unit.trim();
    let (cur, len) = if let Some(rest) = u.strip_prefix("per ") {
        (None, rest)
    } else if let Some((c, l)) = u.rsplit_once('/') {
        let c = c.trim();
        (
            if c.is_empty() {
                None
            } else {
                Some(c.to_string())
            },
            l,
        )
    } else {
        return Err(Error::msg(format!(
            "cost unit '{u}' is not of the form CURRENCY/LENGTH, e.g. cost [EUR/m] or cost [USD/ft]"
        )));
    };
    let mm = units::unit_factor(len, Dim::Length)?;
    Ok((cur, 1.0 / mm))
}

impl Schema {
    /// The index of the name column (0 when there is none).
    pub fn name_column(&self) -> usize {
        self.cols.iter().position(|c| *c == Col::Name).unwrap_or(0)
    }

    /// Parse the header row; every problem is reported at once.
    pub fn parse(headers: &[String], loc: &Location) -> Result<Schema> {
        let mut cols = Vec::new();
        let mut errors = Vec::new();
        let mut currency = None;
        let mut seen: std::collections::HashSet<String> = std::collections::HashSet::new();
        for (i, h) in headers.iter().enumerate() {
            let at = loc.clone().with_column(i as u64 + 1).with_field(h.clone());
            let (name, unit) = split_header(h);
            let key = name.to_ascii_lowercase().replace([' ', '-'], "_");
            if key.is_empty() {
                errors.push(Error::input(
                    at,
                    format!("empty column header: expected one of {KNOWN}"),
                ));
                cols.push(Col::Note);
                continue;
            }
            if seen.contains(&key) && !key.starts_with("note") {
                errors.push(Error::input(at, format!("column '{name}' appears twice")));
                cols.push(Col::Note);
                continue;
            }
            seen.insert(key.clone());
            let col = match key.as_str() {
                "name" | "designation" | "section" => Ok(Col::Name),
                "shape" | "family" => Ok(Col::Shape),
                "series" => Ok(Col::Series),
                "grade" => Ok(Col::Grade),
                "stock" | "in_stock" => Ok(Col::Stock),
                k if k.starts_with("note") => Ok(Col::Note),
                "cost" | "price" => match &unit {
                    Some(u) => cost_unit(u).map(|(c, f)| {
                        currency = c;
                        Col::Cost(f)
                    }),
                    None => Err(Error::msg(
                        "column 'cost' needs its unit in brackets, e.g. cost [EUR/m]",
                    )),
                },
                k if factor_of(k).is_some() => match unit.as_deref() {
                    None | Some("-") | Some("") => {
                        Ok(Col::Factor(factor_of(k).unwrap_or(Factor::Cd)))
                    }
                    Some(u) => Err(Error::msg(format!(
                        "column '{name}' is a dimensionless adjustment factor: expected no unit, found [{u}]"
                    ))),
                },
                k => {
                    let dim = DIMS.iter().position(|d| *d == k);
                    let need_unit = |dim: Dim| -> Result<f64> {
                        match &unit {
                            Some(u) => units::unit_factor(u, dim),
                            None => Err(Error::msg(format!(
                                "column '{name}' needs its unit in brackets, e.g. {name} [{}]",
                                example_unit(dim)
                            ))),
                        }
                    };
                    if let Some(d) = dim {
                        need_unit(Dim::Length).map(|f| Col::Dim(d, f))
                    } else if let Some((p, dim)) = prop_of(k) {
                        need_unit(dim).map(|f| Col::Prop(p, f))
                    } else {
                        Err(Error::msg(format!(
                            "unknown column '{name}': expected one of {KNOWN}"
                        )))
                    }
                }
            };
            match col {
                Ok(c) => cols.push(c),
                Err(e) => {
                    errors.push(e.at(&at));
                    cols.push(Col::Note);
                }
            }
        }
        let name = cols.iter().position(|c| *c == Col::Name);
        let shape = cols.iter().position(|c| *c == Col::Shape);
        if name.is_none() {
            errors.push(Error::input(
                loc.clone(),
                "no 'name' column: every section needs a name",
            ));
        }
        let has_dims = cols.iter().any(|c| matches!(c, Col::Dim(..)));
        let has_props = cols.iter().any(|c| matches!(c, Col::Prop(Prop::Ix, _)));
        if !has_props && (!has_dims || shape.is_none()) {
            errors.push(Error::input(
                loc.clone(),
                "the catalogue gives neither properties (A, Ix, ...) nor a 'shape' column with dimensions",
            ));
        }
        if !errors.is_empty() {
            // A header of thousands of bad columns is one mistake (a wrong
            // delimiter, a data row as header): the first few say so.
            const SHOWN: usize = 20;
            if errors.len() > SHOWN {
                let more = errors.len() - SHOWN;
                errors.truncate(SHOWN);
                errors.push(Error::input(
                    loc.clone(),
                    format!("... and {more} more header problem(s)"),
                ));
            }
            return Err(if errors.len() == 1 {
                errors.remove(0)
            } else {
                Error::Many(errors)
            });
        }
        Ok(Schema {
            cols,
            headers: headers.to_vec(),
            currency,
            name,
            shape,
        })
    }
}

fn example_unit(dim: Dim) -> &'static str {
    match dim {
        Dim::Length => "mm",
        Dim::Area => "cm2",
        Dim::SecondMoment => "cm4",
        Dim::Modulus => "cm3",
        Dim::Warping => "cm6",
        Dim::MassPerLength => "kg/m",
        Dim::Stress => "MPa",
        Dim::Density => "kg/m3",
        _ => "unit",
    }
}

/// How a row's material is found.
#[derive(Clone, Debug, PartialEq)]
pub enum RowMaterial {
    /// The job's material.
    Job,
    /// A named grade of the job.
    Grade(usize),
    /// The row's own values (on top of its grade or the job's material).
    Own(Box<Material>),
}

/// One catalogue row, parsed and validated (strings borrowed from the record).
#[derive(Clone, Debug)]
pub struct Row<'r> {
    pub name: &'r str,
    pub series: &'r str,
    pub grade: &'r str,
    pub shape: Option<Shape>,
    pub props: Properties,
    /// kg/m.
    pub mass: f64,
    pub material: RowMaterial,
    /// Cost per mm, in the catalogue's currency.
    pub cost: Option<f64>,
    pub stock: Option<bool>,
}

/// Materials available to rows.
#[derive(Clone, Debug)]
pub struct Materials<'a> {
    pub base: &'a Material,
    pub grades: &'a [(String, Material)],
}

impl<'a> Materials<'a> {
    pub fn get(&self, m: &'a RowMaterial) -> &'a Material {
        match m {
            RowMaterial::Job => self.base,
            RowMaterial::Grade(i) => &self.grades[*i].1,
            RowMaterial::Own(b) => b,
        }
    }
}

fn cell_str<'r>(rec: &Record<'r>, i: usize) -> std::result::Result<&'r str, ()> {
    std::str::from_utf8(rec.get(i).unwrap_or(b""))
        .map(str::trim)
        .map_err(|_| ())
}

/// A cell error at (column, header).
pub struct CellError {
    pub column: usize,
    pub message: String,
}

fn cell_err(column: usize, schema: &Schema, message: String) -> CellError {
    let h = schema.headers.get(column).cloned().unwrap_or_default();
    CellError {
        column: column + 1,
        message: format!("{h}: {message}"),
    }
}

const POW10: [f64; 23] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
    1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
];

/// Parse a number cell straight from its bytes. Fast path (Clinger 1990,
/// "How to read floating point numbers accurately"): a plain decimal with
/// at most 15 significant digits is an exact integer m and an exact power
/// of ten, so m / 10^k is correctly rounded by one IEEE division. Anything
/// else (exponents, long mantissas) goes to the standard library parser.
#[inline]
pub fn number(cell: &[u8]) -> Option<f64> {
    let mut b = cell;
    while let [first, rest @ ..] = b {
        if first.is_ascii_whitespace() {
            b = rest
        } else {
            break;
        }
    }
    while let [rest @ .., last] = b {
        if last.is_ascii_whitespace() {
            b = rest
        } else {
            break;
        }
    }
    let (neg, digits) = match b {
        [b'-', rest @ ..] => (true, rest),
        [b'+', rest @ ..] => (false, rest),
        _ => (false, b),
    };
    let mut m: u64 = 0;
    let mut n_digits = 0;
    let mut frac: Option<usize> = None;
    let mut ok = !digits.is_empty();
    for &c in digits {
        match c {
            b'0'..=b'9' => {
                if m == 0 && c == b'0' && frac.is_none() {
                    // leading zeros do not count
                } else {
                    n_digits += 1;
                }
                m = m.wrapping_mul(10).wrapping_add((c - b'0') as u64);
                if let Some(f) = frac.as_mut() {
                    *f += 1;
                }
            }
            b'.' if frac.is_none() => frac = Some(0),
            _ => {
                ok = false;
                break;
            }
        }
    }
    let k = frac.unwrap_or(0);
    if ok && n_digits <= 15 && k <= 22 && digits != b"." {
        let v = m as f64 / POW10[k];
        return Some(if neg { -v } else { v });
    }
    let v: f64 = std::str::from_utf8(b).ok()?.parse().ok()?;
    v.is_finite().then_some(v)
}

fn rel_diff(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs().max(1e-300)
}

/// Parse one record into a row. `None` material grades are looked up in
/// `mats`. Returns the first problem with its column.
pub fn parse_row<'r>(
    schema: &Schema,
    rec: &Record<'r>,
    mats: &Materials<'_>,
) -> std::result::Result<Row<'r>, CellError> {
    if rec.fault() == Some(records::Fault::UnclosedQuote) {
        return Err(CellError {
            column: 0,
            message: "a quoted field is never closed (the row runs to the end of the file)".into(),
        });
    }
    if rec.len() != schema.cols.len() {
        return Err(CellError {
            column: 0,
            message: format!(
                "this row has {} field(s) but the header has {}: check the delimiter and quoting",
                rec.len(),
                schema.cols.len()
            ),
        });
    }
    let mut given = Given::default();
    let mut dims: [(f64, bool); 14] = [(0.0, false); 14];
    let mut s_both = None;
    let (mut mass, mut cost, mut stock) = (None, None, None);
    let (mut name, mut series, mut grade, mut family) = ("", "", "", "");
    let mut own: [Option<f64>; 8] = [None; 8]; // E Fb Fbt Fbc Fv Fy density Emin
    let mut factors = crate::check::TimberFactors::default();
    for (i, col) in schema.cols.iter().enumerate() {
        if let Col::Dim(..) | Col::Prop(..) | Col::Cost(_) | Col::Factor(_) = col {
            let bytes = rec.get(i).unwrap_or(b"");
            if bytes.iter().all(u8::is_ascii_whitespace) {
                continue;
            }
            let v = match number(bytes) {
                Some(v) => v,
                None => {
                    let shown = String::from_utf8_lossy(bytes).trim().to_string();
                    return Err(cell_err(
                        i,
                        schema,
                        format!("'{shown}' is not a finite number"),
                    ));
                }
            };
            numeric(
                col,
                i,
                v,
                schema,
                &mut given,
                &mut dims,
                &mut s_both,
                &mut mass,
                &mut cost,
                &mut own,
                &mut factors,
            )?;
            continue;
        }
        let raw =
            cell_str(rec, i).map_err(|_| cell_err(i, schema, "not valid UTF-8 text".into()))?;
        match col {
            Col::Name => name = raw,
            Col::Series => series = raw,
            Col::Grade => grade = raw,
            Col::Shape => family = raw,
            Col::Note | Col::Factor(_) => {}
            Col::Stock => {
                if !raw.is_empty() {
                    stock = Some(match raw.to_ascii_lowercase().as_str() {
                        "yes" | "y" | "true" | "1" => true,
                        "no" | "n" | "false" | "0" => false,
                        _ => return Err(cell_err(i, schema, format!("'{raw}' is not yes or no"))),
                    });
                }
            }
            Col::Dim(..) | Col::Prop(..) | Col::Cost(_) => {}
        }
    }
    let name_col = schema.name.unwrap_or(0);
    if name.is_empty() {
        return Err(cell_err(
            name_col,
            schema,
            "empty name: every section needs one".into(),
        ));
    }
    if let Some(s) = s_both {
        given.s_top = given.s_top.or(Some(s));
        given.s_bot = given.s_bot.or(Some(s));
    }
    let dim = |i: usize| dims[i].1.then_some(dims[i].0);
    let shape_col = schema.shape.unwrap_or(0);
    let shape = if family.is_empty() {
        None
    } else {
        Some(shape_direct(family, &dim).map_err(|m| cell_err(shape_col, schema, m))?)
    };
    // Properties: computed, given, or both (cross-checked).
    let props = match &shape {
        Some(s) => {
            let mut p = s.properties_of_valid();
            // Tolerances: 2 % for what tables and beamsift compute the same
            // way (they differ by rounding); 10 % for J and C_w, where tables
            // use approximate formulas for the fillets and the junctions.
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
                        return Err(cell_err(
                            col,
                            schema,
                            format!(
                                "given {label} = {} differs by {:.1} % from {} computed from the dimensions: expected agreement within {:.0} %",
                                units::fmt_num(g),
                                100.0 * rel_diff(g, c).min(9.99e2),
                                units::fmt_num(c),
                                100.0 * tol
                            ),
                        ));
                    }
                }
            }
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
            p
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
            given.properties().map_err(|e| match e {
                crate::error::Error::Input { location, message } => {
                    match location.field.as_deref().and_then(|f| column_of(schema, f)) {
                        Some(col) => cell_err(col, schema, message),
                        None => cell_err(name_col, schema, message),
                    }
                }
                other => cell_err(name_col, schema, other.to_string()),
            })?
        }
    };
    // Material.
    let mut material = RowMaterial::Job;
    if !grade.is_empty() {
        match mats.grades.iter().position(|(n, _)| n == grade) {
            Some(i) => material = RowMaterial::Grade(i),
            None => {
                let col = schema
                    .cols
                    .iter()
                    .position(|c| *c == Col::Grade)
                    .unwrap_or(0);
                let known: Vec<&str> = mats.grades.iter().map(|g| g.0.as_str()).collect();
                return Err(cell_err(
                    col,
                    schema,
                    format!(
                        "grade '{grade}' is not defined in the job: expected one of [{}] (add [materials.\"{grade}\"] to the job file)",
                        known.join(", ")
                    ),
                ));
            }
        }
    }
    let has_factors = factors != crate::check::TimberFactors::default();
    if own.iter().any(Option::is_some) || has_factors {
        let base = match &material {
            RowMaterial::Grade(i) => &mats.grades[*i].1,
            _ => mats.base,
        };
        if has_factors && base.kind != crate::check::MaterialKind::Timber {
            let col = schema
                .cols
                .iter()
                .position(|c| matches!(c, Col::Factor(_)))
                .unwrap_or(0);
            return Err(cell_err(
                col,
                schema,
                format!(
                    "the row gives timber adjustment factors but its material '{}' is not timber: expected kind = \"timber\" in the job's material",
                    base.name
                ),
            ));
        }
        let fb = own[1];
        let mut timber = base.timber.with(&factors);
        if own[7].is_some() {
            timber.e_min = own[7];
        }
        let m = Material {
            name: base.name.clone(),
            kind: base.kind,
            e: own[0].unwrap_or(base.e),
            fb_tension: own[2].or(fb).or(base.fb_tension),
            fb_compression: own[3].or(fb).or(base.fb_compression),
            fv: own[4].or(base.fv),
            fy: own[5].or(base.fy),
            density: own[6].unwrap_or(base.density),
            timber,
        };
        if let Err(e) = m.validate() {
            let (field, message) = match e {
                crate::error::Error::Input { location, message } => (location.field, message),
                other => (None, other.to_string()),
            };
            let want = |c: &Col| -> bool {
                let name = field.as_deref().and_then(|f| f.strip_prefix("material."));
                match (name, c) {
                    (Some("Fy"), Col::Prop(Prop::Fy, _)) => true,
                    (Some("E"), Col::Prop(Prop::E, _)) => true,
                    (Some("Emin"), Col::Prop(Prop::Emin, _)) => true,
                    (Some("Fv"), Col::Prop(Prop::Fv, _)) => true,
                    (Some("Fb"), Col::Prop(Prop::Fb | Prop::Fbt | Prop::Fbc, _)) => true,
                    (Some("density"), Col::Prop(Prop::Density, _)) => true,
                    (Some("kind"), Col::Factor(_) | Col::Prop(Prop::Emin, _)) => true,
                    (Some(n), Col::Factor(f)) => factor_of(&n.to_ascii_lowercase()) == Some(*f),
                    _ => false,
                }
            };
            let col = schema.cols.iter().position(want);
            return Err(cell_err(col.unwrap_or(name_col), schema, message));
        }
        material = RowMaterial::Own(Box::new(m));
    }
    let density = mats.get(&material).density;
    let mass_col = schema
        .cols
        .iter()
        .position(|c| matches!(c, Col::Prop(Prop::Mass, _)));
    let mass = match mass {
        Some(m) => {
            if density > 0.0 {
                let from_area = props.mass_per_length(density);
                if rel_diff(m, from_area) > 0.05 {
                    return Err(cell_err(
                        mass_col.unwrap_or(name_col),
                        schema,
                        format!(
                            "mass {} kg/m differs by {:.1} % from A·ρ = {} kg/m: expected agreement within 5 % (check the area, the unit or the density)",
                            units::fmt_num(m),
                            100.0 * rel_diff(m, from_area),
                            units::fmt_num(from_area)
                        ),
                    ));
                }
            }
            m
        }
        None => {
            if density <= 0.0 {
                return Err(cell_err(
                    name_col,
                    schema,
                    "no mass column and no density for this row's material: cannot include self-weight".into(),
                ));
            }
            props.mass_per_length(density)
        }
    };
    Ok(Row {
        name,
        series,
        grade,
        shape,
        props,
        mass,
        material,
        cost,
        stock,
    })
}

fn prop_label(p: Prop) -> &'static str {
    match p {
        Prop::Area => "A",
        Prop::Ix => "Ix",
        Prop::Iy => "Iy",
        Prop::STop => "S_top",
        Prop::SBot => "S_bot",
        Prop::Zx => "Zx",
        Prop::J => "J",
        Prop::Cw => "Cw",
        Prop::Q => "Q",
        Prop::CTop => "c_top",
        Prop::CBot => "c_bot",
        _ => "",
    }
}

/// The column that gives the quantity `label` (an S column gives both
/// S_top and S_bot; tw and tf are dimension columns).
fn column_of(schema: &Schema, label: &str) -> Option<usize> {
    schema.cols.iter().position(|col| match col {
        Col::Prop(pp, _) => prop_label(*pp) == label || (label.starts_with("S_") && *pp == Prop::S),
        Col::Dim(k, ..) => DIMS.get(*k).is_some_and(|d| *d == label),
        _ => false,
    })
}

/// Build a shape straight from the row's dimensions (no string round trip:
/// this is on the per-row path of a catalogue scan). Columns a family does
/// not use are ignored, so one file can mix families.
fn shape_direct(
    family: &str,
    dim: &dyn Fn(usize) -> Option<f64>,
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
    shape.validate().map_err(|e| e.to_string())?;
    Ok(shape)
}

/// Store one numeric cell's value (in its header unit) in the row being built.
#[allow(clippy::too_many_arguments)]
#[inline]
fn numeric(
    col: &Col,
    i: usize,
    v: f64,
    schema: &Schema,
    given: &mut Given,
    dims: &mut [(f64, bool); 14],
    s_both: &mut Option<f64>,
    mass: &mut Option<f64>,
    cost: &mut Option<f64>,
    own: &mut [Option<f64>; 8],
    factors: &mut crate::check::TimberFactors,
) -> std::result::Result<(), CellError> {
    let zero_ok = matches!(col, Col::Dim(R | R_OUT, _) | Col::Cost(_));
    if v < 0.0 || (v == 0.0 && !zero_ok) {
        return Err(cell_err(
            i,
            schema,
            format!(
                "{} is not valid: expected a value greater than zero",
                fmt_num(v)
            ),
        ));
    }
    match *col {
        Col::Dim(idx, f) => dims[idx] = (v * f, true),
        Col::Cost(f) => *cost = Some(v * f),
        Col::Prop(p, f) => {
            let v = v * f;
            match p {
                Prop::Area => given.area = Some(v),
                Prop::Ix => given.ix = Some(v),
                Prop::Iy => given.iy = Some(v),
                Prop::J => given.j = Some(v),
                Prop::Cw => given.cw = Some(v),
                Prop::S => *s_both = Some(v),
                Prop::STop => given.s_top = Some(v),
                Prop::SBot => given.s_bot = Some(v),
                Prop::Zx => given.zx = Some(v),
                Prop::CTop => given.c_top = Some(v),
                Prop::CBot => given.c_bot = Some(v),
                Prop::Q => given.q_na = Some(v),
                Prop::Mass => *mass = Some(v),
                Prop::E => own[0] = Some(v),
                Prop::Fb => own[1] = Some(v),
                Prop::Fbt => own[2] = Some(v),
                Prop::Fbc => own[3] = Some(v),
                Prop::Fv => own[4] = Some(v),
                Prop::Fy => own[5] = Some(v),
                Prop::Density => own[6] = Some(v),
                Prop::Emin => own[7] = Some(v),
            }
        }
        Col::Factor(k) => {
            if v > 3.0 {
                return Err(cell_err(
                    i,
                    schema,
                    format!("adjustment factor {} is outside 0 < factor ≤ 3", fmt_num(v)),
                ));
            }
            let slot = match k {
                Factor::Cd => &mut factors.cd,
                Factor::CmFb => &mut factors.cm_fb,
                Factor::CmFv => &mut factors.cm_fv,
                Factor::CmE => &mut factors.cm_e,
                Factor::Ct => &mut factors.ct,
                Factor::Ci => &mut factors.ci,
                Factor::CtE => &mut factors.ct_e,
                Factor::CiE => &mut factors.ci_e,
                Factor::Cf => &mut factors.cf,
                Factor::Cr => &mut factors.cr,
                Factor::Cfu => &mut factors.cfu,
            };
            *slot = Some(v);
        }
        _ => {}
    }
    Ok(())
}
