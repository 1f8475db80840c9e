//! The sweeps' options as typed: spans as `START..END:STEP` or a list,
//! span-table columns (spacings or live-load levels) and the rounding and
//! tolerance of a span table. Errors name the option.

use super::{Column, TableOptions, span_range};
use crate::beam::model::Beam;
use crate::error::{Error, Result};
use crate::units::{self, Dim, Show, System};

/// The spans of `--spans`: `START..END:STEP` or a list. Each span is a
/// prepared job checked against the catalogue (and with an optimum at
/// each, an optimisation, about 50 ms): a sweep takes at most 1000 spans,
/// 200 with the optimum, which bounds the work a typo in a range can ask
/// for.
pub fn spans(text: &str, with_optimum: bool) -> Result<Vec<f64>> {
    let p = |t: &str| units::parse(t, Dim::Length).map_err(|e| e.in_field("--spans"));
    let spans = if let Some((range, step)) = text.split_once(':')
        && let Some((a, b)) = range.split_once("..")
    {
        span_range(p(a)?, p(b)?, p(step)?)?
    } else {
        units::parse_list(text, Dim::Length, "--spans")?
    };
    let most = if with_optimum { 200 } else { 1000 };
    if spans.len() > most {
        return Err(Error::msg(format!(
            "{} spans asked for, more than the {most} one sweep takes{}: use a larger step",
            spans.len(),
            if with_optimum { " with --optimise" } else { "" }
        ))
        .in_field("--spans"));
    }
    Ok(spans)
}

/// A span table's options, as given.
#[derive(Clone, Debug, Default)]
pub struct TableFlags {
    /// Tributary widths of the job's area loads, e.g. `300,400,600mm`.
    pub spacings: Option<String>,
    /// Pressures of the job's live area loads, e.g. `1.5,2.5,4kPa`.
    pub live_levels: Option<String>,
    /// Round spans down to a multiple of this.
    pub round: Option<String>,
    /// Bisection tolerance [default: 1mm].
    pub tolerance: Option<String>,
}

impl TableFlags {
    /// The columns and the beam of each (one column, the job as given,
    /// without spacings or live levels).
    pub fn columns(&self, beam: &Beam) -> Result<(Vec<Column>, Vec<Beam>)> {
        // Spacings are read as one list; live levels one at a time, each
        // column's beam made before the next level is read.
        type Values<'a> = Box<dyn Iterator<Item = Result<f64>> + 'a>;
        let (values, make, needs): (Values<'_>, fn(f64) -> Column, &str) = match (
            &self.spacings,
            &self.live_levels,
        ) {
            (Some(_), Some(_)) => {
                return Err(Error::msg("give --spacings or --live-levels, not both"));
            }
            (Some(s), None) => (
                Box::new(
                    units::parse_list(s, Dim::Length, "--spacings")?
                        .into_iter()
                        .map(Ok),
                ),
                Column::Spacing,
                "--spacings needs area loads in the job (a [[load]] with area and width)",
            ),
            (None, Some(s)) => (
                Box::new(live_levels(s)),
                Column::LivePressure,
                "--live-levels needs live area loads in the job (a [[load]] of a live case with area and width)",
            ),
            (None, None) => return Ok((vec![Column::AsGiven], vec![beam.clone()])),
        };
        let mut columns = Vec::new();
        let mut beams = Vec::new();
        for v in values {
            let c = make(v?);
            beams.push(c.beam(beam).ok_or_else(|| Error::msg(needs))?);
            columns.push(c);
        }
        Ok((columns, beams))
    }

    /// The rounding and tolerance, checked: a tolerance from 0.001 mm to
    /// 100 mm; rounding from 1 mm to 1 m (a step that rounds down, never
    /// up). Errors show lengths in `units`.
    pub fn options(&self, units: System) -> Result<TableOptions> {
        let round = units::parse_field(self.round.as_deref(), Dim::Length, "--round")?;
        let tolerance = units::parse(self.tolerance.as_deref().unwrap_or("1mm"), Dim::Length)
            .map_err(|e| e.in_field("--tolerance"))?;
        if !(1e-3..=100.0).contains(&tolerance) {
            return Err(Error::msg(format!(
                "{}: expected a tolerance from 0.001 mm to 100 mm",
                Show::Dimension.fmt(tolerance, units)
            ))
            .in_field("--tolerance"));
        }
        if let Some(r) = round
            && !(1.0..=1000.0).contains(&r)
        {
            return Err(Error::msg(format!(
                "{}: expected a rounding step from 1 mm to 1 m (spans are rounded down to a multiple of it)",
                Show::Dimension.fmt(r, units)
            ))
            .in_field("--round"));
        }
        Ok(TableOptions {
            tolerance,
            round,
            ..TableOptions::default()
        })
    }
}

/// The pressures of `--live-levels`, read one at a time: bare numbers
/// take the unit the list ends with.
fn live_levels(s: &str) -> impl Iterator<Item = Result<f64>> + '_ {
    let unit: String = s
        .rsplit(|c: char| c.is_ascii_digit() || c == '.')
        .next()
        .unwrap_or("")
        .to_string();
    s.split(',').map(move |part| {
        let t = if part
            .trim()
            .chars()
            .last()
            .is_some_and(|c| c.is_ascii_digit())
        {
            format!("{}{unit}", part.trim())
        } else {
            part.trim().to_string()
        };
        units::parse(&t, Dim::AreaLoad).map_err(|e| e.in_field("--live-levels"))
    })
}
