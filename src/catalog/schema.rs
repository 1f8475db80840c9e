//! The catalogue's header: what each column holds, and the unit it is in.

use crate::error::{Error, Location, Result};
use crate::units::{self, Dim};
use std::collections::HashSet;

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
    /// A price (currency per internal unit of its basis, per unit of the
    /// cell): per length (per mm), per mass (per kg) or per volume (per
    /// mm³). The row turns it into a cost per mm.
    Cost(PriceBasis, f64),
    /// A dimensionless timber adjustment factor of the row (C_F, C_r, ...).
    Factor(Factor),
}

/// What a catalogue's price is per: length, mass or volume of the member.
/// A price per mass is turned into a cost per length with the row's mass
/// per length (kg/m), a price per volume with its area (A).
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum PriceBasis {
    PerLength,
    PerMass,
    PerVolume,
}

impl PriceBasis {
    /// As a phrase: "per length", "per mass", "per volume".
    pub fn phrase(self) -> &'static str {
        match self {
            PriceBasis::PerLength => "per length",
            PriceBasis::PerMass => {
                "per mass (converted to cost per length with each row's mass per length)"
            }
            PriceBasis::PerVolume => {
                "per volume (converted to cost per length with each row's area A)"
            }
        }
    }
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

pub(super) fn factor_of(key: &str) -> Option<Factor> {
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

pub(super) const DIMS: &[&str] = &[
    "d", "b", "h", "bf", "tf", "tw", "hw", "r", "t", "r_out", "bf_top", "tf_top", "bf_bot",
    "tf_bot",
];
// Indices into DIMS (the per-row path looks dimensions up by index).
pub(super) const D: usize = 0;
pub(super) const B: usize = 1;
pub(super) const H: usize = 2;
pub(super) const BF: usize = 3;
pub(super) const TF: usize = 4;
pub(super) const TW: usize = 5;
pub(super) const HW: usize = 6;
pub(super) const R: usize = 7;
pub(super) const T: usize = 8;
pub(super) const R_OUT: usize = 9;
pub(super) const BF_TOP: usize = 10;
pub(super) const TF_TOP: usize = 11;
pub(super) const BF_BOT: usize = 12;
pub(super) const TF_BOT: usize = 13;

/// Known column names, for error messages.
pub const KNOWN: &str = "name, shape, series, grade, stock, one price column (cost or price [CUR/m], [CUR/t] or [CUR/m3]), dimensions (d, b, h, bf, tf, tw, hw, r, t, r_out, bf_top, tf_top, bf_bot, tf_bot), \
A, Ix, Iy, J, Cw, S (or S_top, S_bot), Zx, c_top, c_bot, Q, mass, E, Fb, Fbt, Fbc, Fv, Fy, density, Emin, \
timber adjustment factors without unit (CD, CM_Fb, CM_Fv, CM_E, Ct, Ci, Ct_E, Ci_E, CF, Cr, Cfu); columns named note... are ignored";

/// The parsed header.
#[derive(Clone, Debug)]
pub struct Schema {
    pub cols: Vec<Col>,
    pub headers: Vec<String>,
    /// Currency named in a cost header (`cost [EUR/m]`).
    pub currency: Option<String>,
    /// What the price column's prices are per (none without one).
    pub price_basis: Option<PriceBasis>,
    pub(super) name: Option<usize>,
    pub(super) shape: Option<usize>,
    /// Number cells use a decimal comma (`12,5`; see `ReadOptions`).
    pub decimal_comma: bool,
}

/// A header's name and the unit in its brackets (`Ix [in4]` → `Ix`,
/// `in4`), both trimmed; the schedule reader splits its headers the same.
pub fn split_header(h: &str) -> (String, Option<String>) {
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

/// Parse a price unit, `CURRENCY/UNIT` (or `per UNIT`, `/UNIT`): the
/// unit is a length (`EUR/m`, `USD/ft`), a mass (`EUR/t`, `EUR/kg`,
/// `USD/lb`) or a volume (`EUR/m3`, `USD/ft3`). Returns the currency, the
/// basis and the factor from the cell's figure to currency per mm, per kg
/// or per mm³.
fn cost_unit(unit: &str) -> Result<(Option<String>, PriceBasis, f64)> {
    let u = unit.trim();
    let (cur, per) = if let Some(rest) = u.strip_prefix("per ") {
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
            "price unit '{u}' is not of the form CURRENCY/UNIT, e.g. cost [EUR/m], price [EUR/t] or price [EUR/m3]"
        )));
    };
    let key = per.trim().to_ascii_lowercase().replace('³', "3");
    // Per mass: currency per kg of the cell's figure.
    let per_kg = match key.as_str() {
        "t" | "tonne" | "tonnes" => Some(1.0 / 1000.0),
        "kg" => Some(1.0),
        "lb" | "lbs" => Some(1.0 / units::KG_PER_LB),
        _ => None,
    };
    if let Some(f) = per_kg {
        return Ok((cur, PriceBasis::PerMass, f));
    }
    // Per volume: currency per mm³.
    let per_mm3 = match key.as_str() {
        "m3" => Some(1e-9),
        "ft3" => Some(1.0 / (units::MM_PER_FT * units::MM_PER_FT * units::MM_PER_FT)),
        _ => None,
    };
    if let Some(f) = per_mm3 {
        return Ok((cur, PriceBasis::PerVolume, f));
    }
    match units::unit_factor(per, Dim::Length) {
        Ok(mm) => Ok((cur, PriceBasis::PerLength, 1.0 / mm)),
        Err(_) => Err(Error::msg(format!(
            "price unit '{u}': expected a price per length (m, ft, ...), per mass (t, kg, lb) or per volume (m3, ft3) after the '/'"
        ))),
    }
}

impl Schema {
    /// The index of the name column (0 when there is none).
    #[inline]
    pub fn name_column(&self) -> usize {
        self.name.unwrap_or(0)
    }

    /// Parse the header row; every problem is reported at once.
    pub fn parse(headers: &[String], loc: &Location) -> Result<Schema> {
        let mut cols = Vec::new();
        let mut errors = Vec::new();
        let mut currency = None;
        let mut price_basis = None;
        let mut seen: HashSet<String> = HashSet::new();
        for (i, h) in headers.iter().enumerate() {
            let at = loc.clone().with_column(i as u64 + 1).with_field(h.clone());
            match column(h, &at, &mut seen, &mut currency, &mut price_basis) {
                Ok(c) => cols.push(c),
                Err(e) => {
                    errors.push(e);
                    cols.push(Col::Note);
                }
            }
        }
        // Two headers for one quantity (`name` and `designation`, `shape`
        // and `family`, or a dimension and its synonym): which to read
        // would be a guess, so the header is refused.
        for j in 0..cols.len() {
            if let Some(i) = (0..j).find(|&i| same_quantity(&cols[i], &cols[j])) {
                errors.push(Error::input(
                    loc.clone()
                        .with_column(j as u64 + 1)
                        .with_field(headers[j].clone()),
                    format!(
                        "column '{}' gives the same value as column {} ('{}'): keep one of them",
                        headers[j],
                        i + 1,
                        headers[i]
                    ),
                ));
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
            return Err(header_problems(errors, loc));
        }
        Ok(Schema {
            cols,
            headers: headers.to_vec(),
            currency,
            price_basis,
            name,
            shape,
            decimal_comma: false,
        })
    }
}

/// Whether two columns give the same quantity (notes never do; a second
/// price column is refused where it is read).
fn same_quantity(a: &Col, b: &Col) -> bool {
    match (a, b) {
        (Col::Dim(i, _), Col::Dim(j, _)) => i == j,
        (Col::Prop(p, _), Col::Prop(q, _)) => p == q,
        (Col::Factor(f), Col::Factor(g)) => f == g,
        (Col::Name, Col::Name)
        | (Col::Shape, Col::Shape)
        | (Col::Series, Col::Series)
        | (Col::Grade, Col::Grade)
        | (Col::Stock, Col::Stock) => true,
        _ => false,
    }
}

/// What one header names (`at` is its place), or the problem with it. A
/// column seen before is refused (notes excepted); a price header sets the
/// catalogue's currency and price basis, and a second one is refused.
fn column(
    h: &str,
    at: &Location,
    seen: &mut HashSet<String>,
    currency: &mut Option<String>,
    price_basis: &mut Option<PriceBasis>,
) -> Result<Col> {
    let (name, unit) = split_header(h);
    let key = name.to_ascii_lowercase().replace([' ', '-'], "_");
    if key.is_empty() {
        return Err(Error::input(
            at.clone(),
            format!("empty column header: expected one of {KNOWN}"),
        ));
    }
    if seen.contains(&key) && !key.starts_with("note") {
        return Err(Error::input(
            at.clone(),
            format!("column '{name}' appears twice"),
        ));
    }
    seen.insert(key.clone());
    let col = match key.as_str() {
        "name" | "designation" | "section" => Ok(Col::Name),
        "shape" | "family" => Ok(Col::Shape),
        "series" => Ok(Col::Series),
        "grade" => Ok(Col::Grade),
        "stock" | "in_stock" => Ok(Col::Stock),
        k if k.starts_with("note") => Ok(Col::Note),
        "cost" | "price" if price_basis.is_some() => Err(Error::msg(format!(
            "column '{name}' is a second price column: a catalogue has one price column (per length, per mass or per volume); keep one"
        ))),
        "cost" | "price" => match &unit {
            Some(u) => cost_unit(u).map(|(c, b, f)| {
                *currency = c;
                *price_basis = Some(b);
                Col::Cost(b, f)
            }),
            None => Err(Error::msg(format!(
                "column '{name}' needs its unit in brackets, e.g. {name} [EUR/m], {name} [EUR/t] or {name} [EUR/m3]"
            ))),
        },
        k if factor_of(k).is_some() => match unit.as_deref() {
            None | Some("-") | Some("") => Ok(Col::Factor(factor_of(k).unwrap_or(Factor::Cd))),
            Some(u) => Err(Error::msg(format!(
                "column '{name}' is a dimensionless adjustment factor: expected no unit, found [{u}]"
            ))),
        },
        k => quantity(k, &name, unit.as_deref()),
    };
    col.map_err(|e| e.at(at))
}

/// A dimension or property column, which needs its unit.
fn quantity(key: &str, name: &str, unit: Option<&str>) -> Result<Col> {
    let need_unit = |dim: Dim| -> Result<f64> {
        match unit {
            Some(u) => units::unit_factor(u, dim),
            None => Err(Error::msg(format!(
                "column '{name}' needs its unit in brackets, e.g. {name} [{}]",
                example_unit(dim)
            ))),
        }
    };
    if let Some(d) = DIMS.iter().position(|d| *d == key) {
        need_unit(Dim::Length).map(|f| Col::Dim(d, f))
    } else if let Some((p, dim)) = prop_of(key) {
        need_unit(dim).map(|f| Col::Prop(p, f))
    } else {
        Err(Error::msg(format!(
            "unknown column '{name}': expected one of {KNOWN}"
        )))
    }
}

/// The header's problems as one error. A header of thousands of bad
/// columns is one mistake (a wrong delimiter, a data row as header): the
/// first few say so.
fn header_problems(mut errors: Vec<Error>, loc: &Location) -> Error {
    const SHOWN: usize = 20;
    if errors.len() > SHOWN {
        let more = errors.len() - SHOWN;
        errors.truncate(SHOWN);
        errors.push(Error::input(
            loc.clone(),
            format!("... and {more} more header problem(s)"),
        ));
    }
    if errors.len() == 1 {
        errors.remove(0)
    } else {
        Error::Many(errors)
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

impl Schema {
    /// The unit system a row's values of `show` were typed in, for the
    /// words of its problems: US when every such column is in a US unit
    /// (lengths in inches or feet; mass in lb/ft), else SI.
    pub(super) fn typed_system(&self, show: units::Show) -> units::System {
        let us = |f: f64| match show {
            units::Show::Dimension => f == units::MM_PER_IN || f == units::MM_PER_FT,
            s => (f - s.unit(units::System::Us).1).abs() <= 1e-9 * f,
        };
        let mut factors = self.cols.iter().filter_map(|c| match (c, show) {
            (Col::Dim(_, f), units::Show::Dimension) => Some(*f),
            (Col::Prop(Prop::Mass, f), units::Show::Mass) => Some(*f),
            _ => None,
        });
        match factors.next() {
            Some(f) if us(f) && factors.all(us) => units::System::Us,
            _ => units::System::Si,
        }
    }
}

/// The column that gives the quantity `label` (an S column gives both
/// S_top and S_bot; tw and tf are dimension columns).
pub(super) fn column_of(schema: &Schema, label: &str) -> Option<usize> {
    schema.cols.iter().position(|col| match col {
        Col::Prop(pp, _) => prop_label(*pp) == label || (label.starts_with("S_") && *pp == Prop::S),
        Col::Dim(k, ..) => DIMS.get(*k).is_some_and(|d| *d == label),
        _ => false,
    })
}
