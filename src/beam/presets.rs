//! Combination presets, as the standards write them (from memory of the
//! editions named; verify against the editions in force).
//!
//! Strength — `asce7-16-asd`: ASCE/SEI 7-16 §2.4.1 basic allowable-stress
//! combinations (seismic omitted: beamsift has no seismic case):
//!
//!   (1) D                     (5) D + 0.6W
//!   (2) D + L                 (6a) D + 0.75L + 0.75(0.6W) + 0.75(Lr or S or R)
//!   (3) D + (Lr or S or R)    (7) 0.6D + 0.6W
//!   (4) D + 0.75L + 0.75(Lr or S or R)
//!
//! * A case the job does not have contributes zero; the combination stays
//!   (with no live case, (6a) becomes D + 0.45W + 0.75S). A combination that
//!   then equals an earlier one exactly is not repeated, and a note says so.
//! * "Lr or S or R": one combination per category present (every case of
//!   that category together). Wind: one combination per wind case (cases of
//!   category wind are alternatives, e.g. two directions).
//! * "Other" loads take the dead load's factor in each combination (1.0, or
//!   0.6 in (7)), as §2.4.1 treats fluid loads F: permanent loads of another
//!   origin.
//! * Snow on a beam of more than one span is partially loaded (full on some
//!   spans, half on the others, ASCE 7-16 §7.5) unless the case says
//!   otherwise: see [`partial_snow`].
//!
//! Service — IBC 2018 Table 1604.3: `floor` L/360 under live load, L/240
//! under the total load; `roof` (non-plaster ceiling) L/240 under roof live
//! or snow, L/180 under the total load. The total takes every gravity case
//! of the job (see [`service`]).

use super::model::{Beam, Category, Combination, ComboKind, DeflectionLimit, LoadCase, Pattern};
use crate::error::{Error, Result};

/// Combinations of a preset, and what the reader should know about them.
#[derive(Clone, Debug, Default)]
pub struct Preset {
    pub combinations: Vec<Combination>,
    pub notes: Vec<String>,
}

fn cases_of(cases: &[LoadCase], cat: Category) -> Vec<usize> {
    (0..cases.len())
        .filter(|&i| cases[i].category == cat)
        .collect()
}

fn term(factor: f64, label: &str) -> String {
    if factor == 1.0 {
        label.to_string()
    } else {
        format!("{}{}", crate::units::fmt_num(factor), label)
    }
}

/// Is the strength preset one whose standard calls for partial snow
/// loading of continuous beams (ASCE 7-16 §7.5)?
pub fn partial_snow(strength: Option<&str>) -> bool {
    strength.is_some_and(is_asce)
}

/// Snow cases without a pattern of their own get partial loading (full or
/// half by span) on a beam of more than one span, as the preset's standard
/// asks (ASCE 7-16 §7.5).
pub fn set_partial_snow(beam: &mut Beam, explicit: &[bool], notes: &mut Vec<String>) {
    if beam.stretches().len() < 2 {
        return;
    }
    let mut named = Vec::new();
    for (i, c) in beam.cases.iter_mut().enumerate() {
        if c.category == Category::Snow && !explicit.get(i).copied().unwrap_or(false) {
            c.pattern = Pattern::Partial;
            named.push(c.name.clone());
        }
    }
    if !named.is_empty() {
        notes.push(format!(
            "snow case(s) {} partially loaded: full on some spans, half on the others, the worst at every station (ASCE 7-16 §7.5; set pattern = false on the case to turn it off)",
            named.join(", ")
        ));
    }
}

fn is_asce(name: &str) -> bool {
    matches!(
        name.trim().to_ascii_lowercase().as_str(),
        "asce7-16-asd" | "asce7-asd"
    )
}

/// One alternative of a term: its label and cases (empty: absent).
type Alt = (String, Vec<usize>);

/// Strength combinations of a named preset for the cases present.
pub fn strength(cases: &[LoadCase], name: &str) -> Result<Preset> {
    if !is_asce(name) {
        return Err(Error::msg(format!(
            "unknown strength preset '{name}': expected asce7-16-asd"
        )));
    }
    let d = cases_of(cases, Category::Dead);
    let other = cases_of(cases, Category::Other);
    let l = cases_of(cases, Category::Live);
    let mut roofs: Vec<Alt> = [
        ("Lr", Category::RoofLive),
        ("S", Category::Snow),
        ("R", Category::Rain),
    ]
    .into_iter()
    .map(|(n, c)| (n.to_string(), cases_of(cases, c)))
    .filter(|(_, v)| !v.is_empty())
    .collect();
    if roofs.is_empty() {
        roofs.push(("Lr or S or R".into(), Vec::new()));
    }
    let wind_cases = cases_of(cases, Category::Wind);
    let mut winds: Vec<Alt> = wind_cases
        .iter()
        .map(|&i| {
            let label = if wind_cases.len() == 1 {
                "W".to_string()
            } else {
                format!("W({})", cases[i].name)
            };
            (label, vec![i])
        })
        .collect();
    if winds.is_empty() {
        winds.push(("W".into(), Vec::new()));
    }
    let dead: Alt = ("D".into(), d.clone());
    let live: Alt = ("L".into(), l.clone());
    let mut out = Preset::default();
    let mut seen: Vec<(Vec<(usize, u64)>, String)> = Vec::new();
    let mut add = |number: &str, parts: &[(f64, &Alt)]| {
        let mut factors: Vec<(usize, f64)> = Vec::new();
        let mut name = Vec::new();
        let mut absent = Vec::new();
        // The dead load's factor, which "other" loads share.
        let fd = parts
            .iter()
            .find(|(_, a)| a.0 == "D")
            .map(|(f, _)| *f)
            .unwrap_or(1.0);
        for (f, (label, idx)) in parts {
            if idx.is_empty() {
                absent.push(label.clone());
                continue;
            }
            name.push(term(*f, label));
            factors.extend(idx.iter().map(|&i| (i, *f)));
        }
        if !other.is_empty() {
            factors.extend(other.iter().map(|&i| (i, fd)));
            name.push(term(fd, "other"));
        }
        let mut key: Vec<(usize, u64)> = factors
            .iter()
            .filter(|(_, f)| *f != 0.0)
            .map(|(i, f)| (*i, f.to_bits()))
            .collect();
        key.sort_unstable();
        let name = name.join("+");
        if key.is_empty() {
            out.notes.push(format!(
                "ASCE 7-16 §2.4.1 combination ({number}) has none of its loads in this job ({}) and is left out",
                absent.join(", ")
            ));
            return;
        }
        if let Some((_, earlier)) = seen.iter().find(|(k, _)| *k == key) {
            out.notes.push(format!(
                "ASCE 7-16 §2.4.1 combination ({number}) equals {earlier} here (the job has no {} case) and is not repeated",
                absent.join(", ")
            ));
            return;
        }
        seen.push((key, format!("({number}) {name}")));
        out.combinations.push(Combination {
            name,
            kind: ComboKind::Strength,
            factors,
            limit: None,
            source: Some(format!(
                "ASCE/SEI 7-16 §2.4.1, combination ({number}){}",
                if absent.is_empty() {
                    String::new()
                } else {
                    format!(", without {} (absent: zero)", absent.join(", "))
                }
            )),
        });
    };
    add("1", &[(1.0, &dead)]);
    add("2", &[(1.0, &dead), (1.0, &live)]);
    for r in &roofs {
        add("3", &[(1.0, &dead), (1.0, r)]);
    }
    for r in &roofs {
        add("4", &[(1.0, &dead), (0.75, &live), (0.75, r)]);
    }
    for w in &winds {
        add("5", &[(1.0, &dead), (0.6, w)]);
    }
    for w in &winds {
        for r in &roofs {
            add("6a", &[(1.0, &dead), (0.75, &live), (0.45, w), (0.75, r)]);
        }
    }
    for w in &winds {
        add("7", &[(0.6, &dead), (0.6, w)]);
    }
    if !other.is_empty() {
        out.notes.push(
            "ASCE 7-16 preset: loads of category \"other\" take the dead load's factor in each combination (1.0, and 0.6 in combination 7), as §2.4.1 treats fluid loads F".into(),
        );
    }
    out.notes.push(
        "ASCE 7-16 preset: seismic combinations (5 and 6b with 0.7E, 8) are not generated: beamsift has no seismic case".into(),
    );
    Ok(out)
}

/// Serviceability combinations of a named preset. The variable load of the
/// member's kind has its own limit; the total-load limit takes every
/// gravity case of the job (dead, live, roof live, snow, rain, other), so a
/// load the preset does not name is never left out (conservative where the
/// standard would take one variable load at a time). Wind deflection is not
/// part of these presets, and a note says so when the job has wind.
pub fn service(cases: &[LoadCase], name: &str) -> Result<Preset> {
    let key = name.trim().to_ascii_lowercase();
    let gravity: Vec<usize> = (0..cases.len())
        .filter(|&i| cases[i].category != Category::Wind)
        .collect();
    let mut out = Preset::default();
    let mut add = |label: String, idx: Vec<usize>, n: f64| {
        out.combinations.push(Combination {
            name: format!("{label} ≤ L/{}", crate::units::fmt_num(n)),
            kind: ComboKind::Service,
            factors: idx.iter().map(|&i| (i, 1.0)).collect(),
            limit: Some(DeflectionLimit {
                ratio: Some(n),
                absolute: None,
            }),
            source: Some("IBC 2018 Table 1604.3 (from memory)".into()),
        });
    };
    let symbol = |c: Category| match c {
        Category::Dead => "D",
        Category::Live => "L",
        Category::RoofLive => "Lr",
        Category::Snow => "S",
        Category::Rain => "R",
        Category::Other => "other",
        Category::Wind => "W",
    };
    let mut present: Vec<Category> = Vec::new();
    for &i in &gravity {
        if !present.contains(&cases[i].category) {
            present.push(cases[i].category);
        }
    }
    let total_name = present
        .iter()
        .map(|c| symbol(*c))
        .collect::<Vec<_>>()
        .join("+");
    let (own, n_own, n_total): (Vec<Category>, f64, f64) = match key.as_str() {
        "floor" => (vec![Category::Live], 360.0, 240.0),
        "roof" => (vec![Category::RoofLive, Category::Snow], 240.0, 180.0),
        _ => {
            return Err(Error::msg(format!(
                "unknown service preset '{name}': expected floor or roof"
            )));
        }
    };
    let mut any = false;
    for c in &own {
        let v = cases_of(cases, *c);
        if !v.is_empty() {
            add(symbol(*c).to_string(), v, n_own);
            any = true;
        }
    }
    if !any {
        return Err(Error::msg(format!(
            "service preset '{name}' found no load case of its category (live for floor; roof_live or snow for roof)"
        )));
    }
    add(total_name, gravity.clone(), n_total);
    let others: Vec<&str> = present
        .iter()
        .filter(|c| !own.contains(c) && **c != Category::Dead)
        .map(|c| symbol(*c))
        .collect();
    if !others.is_empty() {
        out.notes.push(format!(
            "service preset '{key}': {} have no limit of their own in it; they are in the total-load limit L/{}",
            others.join(", "),
            crate::units::fmt_num(n_total)
        ));
    }
    if cases.iter().any(|c| c.category == Category::Wind) {
        out.notes.push(format!(
            "service preset '{key}': deflection under wind is not checked (add a service combination with its limit)"
        ));
    }
    Ok(out)
}

/// Combinations for a beam built from flags or a schedule row: the named
/// presets if given; otherwise D and D + every variable case together
/// (strength, conservative), the variable cases alone at L/`n_live` and
/// the total at L/`n_total` (serviceability; L/360 and L/240 for floors by
/// common practice). Returns the notes of the presets used.
pub fn standard(
    beam: &mut super::model::Beam,
    strength_name: Option<&str>,
    service_name: Option<&str>,
    n_live: f64,
    n_total: f64,
) -> Result<Vec<String>> {
    standard_with(
        beam,
        strength_name,
        service_name,
        (true, true),
        n_live,
        n_total,
    )
}

/// As [`standard`], with the defaults for an absent preset switched on or
/// off: `defaults` = (strength, service) — off where the caller brings its
/// own combinations of that kind.
pub fn standard_with(
    beam: &mut super::model::Beam,
    strength_name: Option<&str>,
    service_name: Option<&str>,
    defaults: (bool, bool),
    n_live: f64,
    n_total: f64,
) -> Result<Vec<String>> {
    let mut notes = Vec::new();
    let dead = cases_of(&beam.cases, Category::Dead);
    let variable: Vec<usize> = (0..beam.cases.len())
        .filter(|&i| beam.cases[i].category != Category::Dead)
        .collect();
    match strength_name {
        Some(p) => {
            let pr = strength(&beam.cases, p)?;
            beam.combinations.extend(pr.combinations);
            notes.extend(pr.notes);
        }
        None if !defaults.0 => {}
        None => {
            let d: Vec<(usize, f64)> = dead.iter().map(|&i| (i, 1.0)).collect();
            beam.combo("D", ComboKind::Strength, &d);
            if !variable.is_empty() {
                let mut f = d.clone();
                f.extend(variable.iter().map(|&v| (v, 1.0)));
                let name = std::iter::once("D".to_string())
                    .chain(variable.iter().map(|&v| beam.cases[v].name.clone()))
                    .collect::<Vec<_>>()
                    .join("+");
                beam.combo(&name, ComboKind::Strength, &f);
            }
        }
    }
    match service_name {
        Some(p) => {
            let pr = service(&beam.cases, p)?;
            beam.combinations.extend(pr.combinations);
            notes.extend(pr.notes);
        }
        None if !defaults.1 => {}
        None => {
            if !variable.is_empty() {
                let names: Vec<String> = variable
                    .iter()
                    .map(|&v| beam.cases[v].name.clone())
                    .collect();
                beam.service(
                    &names.join("+"),
                    &variable.iter().map(|&v| (v, 1.0)).collect::<Vec<_>>(),
                    DeflectionLimit {
                        ratio: Some(n_live),
                        absolute: None,
                    },
                );
            }
            let all: Vec<(usize, f64)> = (0..beam.cases.len()).map(|i| (i, 1.0)).collect();
            beam.service(
                "total",
                &all,
                DeflectionLimit {
                    ratio: Some(n_total),
                    absolute: None,
                },
            );
        }
    }
    Ok(notes)
}
