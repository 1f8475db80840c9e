//! One catalogue row: its cells read into the values they give, then the
//! steps of [`parse_row`] — the shape and its properties (`shape.rs`), the
//! material (`material.rs`), the mass.

use super::number::number_kind;
use super::records::{self, Record};
use super::schema::{Col, Factor, PriceBasis, Prop, R, R_OUT, Schema};
use super::{material, shape};
use crate::check::{Material, TimberFactors};
use crate::section::{Given, Properties, Shape};
use crate::units::{self, fmt_num};

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
    /// Cost per mm, in the catalogue's currency: the price cell turned
    /// into a cost per length (see [`cost_per_mm`]).
    pub cost: Option<f64>,
    pub stock: Option<bool>,
}

/// A row's cost per mm from its price cell (already in currency per mm,
/// per kg or per mm³ by the header's unit): per mass × mass per length
/// (kg/m ÷ 1000 = kg/mm), per volume × area (mm² × 1 mm = mm³ per mm).
pub fn cost_per_mm(
    basis: Option<PriceBasis>,
    price: Option<f64>,
    mass: f64,
    area: f64,
) -> Option<f64> {
    let p = price?;
    Some(match basis.unwrap_or(PriceBasis::PerLength) {
        PriceBasis::PerLength => p,
        PriceBasis::PerMass => p * mass / 1000.0,
        PriceBasis::PerVolume => p * area,
    })
}

/// Materials available to rows.
#[derive(Clone, Debug)]
pub struct Materials<'a> {
    pub base: &'a Material,
    pub grades: &'a [(String, Material)],
}

impl<'a> Materials<'a> {
    /// A job's material and named grades, as catalogue rows refer to them.
    pub fn of(job: &'a crate::job::Job) -> Materials<'a> {
        Materials {
            base: &job.material,
            grades: &job.grades,
        }
    }

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

pub(super) fn cell_err(column: usize, schema: &Schema, message: String) -> CellError {
    let h = schema.headers.get(column).cloned().unwrap_or_default();
    CellError {
        column: column + 1,
        message: format!("{h}: {message}"),
    }
}

pub(super) fn rel_diff(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs().max(1e-300)
}

/// Parse one record into a row. `None` material grades are looked up in
/// `mats`. Returns the first problem with its column.
pub fn parse_row<'r>(
    schema: &Schema,
    rec: &Record<'r>,
    mats: &Materials<'_>,
) -> std::result::Result<Row<'r>, CellError> {
    let mut row = Row::slot();
    parse_row_into(schema, rec, mats, &mut row)?;
    Ok(row)
}

impl Row<'_> {
    /// An empty slot for [`parse_row_into`], never a row.
    pub(crate) fn slot() -> Self {
        Row {
            name: "",
            series: "",
            grade: "",
            shape: None,
            props: Properties::unset(),
            mass: 0.0,
            material: RowMaterial::Job,
            cost: None,
            stock: None,
        }
    }
}

/// [`parse_row`] into a row reused from record to record: the scan's
/// path, where moving the large properties out of returned values cost
/// several copies per row. After an error `row` holds no meaning (it is
/// crate-private for that reason).
pub(crate) fn parse_row_into<'r>(
    schema: &Schema,
    rec: &Record<'r>,
    mats: &Materials<'_>,
    row: &mut Row<'r>,
) -> std::result::Result<(), CellError> {
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
    // Filled in place: the cells are large, and moving them out of a
    // returned Result cost two copies per row on the scan's path.
    let mut cells = Cells::empty();
    cells.read(schema, rec)?;
    let name_col = schema.name.unwrap_or(0);
    if cells.name.is_empty() {
        return Err(cell_err(
            name_col,
            schema,
            "empty name: every section needs one".into(),
        ));
    }
    if let Some(s) = cells.s_both {
        cells.given.s_top = cells.given.s_top.or(Some(s));
        cells.given.s_bot = cells.given.s_bot.or(Some(s));
    }
    row.shape = shape::shape_and_properties(
        schema,
        cells.family,
        &mut cells.given,
        &cells.dims,
        name_col,
        &mut row.props,
    )?;
    row.material = material::row_material(
        schema,
        mats,
        cells.grade,
        &cells.own,
        &cells.factors,
        name_col,
    )?;
    row.mass = mass(
        schema,
        mats.get(&row.material).density,
        &row.props,
        cells.mass,
        name_col,
    )?;
    row.cost = cost_per_mm(schema.price_basis, cells.cost, row.mass, row.props.area);
    row.name = cells.name;
    row.series = cells.series;
    row.grade = cells.grade;
    row.stock = cells.stock;
    Ok(())
}

/// The row's mass: given (checked against A·ρ where the material has a
/// density), or A·ρ.
fn mass(
    schema: &Schema,
    density: f64,
    props: &Properties,
    given: Option<f64>,
    name_col: usize,
) -> std::result::Result<f64, CellError> {
    let mass_col = schema
        .cols
        .iter()
        .position(|c| matches!(c, Col::Prop(Prop::Mass, _)));
    match given {
        Some(m) => {
            if density > 0.0 {
                let from_area = props.mass_per_length(density);
                if rel_diff(m, from_area) > 0.05 {
                    let sys = schema.typed_system(units::Show::Mass);
                    return Err(cell_err(
                        mass_col.unwrap_or(name_col),
                        schema,
                        format!(
                            "mass {} differs by {:.1} % from A·ρ = {}: expected agreement within 5 % (check the area, the unit or the density)",
                            units::Show::Mass.fmt(m, sys),
                            100.0 * rel_diff(m, from_area),
                            units::Show::Mass.fmt(from_area, sys)
                        ),
                    ));
                }
            }
            Ok(m)
        }
        None => {
            if density <= 0.0 {
                return Err(cell_err(
                    name_col,
                    schema,
                    "no mass column and no density for this row's material: cannot include self-weight".into(),
                ));
            }
            Ok(props.mass_per_length(density))
        }
    }
}

/// What a row's cells give, each in internal units (text borrowed from the
/// record).
pub(super) struct Cells<'r> {
    pub given: Given,
    /// Shape dimensions by index into `DIMS`: (value, given).
    pub dims: [(f64, bool); 14],
    /// An S column (both S_top and S_bot unless those are given).
    pub s_both: Option<f64>,
    pub mass: Option<f64>,
    pub cost: Option<f64>,
    pub stock: Option<bool>,
    pub name: &'r str,
    pub series: &'r str,
    pub grade: &'r str,
    pub family: &'r str,
    /// The row's own material values: E Fb Fbt Fbc Fv Fy density Emin.
    pub own: [Option<f64>; 8],
    pub factors: TimberFactors,
}

impl<'r> Cells<'r> {
    /// No cell read yet.
    #[inline]
    fn empty() -> Self {
        Cells {
            given: Given::default(),
            dims: [(0.0, false); 14],
            s_both: None,
            mass: None,
            cost: None,
            stock: None,
            name: "",
            series: "",
            grade: "",
            family: "",
            own: [None; 8],
            factors: TimberFactors::default(),
        }
    }

    /// Read every cell of the record into `self` (from [`Cells::empty`]);
    /// the first bad one is the error.
    #[inline]
    fn read(&mut self, schema: &Schema, rec: &Record<'r>) -> std::result::Result<(), CellError> {
        let cells = self;
        for (i, col) in schema.cols.iter().enumerate() {
            if let Col::Dim(..) | Col::Prop(..) | Col::Cost(..) | Col::Factor(_) = col {
                let bytes = rec.get(i).unwrap_or(b"");
                if bytes.iter().all(u8::is_ascii_whitespace) {
                    continue;
                }
                let mut point = Vec::new();
                let bytes = if schema.decimal_comma {
                    super::number::decimal_comma(bytes, &mut point)
                        .map_err(|m| cell_err(i, schema, m))?
                } else {
                    bytes
                };
                let v = match number_kind(bytes) {
                    Some((_, true)) if !matches!(col, Col::Dim(..)) => {
                        let shown = String::from_utf8_lossy(bytes).trim().to_string();
                        return Err(cell_err(
                            i,
                            schema,
                            format!(
                                "'{shown}': fractions are read only in dimension columns; write this value as a decimal"
                            ),
                        ));
                    }
                    Some((v, _)) => v,
                    None if bytes.contains(&b'/') => {
                        let shown = String::from_utf8_lossy(bytes);
                        let why = crate::units::fraction(&shown).err().unwrap_or_default();
                        return Err(cell_err(i, schema, why));
                    }
                    None => {
                        let shown = String::from_utf8_lossy(bytes).trim().to_string();
                        return Err(cell_err(
                            i,
                            schema,
                            format!("'{shown}' is not a finite number"),
                        ));
                    }
                };
                cells.numeric(col, i, v, schema)?;
                continue;
            }
            let raw =
                cell_str(rec, i).map_err(|_| cell_err(i, schema, "not valid UTF-8 text".into()))?;
            match col {
                Col::Name => cells.name = raw,
                Col::Series => cells.series = raw,
                Col::Grade => cells.grade = raw,
                Col::Shape => cells.family = raw,
                Col::Note | Col::Factor(_) => {}
                Col::Stock => {
                    if !raw.is_empty() {
                        cells.stock = Some(match raw.to_ascii_lowercase().as_str() {
                            "yes" | "y" | "true" | "1" => true,
                            "no" | "n" | "false" | "0" => false,
                            _ => {
                                return Err(cell_err(
                                    i,
                                    schema,
                                    format!("'{raw}' is not yes or no"),
                                ));
                            }
                        });
                    }
                }
                Col::Dim(..) | Col::Prop(..) | Col::Cost(..) => {}
            }
        }
        Ok(())
    }

    /// Store one numeric cell's value (in its header unit).
    #[inline]
    fn numeric(
        &mut self,
        col: &Col,
        i: usize,
        v: f64,
        schema: &Schema,
    ) -> std::result::Result<(), CellError> {
        let zero_ok = matches!(col, Col::Dim(R | R_OUT, _) | Col::Cost(..));
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
        let (given, own) = (&mut self.given, &mut self.own);
        match *col {
            Col::Dim(idx, f) => self.dims[idx] = (v * f, true),
            Col::Cost(_, f) => self.cost = Some(v * f),
            Col::Prop(p, f) => {
                let v = v * f;
                match p {
                    Prop::Area => given.area = Some(v),
                    Prop::Ix => given.ix = Some(v),
                    Prop::Iy => given.iy = Some(v),
                    Prop::J => given.j = Some(v),
                    Prop::Cw => given.cw = Some(v),
                    Prop::S => self.s_both = Some(v),
                    Prop::STop => given.s_top = Some(v),
                    Prop::SBot => given.s_bot = Some(v),
                    Prop::Zx => given.zx = Some(v),
                    Prop::CTop => given.c_top = Some(v),
                    Prop::CBot => given.c_bot = Some(v),
                    Prop::Q => given.q_na = Some(v),
                    Prop::Mass => self.mass = Some(v),
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
                let f = &mut self.factors;
                let slot = match k {
                    Factor::Cd => &mut f.cd,
                    Factor::CmFb => &mut f.cm_fb,
                    Factor::CmFv => &mut f.cm_fv,
                    Factor::CmE => &mut f.cm_e,
                    Factor::Ct => &mut f.ct,
                    Factor::Ci => &mut f.ci,
                    Factor::CtE => &mut f.ct_e,
                    Factor::CiE => &mut f.ci_e,
                    Factor::Cf => &mut f.cf,
                    Factor::Cr => &mut f.cr,
                    Factor::Cfu => &mut f.cfu,
                };
                *slot = Some(v);
            }
            _ => {}
        }
        Ok(())
    }
}
