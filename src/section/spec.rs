//! A shape from a family name and `key = value-with-unit` pairs, the one
//! way shapes are written on the command line (`welded-i bf=300mm tf=20mm
//! hw=800mm tw=10mm`), in job files and in catalogue rows.

use super::Shape;
use crate::error::{Error, Result};
use crate::units::{self, Dim};

/// The families and the keys each accepts, for help and error messages.
pub const FAMILIES: &[(&str, &str)] = &[
    ("rect", "b, d"),
    (
        "welded-i",
        "bf, tf, tw, and hw (clear web) or d (overall depth)",
    ),
    ("rolled-i", "d, bf, tf, tw, r (root fillet; 0 if omitted)"),
    ("mono-i", "bf_top, tf_top, bf_bot, tf_bot, tw, and hw or d"),
    (
        "rhs",
        "b, h, t, r_out (outer corner radius; 0 = sharp if omitted)",
    ),
    ("chs", "d, t"),
    ("round", "d"),
];

fn families_list() -> String {
    FAMILIES
        .iter()
        .map(|(f, k)| format!("{f} ({k})"))
        .collect::<Vec<_>>()
        .join("; ")
}

/// Normalise a family name: case, `_` and spaces do not matter.
pub fn normalise_family(name: &str) -> String {
    name.trim().to_ascii_lowercase().replace(['_', ' '], "-")
}

struct Pairs<'a> {
    family: &'a str,
    pairs: Vec<(String, f64, bool)>,
}

impl Pairs<'_> {
    fn take(&mut self, key: &str) -> Option<f64> {
        for p in self.pairs.iter_mut() {
            if p.0 == key {
                p.2 = true;
                return Some(p.1);
            }
        }
        None
    }
    fn need(&mut self, key: &str) -> Result<f64> {
        self.take(key).ok_or_else(|| {
            Error::msg(format!(
                "a {} needs '{key}': expected keys {}",
                self.family,
                FAMILIES
                    .iter()
                    .find(|(f, _)| *f == self.family)
                    .map(|(_, k)| *k)
                    .unwrap_or("")
            ))
        })
    }
    fn finish(self) -> Result<()> {
        if let Some(p) = self.pairs.iter().find(|p| !p.2) {
            return Err(Error::msg(format!(
                "'{}' is not a dimension of a {} (or is given twice): expected keys {}",
                p.0,
                self.family,
                FAMILIES
                    .iter()
                    .find(|(f, _)| *f == self.family)
                    .map(|(_, k)| *k)
                    .unwrap_or("")
            )));
        }
        Ok(())
    }
}

/// Build a shape from a family and (key, text) pairs; every value needs a
/// length unit. The shape is validated.
pub fn shape_from_pairs(family: &str, pairs: &[(String, String)]) -> Result<Shape> {
    let fam = normalise_family(family);
    let fam_static = FAMILIES
        .iter()
        .map(|(f, _)| *f)
        .find(|f| *f == fam)
        .ok_or_else(|| {
            Error::msg(format!(
                "unknown shape '{family}': expected one of {}",
                families_list()
            ))
        })?;
    let mut parsed = Vec::with_capacity(pairs.len());
    for (k, v) in pairs {
        let key = k.trim().to_ascii_lowercase().replace('-', "_");
        let val = units::parse(v, Dim::Length).map_err(|e| e.in_field(&key))?;
        parsed.push((key, val, false));
    }
    let mut p = Pairs {
        family: fam_static,
        pairs: parsed,
    };
    let shape = match fam_static {
        "rect" => Shape::Rect {
            b: p.need("b")?,
            d: p.need("d")?,
        },
        "welded-i" => {
            let bf = p.need("bf")?;
            let tf = p.need("tf")?;
            let tw = p.need("tw")?;
            let hw = web_height(&mut p, tf, tf)?;
            Shape::WeldedI { bf, tf, hw, tw }
        }
        "rolled-i" => Shape::RolledI {
            d: p.need("d")?,
            bf: p.need("bf")?,
            tf: p.need("tf")?,
            tw: p.need("tw")?,
            r: p.take("r").unwrap_or(0.0),
        },
        "mono-i" => {
            let bf_top = p.need("bf_top")?;
            let tf_top = p.need("tf_top")?;
            let bf_bot = p.need("bf_bot")?;
            let tf_bot = p.need("tf_bot")?;
            let tw = p.need("tw")?;
            let hw = web_height(&mut p, tf_top, tf_bot)?;
            Shape::MonoI {
                bf_top,
                tf_top,
                bf_bot,
                tf_bot,
                hw,
                tw,
            }
        }
        "rhs" => Shape::Rhs {
            b: p.need("b")?,
            h: p.need("h")?,
            t: p.need("t")?,
            r_out: p.take("r_out").or_else(|| p.take("r")).unwrap_or(0.0),
        },
        "chs" => Shape::Chs {
            d: p.need("d")?,
            t: p.need("t")?,
        },
        "round" => Shape::Round { d: p.need("d")? },
        _ => return Err(Error::Internal(format!("family {fam_static} not handled"))),
    };
    p.finish()?;
    // The problems of a shape are told in the units its dimensions were
    // typed in.
    let sys = if !pairs.is_empty()
        && pairs
            .iter()
            .all(|(_, v)| units::typed_length_system(v) == units::System::Us)
    {
        units::System::Us
    } else {
        units::System::Si
    };
    shape.validate_in(sys)?;
    Ok(shape)
}

fn web_height(p: &mut Pairs<'_>, tf_top: f64, tf_bot: f64) -> Result<f64> {
    match (p.take("hw"), p.take("d")) {
        (Some(hw), None) => Ok(hw),
        (None, Some(d)) => {
            let hw = d - tf_top - tf_bot;
            if hw.is_nan() || hw <= 0.0 {
                return Err(Error::msg(format!(
                    "the flanges ({} mm) fill the whole depth d = {} mm: expected d greater than the flange thicknesses",
                    units::fmt_num(tf_top + tf_bot),
                    units::fmt_num(d)
                ))
                .in_field("d"));
            }
            Ok(hw)
        }
        (Some(_), Some(_)) => Err(Error::msg(
            "give either hw (clear web height) or d (overall depth), not both",
        )),
        (None, None) => Err(Error::msg(format!(
            "a {} needs hw (clear web height) or d (overall depth)",
            p.family
        ))),
    }
}

/// Parse `key=value` words (as typed on the command line).
pub fn split_pairs(words: &[String]) -> Result<Vec<(String, String)>> {
    words
        .iter()
        .map(|w| {
            w.split_once('=')
                .map(|(k, v)| (k.trim().to_string(), v.trim().to_string()))
                .ok_or_else(|| {
                    Error::msg(format!(
                        "'{w}' is not of the form key=value-with-unit, e.g. bf=300mm"
                    ))
                })
        })
        .collect()
}
