//! A row's material: the job's, a named grade of the job, or the row's
//! own values (stresses, density, timber factors) on top of either.

use super::row::{CellError, Materials, RowMaterial, cell_err};
use super::schema::{Col, Prop, Schema, factor_of};
use crate::check::{Material, MaterialKind, TimberFactors};

/// The row's material: its grade (if any) looked up in the job, then its
/// own values on top. `own` holds E Fb Fbt Fbc Fv Fy density Emin.
#[inline]
pub(super) fn row_material(
    schema: &Schema,
    mats: &Materials<'_>,
    grade: &str,
    own: &[Option<f64>; 8],
    factors: &TimberFactors,
    name_col: usize,
) -> std::result::Result<RowMaterial, CellError> {
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
    let has_factors = *factors != TimberFactors::default();
    if own.iter().any(Option::is_some) || has_factors {
        let base = match &material {
            RowMaterial::Grade(i) => &mats.grades[*i].1,
            _ => mats.base,
        };
        let m = own_material(schema, base, own, factors, has_factors, name_col)?;
        material = RowMaterial::Own(Box::new(m));
    }
    Ok(material)
}

/// The row's own values on top of `base`, validated.
fn own_material(
    schema: &Schema,
    base: &Material,
    own: &[Option<f64>; 8],
    factors: &TimberFactors,
    has_factors: bool,
    name_col: usize,
) -> std::result::Result<Material, CellError> {
    if has_factors && base.kind != MaterialKind::Timber {
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
    let mut timber = base.timber.with(factors);
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
    // Problems in the system the row's dimensions were typed in.
    match m.validate_in(schema.typed_system(crate::units::Show::Dimension)) {
        Ok(()) => Ok(m),
        Err(e) => Err(locate_invalid(schema, e, name_col)),
    }
}

/// A material the check refuses, reported at the column of the value it
/// names (the name column when no column gives it).
fn locate_invalid(schema: &Schema, e: crate::error::Error, name_col: usize) -> CellError {
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
    cell_err(col.unwrap_or(name_col), schema, message)
}
