//! `beamsift section`: a shape's properties.

use super::Out;
use super::output::emit;
use beamsift::report::{self, Align, Document, Table};
use beamsift::section::spec::{FAMILIES, shape_from_pairs, split_pairs};
use beamsift::section::{Properties, Shape};
use beamsift::units::{self, Dim, Show};
use serde::Serialize;

pub const EXAMPLES: &str = "Examples:
  beamsift section welded-i bf=300mm tf=20mm hw=800mm tw=10mm
  beamsift section rolled-i d=300mm bf=150mm tf=10.7mm tw=7.1mm r=15mm --density 7850kg/m3
  beamsift section rect b=1.5in d=9.25in --units us
  beamsift section rhs b=100mm h=200mm t=8mm r_out=16mm --json

Shapes and their dimensions (each with a unit):
  rect      b, d
  welded-i  bf, tf, tw, and hw (clear web) or d (overall depth)
  rolled-i  d, bf, tf, tw, r (root fillet radius)
  mono-i    bf_top, tf_top, bf_bot, tf_bot, tw, and hw or d
  rhs       b, h, t, r_out (outer corner radius, 0 = sharp)
  chs       d, t
  round     d";

#[derive(clap::Args, Debug)]
pub struct Args {
    /// Shape family: rect, welded-i, rolled-i, mono-i, rhs, chs, round.
    pub shape: String,
    /// Dimensions as key=value-with-unit, e.g. bf=300mm tf=20mm.
    #[arg(value_name = "KEY=VALUE")]
    pub dims: Vec<String>,
    /// Density, to print the mass per length (e.g. 7850kg/m3, 500kg/m3, 490pcf).
    #[arg(long)]
    pub density: Option<String>,
}

#[derive(Serialize)]
struct SectionResult {
    shape: Shape,
    properties: Properties,
    /// kg/m, when a density was given.
    mass_per_length: Option<f64>,
    /// kg/m³.
    density: Option<f64>,
    units: &'static str,
    caution: &'static str,
}

pub fn run(a: Args, out: &Out) -> beamsift::Result<i32> {
    let pairs = split_pairs(&a.dims)?;
    let shape = shape_from_pairs(&a.shape, &pairs)?;
    let density = a
        .density
        .as_deref()
        .map(|d| units::parse(d, Dim::Density).map_err(|e| e.in_field("--density")))
        .transpose()?;
    if let Some(d) = density
        && d <= 0.0
    {
        return Err(beamsift::Error::msg("--density must be greater than zero"));
    }
    let props = shape.properties()?;
    let result = SectionResult {
        mass_per_length: density.map(|d| props.mass_per_length(d)),
        density,
        shape,
        properties: props,
        units: "internal: mm, mm², mm³, mm⁴, mm⁶, kg/m, kg/m³",
        caution: report::CAUTION,
    };
    let doc = document(&result, out);
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(0)
}

fn document(r: &SectionResult, out: &Out) -> Document {
    let sys = out.units;
    let mut doc = Document::new(format!("Section {}", r.shape.describe(sys)));
    let mut t = Table::new(
        "",
        &[
            ("Property", Align::Left),
            ("Value", Align::Right),
            ("Unit", Align::Left),
        ],
    );
    for (label, v, kind) in r.properties.rows() {
        t.row(vec![label.into(), kind.num(v, sys), kind.label(sys).into()]);
    }
    if let (Some(m), Some(rho)) = (r.mass_per_length, r.density) {
        t.row(vec![
            format!("Mass per length (ρ = {})", Show::Density.fmt(rho, sys)),
            Show::Mass.num(m, sys),
            Show::Mass.label(sys).into(),
        ]);
    }
    doc.table(t);
    let mut notes =
        vec!["Bending about the horizontal axis; y measured up from the bottom fibre.".to_string()];
    if matches!(r.shape, Shape::RolledI { .. }) {
        notes.push(
            "Root fillets are included in A, Ix, Iy, Zx, Zy and Q; J by El Darwish & Johnston (1965) with the fillets (within 1 % of a finite-element value for an IPE 300); Cw = Iy,flanges·h0²/2, as section tables compute it."
                .into(),
        );
    }
    if matches!(r.shape, Shape::Rhs { .. }) {
        notes.push("Cw of a hollow rectangle: the thin-walled box approximation t·bm²·hm²·(bm − hm)²/(24(bm + hm)) on the mid-line (small for closed sections).".into());
    }
    if matches!(r.shape, Shape::Rect { .. }) {
        notes.push(
            "Cw of a solid rectangle: the exact series of the Saint-Venant warping function."
                .into(),
        );
    }
    if matches!(r.shape, Shape::WeldedI { .. } | Shape::MonoI { .. }) {
        notes.push("Plates only: weld fillets are ignored; J includes the junction correction of El Darwish & Johnston (1965).".into());
    }
    doc.list("Notes:", notes);
    doc.caution(vec![
        "strength, stability or serviceability of any member (this command reports geometry only)"
            .into(),
    ]);
    let _ = FAMILIES;
    doc
}
