//! The job's material (`[material]`) and the named grades a catalogue row
//! may refer to (`[materials.NAME]`).

use super::raw::RawMaterial;
use super::source::Source;
use super::values::parse_kind;
use crate::check::{Material, MaterialKind, TimberFactors};
use crate::error::{Error, Location, Result};
use crate::units::Dim;
use std::collections::BTreeMap;
use toml::Spanned;

/// The named grades; a grade without its own density takes the job
/// material's, and one without a name is named by its key.
pub(super) fn grades(
    src: &Source<'_>,
    raw: Option<&BTreeMap<String, RawMaterial>>,
    material: &Material,
) -> Result<Vec<(String, Material)>> {
    let mut grades = Vec::new();
    if let Some(ms) = raw {
        for (name, m) in ms {
            let mut sink = Vec::new();
            let mut mat = parse_material(src, m, &format!("materials.{name}"), &mut sink)?;
            if m.density.is_none() {
                mat.density = material.density;
            }
            if mat.name == "material" {
                mat.name = name.clone();
            }
            grades.push((name.clone(), mat));
        }
    }
    Ok(grades)
}

/// An optional stress of the table.
fn stress(
    src: &Source<'_>,
    v: &Option<Spanned<String>>,
    table: &str,
    name: &str,
) -> Result<Option<f64>> {
    v.as_ref()
        .map(|v| src.q(v, Dim::Stress, &format!("{table}.{name}")))
        .transpose()
}

/// One material table (`table` names it in errors and notes).
pub(super) fn parse_material(
    src: &Source<'_>,
    m: &RawMaterial,
    table: &str,
    notes: &mut Vec<String>,
) -> Result<Material> {
    let e = match &m.e {
        Some(v) => src.q(v, Dim::Stress, &format!("{table}.E"))?,
        None => {
            return Err(Error::input(
                src.table_loc(table, &format!("{table}.E")),
                format!(
                    "missing the modulus of elasticity: add E = \"...\" with a stress unit to [{table}]"
                ),
            ));
        }
    };
    let fy = stress(src, &m.fy, table, "Fy")?;
    let timber = timber_factors(src, m, table)?;
    let timber_given = timber != TimberFactors::default();
    let kind = kind(src, m, table, fy.is_some(), timber_given, notes)?;
    if timber_given && kind != MaterialKind::Timber {
        return Err(Error::input(
            src.table_loc(table, &format!("{table}.kind")),
            format!(
                "[{table}] gives timber values (Emin or adjustment factors) but kind is {}: expected kind = \"timber\"",
                kind.name()
            ),
        ));
    }
    let (fb_tension, fb_compression) = bending(src, m, table, kind, fy.is_some())?;
    let density = match &m.density {
        Some(v) => src.q(v, Dim::Density, &format!("{table}.density"))?,
        None => {
            notes.push("no density given: the section's self-weight is not included unless a catalogue row gives its mass".into());
            0.0
        }
    };
    let mat = Material {
        name: m.name.clone().unwrap_or_else(|| "material".into()),
        kind,
        e,
        fb_tension,
        fb_compression,
        fv: stress(src, &m.fv, table, "Fv")?,
        fy,
        density,
        timber,
    };
    // Problems in the system E was typed in.
    let sys = m.e.as_ref().map_or(crate::units::System::Si, |t| {
        crate::units::typed_stress_system(t.get_ref())
    });
    mat.validate_in(sys)
        .map_err(|e| locate_invalid(src, m, table, e))?;
    Ok(mat)
}

/// Emin and the timber adjustment factors as given.
fn timber_factors(src: &Source<'_>, m: &RawMaterial, table: &str) -> Result<TimberFactors> {
    let factor = |v: &Option<Spanned<f64>>| v.as_ref().map(|x| *x.get_ref());
    Ok(TimberFactors {
        e_min: stress(src, &m.e_min, table, "Emin")?,
        cd: factor(&m.cd),
        cm_fb: factor(&m.cm_fb),
        cm_fv: factor(&m.cm_fv),
        cm_e: factor(&m.cm_e),
        ct: factor(&m.ct),
        ci: factor(&m.ci),
        ct_e: factor(&m.ct_e),
        ci_e: factor(&m.ci_e),
        cf: factor(&m.cf),
        cr: factor(&m.cr),
        cfu: factor(&m.cfu),
    })
}

/// The kind as given, or inferred (with a note) from what the table gives.
fn kind(
    src: &Source<'_>,
    m: &RawMaterial,
    table: &str,
    fy_given: bool,
    timber_given: bool,
    notes: &mut Vec<String>,
) -> Result<MaterialKind> {
    Ok(match &m.kind {
        Some(k) => parse_kind(k.get_ref())
            .map_err(|e| e.at(&src.loc(k.span(), &format!("{table}.kind"))))?,
        None if fy_given && !timber_given => {
            notes.push(format!(
                "[{table}] has no kind: taken as steel because Fy is given (AISC 360-16 limit states apply)"
            ));
            MaterialKind::Steel
        }
        None if timber_given => {
            notes.push(format!(
                "[{table}] has no kind: taken as timber because timber values (Emin or adjustment factors) are given"
            ));
            MaterialKind::Timber
        }
        None => {
            notes.push(format!(
                "[{table}] has no kind (steel, timber or other): no stability or local buckling method applies, so those are not verified unless excluded or not applicable"
            ));
            MaterialKind::Unspecified
        }
    })
}

/// The allowable bending stresses (tension, compression): Fb for both,
/// or Fbt and Fbc; steel with Fy may give none.
fn bending(
    src: &Source<'_>,
    m: &RawMaterial,
    table: &str,
    kind: MaterialKind,
    fy_given: bool,
) -> Result<(Option<f64>, Option<f64>)> {
    let fb = stress(src, &m.fb, table, "Fb")?;
    let fbt = stress(src, &m.fbt, table, "Fbt")?;
    let fbc = stress(src, &m.fbc, table, "Fbc")?;
    match (fb, fbt, fbc) {
        (_, Some(t), Some(c)) => Ok((Some(t), Some(c))),
        (Some(b), t, c) => Ok((Some(t.unwrap_or(b)), Some(c.unwrap_or(b)))),
        (None, None, None) if kind == MaterialKind::Steel && fy_given => Ok((None, None)),
        _ => Err(Error::input(
            src.table_loc(table, &format!("{table}.Fb")),
            format!(
                "missing the allowable bending stress: add Fb = \"...\" (or both Fbt and Fbc) to [{table}] (steel with Fy may omit it: AISC 360-16 Chapter F then gives the bending strength)"
            ),
        )),
    }
}

/// A material the check refuses: the problem is at the key it names
/// ("material.Fb (tension)"), in this table; at the table's header when
/// the key is not given.
fn locate_invalid(src: &Source<'_>, m: &RawMaterial, table: &str, e: Error) -> Error {
    let Error::Input { location, message } = e else {
        return e.at(&Location::in_file(src.file));
    };
    let key = location
        .field
        .as_deref()
        .and_then(|f| f.strip_prefix("material."))
        .unwrap_or("");
    let key = key.split(' ').next().unwrap_or("");
    let stress = |v: &Option<Spanned<String>>| v.as_ref().map(|v| v.span());
    let num = |v: &Option<Spanned<f64>>| v.as_ref().map(|v| v.span());
    let span = match key {
        "E" => stress(&m.e),
        "Fb" => stress(&m.fb).or(stress(&m.fbt)).or(stress(&m.fbc)),
        "Fv" => stress(&m.fv),
        "Fy" => stress(&m.fy),
        "Emin" => stress(&m.e_min),
        "density" => stress(&m.density),
        "CD" => num(&m.cd),
        "CM_Fb" => num(&m.cm_fb),
        "CM_Fv" => num(&m.cm_fv),
        "CM_E" => num(&m.cm_e),
        "Ct" => num(&m.ct),
        "Ci" => num(&m.ci),
        "Ct_E" => num(&m.ct_e),
        "Ci_E" => num(&m.ci_e),
        "CF" => num(&m.cf),
        "Cr" => num(&m.cr),
        "Cfu" => num(&m.cfu),
        _ => None,
    };
    let field = format!("{table}.{key}");
    let at = match span {
        Some(sp) => src.loc(sp, &field),
        None => src.table_loc(table, &field),
    };
    Error::input(at, message)
}
