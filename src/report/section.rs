//! A section's properties as serialised, and their document.

use super::{Align, CAUTION, Document, Table};
use crate::error::Result;
use crate::section::{Properties, Shape};
use crate::units::{Show, System};
use serde::Serialize;

/// A shape with its properties (and its mass per length, given a density).
#[derive(Serialize)]
pub struct SectionResult {
    pub shape: Shape,
    pub properties: Properties,
    /// kg/m, when a density was given.
    pub mass_per_length: Option<f64>,
    /// kg/m³.
    pub density: Option<f64>,
    pub units: &'static str,
    pub caution: &'static str,
}

impl SectionResult {
    /// The properties of `shape` (and its mass per length at `density`).
    pub fn new(shape: Shape, density: Option<f64>) -> Result<SectionResult> {
        let props = shape.properties()?;
        Ok(SectionResult {
            mass_per_length: density.map(|d| props.mass_per_length(d)),
            density,
            shape,
            properties: props,
            units: "internal: mm, mm², mm³, mm⁴, mm⁶, kg/m, kg/m³",
            caution: CAUTION,
        })
    }
}

/// The document of a section: its properties, then notes on how they are
/// computed.
pub fn document(r: &SectionResult, sys: System) -> Document {
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
    doc
}
