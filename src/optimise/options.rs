//! The optimiser's options as typed (quantities with units, lists,
//! `NAME=LOW..HIGH` bounds), checked and turned into a `Problem` and
//! `StudyOptions`. Errors name the option (`--bound`, `--plates`, …).

use super::discrete::GridOptions;
use super::{Axis, Family, Objective, Problem, StudyOptions};
use crate::check::Material;
use crate::error::{Error, Result};
use crate::units::{self, Dim, System};

/// The options of one study, as given.
#[derive(Clone, Debug)]
pub struct Options {
    pub family: Family,
    /// `NAME=LOW..HIGH`, e.g. `hw=300mm..900mm`.
    pub bounds: Vec<String>,
    pub max_depth: Option<String>,
    pub min_depth: Option<String>,
    pub aspect: Option<f64>,
    pub lambda_f: Option<f64>,
    pub lambda_w: Option<f64>,
    /// Keep flanges and webs compact (AISC 360-16 Table B4.1b λp).
    pub compact: bool,
    pub objective: Objective,
    /// Plate thicknesses (a list with one unit at the end).
    pub plates: Option<String>,
    /// Price per kg of each plate thickness, in the order of `plates`.
    pub plate_prices: Option<String>,
    pub step: Option<String>,
    pub b_sizes: Option<String>,
    pub d_sizes: Option<String>,
    pub starts: usize,
}

impl Options {
    /// Options that do not apply to the chosen family (or objective) are
    /// refused, never ignored.
    pub fn refuse_inapplicable(&self) -> Result<()> {
        let fam = self.family;
        let mut bad = Vec::new();
        let limits = fam.kind().limits();
        let plated = fam.kind().axes().contains(&Axis::Thickness);
        if self.aspect.is_some() && !limits.aspect {
            bad.push("--aspect (rectangles only)");
        }
        if (self.b_sizes.is_some() || self.d_sizes.is_some()) && plated {
            bad.push("--b-sizes/--d-sizes (rectangles only)");
        }
        if self.plates.is_some() && !plated {
            bad.push("--plates (a rectangle has no plate thickness: use --b-sizes/--d-sizes)");
        }
        if self.lambda_f.is_some() && !limits.flange {
            bad.push("--lambda-f (I-shapes only)");
        }
        if self.lambda_w.is_some() && !limits.web {
            bad.push("--lambda-w (I-shapes and rhs only)");
        }
        if self.compact && !plated {
            bad.push("--compact (a solid rectangle has no slender plates)");
        }
        if self.plate_prices.is_some() && self.objective != Objective::Cost {
            bad.push("--plate-prices (only used with --objective cost)");
        }
        if self.step.is_some() && !plated && self.b_sizes.is_some() && self.d_sizes.is_some() {
            bad.push("--step (both --b-sizes and --d-sizes are given)");
        }
        if bad.is_empty() {
            Ok(())
        } else {
            Err(Error::msg(format!(
                "these options do not apply to optimising a {}: {}",
                fam.variables().join("/"),
                bad.join("; ")
            )))
        }
    }

    /// The family's default bounds with each `NAME=LOW..HIGH` applied.
    fn bounds(&self) -> Result<Vec<(f64, f64)>> {
        let fam = self.family;
        let vars = fam.variables();
        let mut bounds = fam.default_bounds();
        for b in &self.bounds {
            let (name, range) = b.split_once('=').ok_or_else(|| {
                Error::msg(format!(
                    "--bound '{b}': expected NAME=LOW..HIGH, e.g. hw=300mm..900mm"
                ))
            })?;
            let i = vars.iter().position(|v| *v == name.trim()).ok_or_else(|| {
                Error::msg(format!(
                    "--bound: '{name}' is not a variable of {fam:?}: expected one of {}",
                    vars.join(", ")
                ))
            })?;
            let (lo, hi) = range.split_once("..").ok_or_else(|| {
                Error::msg(format!("--bound '{b}': expected LOW..HIGH with units"))
            })?;
            bounds[i] = (
                units::parse(lo, Dim::Length).map_err(|e| e.in_field("--bound"))?,
                units::parse(hi, Dim::Length).map_err(|e| e.in_field("--bound"))?,
            );
        }
        Ok(bounds)
    }

    /// (thickness, price per kg) of each plate, when prices are given.
    fn plate_prices(&self, plates: &[f64]) -> Result<Vec<(f64, f64)>> {
        let Some(t) = &self.plate_prices else {
            return Ok(Vec::new());
        };
        let prices: Vec<f64> = t
            .split(',')
            .map(|p| units::parse_number(p).map_err(|e| e.in_field("--plate-prices")))
            .collect::<Result<_>>()?;
        if prices.len() != plates.len() {
            return Err(Error::msg(format!(
                "--plate-prices has {} values but --plates has {}: give one price per kg for each thickness",
                prices.len(),
                plates.len()
            )));
        }
        Ok(plates.iter().copied().zip(prices).collect())
    }

    /// The problem and the study options, checked: slenderness limits
    /// default from the material (compact with `compact`).
    pub fn build(&self, material: &Material, units: System) -> Result<(Problem, StudyOptions)> {
        let fam = self.family;
        let bounds = self.bounds()?;
        let (df, dw) = match material.fy {
            Some(fy) if self.compact => super::compact_slenderness(fam, material.e, fy),
            Some(fy) => super::default_slenderness(fam, material.e, fy),
            None => (None, None),
        };
        let plates = units::parse_list(
            self.plates
                .as_deref()
                .unwrap_or("6,8,10,12,15,20,25,30,35,40,45,50mm"),
            Dim::Length,
            "--plates",
        )?;
        let plate_prices = self.plate_prices(&plates)?;
        let prob = Problem {
            family: fam,
            bounds,
            max_depth: units::parse_field(self.max_depth.as_deref(), Dim::Length, "--max-depth")?,
            min_depth: units::parse_field(self.min_depth.as_deref(), Dim::Length, "--min-depth")?,
            aspect: self.aspect,
            lambda_f: self.lambda_f.or(df),
            lambda_w: self.lambda_w.or(dw),
            objective: self.objective,
            plate_prices,
        };
        if !(1..=64).contains(&self.starts) {
            return Err(Error::msg(format!(
                "--starts {}: expected 1 to 64 starting points",
                self.starts
            )));
        }
        // Fabrication grid: a step from 0.1 mm (no stock is finer) to 1 m.
        let step_text = self.step.as_deref().unwrap_or("10mm");
        let step = units::parse(step_text, Dim::Length).map_err(|e| e.in_field("--step"))?;
        if !(0.1..=1000.0).contains(&step) {
            return Err(Error::msg(format!(
                "{}: expected a step from 0.1 mm to 1 m",
                step_text.trim()
            ))
            .in_field("--step"));
        }
        if let Some(t) = plates.iter().find(|t| !(**t > 0.0 && **t <= 1000.0)) {
            // In the system the list was typed in.
            let sys = units::typed_length_system(self.plates.as_deref().unwrap_or(""));
            return Err(Error::msg(format!(
                "{}: expected thicknesses above 0 and up to 1 m",
                units::Show::Dimension.fmt(*t, sys)
            ))
            .in_field("--plates"));
        }
        // Problems in the system the bounds were typed in (else the
        // output's).
        let typed = self
            .bounds
            .iter()
            .find_map(|b| {
                b.split_once('=')
                    .map(|(_, r)| units::typed_length_system(r.split("..").next().unwrap_or("")))
            })
            .unwrap_or(units);
        prob.validate_in(typed)?;
        let list = |v: &Option<String>, n: &str| -> Result<Option<Vec<f64>>> {
            v.as_deref()
                .map(|t| units::parse_list(t, Dim::Length, n))
                .transpose()
        };
        let opts = StudyOptions {
            starts: self.starts,
            grid: GridOptions {
                plates,
                step,
                widths: list(&self.b_sizes, "--b-sizes")?,
                depths: list(&self.d_sizes, "--d-sizes")?,
            },
            units,
        };
        Ok((prob, opts))
    }
}
