//! `beamsift section`: a shape's properties.

use super::Out;
use super::output::emit;
use beamsift::report;
use beamsift::report::section::{SectionResult, document};
use beamsift::section::spec::{shape_from_pairs, split_pairs};
use beamsift::units::{self, Dim};

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
    let result = SectionResult::new(shape, density)?;
    let doc = document(&result, out.units);
    emit(out, &report::render(out.format, &result, &doc)?)?;
    Ok(0)
}
