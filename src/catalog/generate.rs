//! Generating catalogues of every combination of given dimensions: welded
//! I-sections from plate widths and thicknesses (with slenderness and
//! proportion rules applied), or timber rectangles from widths × depths ×
//! grades, priced from per-unit rates. Writes our CSV format to any
//! `io::Write`. [`Options`] takes the options as typed (lists, ranges,
//! values with units) and checks them into a [`Spec`].

use crate::error::{Error, Result};
use crate::units::{self, Dim};
use std::io::Write;

/// What to generate.
#[derive(Clone, Debug)]
pub enum Spec {
    /// Welded doubly symmetric I from plate lists (mm).
    WeldedI {
        bf: Vec<f64>,
        tf: Vec<f64>,
        hw: Vec<f64>,
        tw: Vec<f64>,
        /// Largest bf/(2tf) and hw/tw (None = no limit).
        lambda_f: Option<f64>,
        lambda_w: Option<f64>,
        /// Steel density kg/m³ and price per kg.
        density: f64,
        price_per_kg: Option<f64>,
    },
    /// Timber rectangles: widths × depths × (grade, price per m³).
    Rect {
        b: Vec<f64>,
        d: Vec<f64>,
        grades: Vec<(String, Option<f64>)>,
        max_aspect: Option<f64>,
        /// `b` and `d` are nominal sizes, written at their dressed sizes.
        nominal: Option<Nominal>,
    },
}

/// A table of nominal to actual (dressed) timber sizes.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Nominal {
    /// US softwood lumber, American Softwood Lumber Standard PS 20 as
    /// tabulated in the NDS Supplement, Table 1B (from memory): dimension
    /// lumber (nominal thickness 2 to 4 in) dry dressed, 1/2 in less up to
    /// 6 in and 3/4 in less from 8 in; timbers (5 in and thicker) 1/2 in
    /// less each way.
    UsLumber,
}

impl Nominal {
    pub const CHOICES: &[(Self, &str, &str)] = &[(
        Self::UsLumber,
        "us-lumber",
        "US softwood lumber (PS 20): 2x10 is 1.5 x 9.25 in, 6x8 is 5.5 x 7.5 in",
    )];

    /// The dressed (b, d) in inches of a nominal b x d in inches, or why
    /// there is none.
    pub fn dressed(self, b: f64, d: f64) -> std::result::Result<(f64, f64), String> {
        let Nominal::UsLumber = self;
        let whole = |v: f64| (v - v.round()).abs() < 1e-9 && (2.0..=24.0).contains(&v.round());
        if !whole(b) || !whole(d) {
            return Err(format!(
                "{}x{} in is not a nominal lumber size: expected whole inches from 2 to 24",
                units::fmt_num(b),
                units::fmt_num(d)
            ));
        }
        let (b, d) = (b.round(), d.round());
        if b <= 4.0 {
            let dim = |n: f64| if n <= 7.0 { n - 0.5 } else { n - 0.75 };
            Ok((dim(b), dim(d)))
        } else {
            Ok((b - 0.5, d - 0.5))
        }
    }
}

/// Most rows one generation writes (about 1 GB of CSV): a larger grid is
/// almost surely a mistyped range.
pub const MAX_ROWS: u64 = 20_000_000;

fn too_many(planned: u64) -> Error {
    Error::msg(format!(
        "the ranges give {} rows, more than the {} one catalogue may hold (about 1 GB of CSV): narrow the ranges or use coarser steps",
        crate::units::count(planned),
        crate::units::count(MAX_ROWS)
    ))
}

/// Most list combinations looked at before the rules (the count walks them
/// all): beyond this the lists are almost surely mistyped.
pub const MAX_COMBINATIONS: u128 = 1_000_000_000;

/// Visit every row the rules keep, in output order. Welded I rows give
/// (bf, tf, hw, tw) and no grade; rectangles give (b, d) and their grade.
fn each_row(spec: &Spec, mut f: impl FnMut(Row<'_>) -> Result<()>) -> Result<()> {
    match spec {
        Spec::WeldedI {
            bf,
            tf,
            hw,
            tw,
            lambda_f,
            lambda_w,
            ..
        } => {
            for &b in bf {
                for &t in tf {
                    if lambda_f.is_some_and(|l| b / (2.0 * t) > l) {
                        continue;
                    }
                    for &h in hw {
                        if b > h {
                            continue;
                        }
                        for &w in tw {
                            if w > t || lambda_w.is_some_and(|l| h / w > l) || w >= h {
                                continue;
                            }
                            f(Row::WeldedI { b, t, h, w })?;
                        }
                    }
                }
            }
        }
        Spec::Rect {
            b,
            d,
            grades,
            max_aspect,
            nominal,
        } => {
            for (g, rate) in grades {
                for &nb in b {
                    for &nd in d {
                        // Sizes in mm; nominal ones at their dressed size.
                        let (bb, dd, inches) = match nominal {
                            Some(n) => {
                                let (ib, id) = (
                                    (nb / units::MM_PER_IN).round(),
                                    (nd / units::MM_PER_IN).round(),
                                );
                                let (x, y) = n.dressed(ib, id).map_err(Error::msg)?;
                                (
                                    x * units::MM_PER_IN,
                                    y * units::MM_PER_IN,
                                    Some((ib, id, x, y)),
                                )
                            }
                            None => (nb, nd, None),
                        };
                        if max_aspect.is_some_and(|k| dd / bb > k) {
                            continue;
                        }
                        f(Row::Rect {
                            grade: g,
                            rate: *rate,
                            b: bb,
                            d: dd,
                            nominal: inches,
                        })?;
                    }
                }
            }
        }
    }
    Ok(())
}

enum Row<'a> {
    WeldedI {
        b: f64,
        t: f64,
        h: f64,
        w: f64,
    },
    Rect {
        grade: &'a str,
        rate: Option<f64>,
        b: f64,
        d: f64,
        /// Nominal and dressed (b, d), inches, of a nominal size.
        nominal: Option<(f64, f64, f64, f64)>,
    },
}

/// How many rows `generate` would write (the same rules, nothing written).
/// Refused when the lists combine into more than [`MAX_COMBINATIONS`].
pub fn count(spec: &Spec) -> Result<u64> {
    let raw: u128 = match spec {
        Spec::WeldedI { bf, tf, hw, tw, .. } => {
            [bf, tf, hw, tw].iter().map(|v| v.len() as u128).product()
        }
        Spec::Rect { b, d, grades, .. } => (b.len() * d.len()) as u128 * grades.len() as u128,
    };
    if raw > MAX_COMBINATIONS {
        return Err(Error::msg(format!(
            "the lists combine into {} candidates before the rules, more than {}: narrow the ranges or use coarser steps",
            crate::units::count(raw),
            crate::units::count(MAX_COMBINATIONS)
        )));
    }
    let mut n = 0u64;
    each_row(spec, |_| {
        n += 1;
        Ok(())
    })?;
    Ok(n)
}

/// Write the catalogue; returns the number of rows. Rules applied to welded
/// I-shapes (common practice, stated in the header comment): tw ≤ tf, bf ≤
/// hw, and the slenderness limits given. Refused before anything is written
/// when the grid gives more than [`MAX_ROWS`] rows.
pub fn generate<W: Write>(spec: &Spec, currency: &str, out_name: &str, out: &mut W) -> Result<u64> {
    let io = |e: std::io::Error| Error::io(out_name, e);
    let planned = count(spec)?;
    if planned > MAX_ROWS {
        return Err(too_many(planned));
    }
    let (density, price_per_kg, has_cost) = match spec {
        Spec::WeldedI {
            lambda_f,
            lambda_w,
            density,
            price_per_kg,
            ..
        } => {
            writeln!(out, "# Generated by beamsift: every welded I of the given plates with tw <= tf, bf <= hw{}{}.",
                lambda_f.map(|l| format!(", bf/(2tf) <= {l:.2}")).unwrap_or_default(),
                lambda_w.map(|l| format!(", hw/tw <= {l:.2}")).unwrap_or_default()).map_err(io)?;
            writeln!(out, "# Mass from the plate areas at {density} kg/m3 (no weld metal); prices from a rate per kg.").map_err(io)?;
            let cost_col = if price_per_kg.is_some() {
                format!(",cost [{currency}/m]")
            } else {
                String::new()
            };
            writeln!(
                out,
                "name,shape,bf [mm],tf [mm],hw [mm],tw [mm],mass [kg/m]{cost_col}"
            )
            .map_err(io)?;
            (*density, *price_per_kg, price_per_kg.is_some())
        }
        Spec::Rect {
            grades,
            max_aspect,
            nominal,
            ..
        } => {
            writeln!(out, "# Generated by beamsift: every width x depth x grade{}; prices from a rate per m3{}.",
                max_aspect.map(|k| format!(" with d/b <= {k}")).unwrap_or_default(),
                if nominal.is_some() { " of the dressed section" } else { "" }).map_err(io)?;
            if nominal.is_some() {
                writeln!(out, "# Names are nominal sizes; b and d are the dressed sizes of US softwood lumber (PS 20 as tabulated in the NDS Supplement Table 1B, from memory): check them against the supplier's list.").map_err(io)?;
            }
            let has_cost = grades.iter().any(|g| g.1.is_some());
            let cost_col = if has_cost {
                format!(",cost [{currency}/m]")
            } else {
                String::new()
            };
            let unit = if nominal.is_some() { "in" } else { "mm" };
            writeln!(out, "name,shape,grade,b [{unit}],d [{unit}]{cost_col}").map_err(io)?;
            (0.0, None, has_cost)
        }
    };
    let mut n = 0u64;
    let mut buf = Vec::with_capacity(256);
    each_row(spec, |row| {
        buf.clear();
        match row {
            Row::WeldedI { b, t, h, w } => {
                let mass = (2.0 * b * t + h * w) * 1e-6 * density;
                write!(buf, "WI {b}x{t}-{h}x{w},welded-i,{b},{t},{h},{w},{mass:.3}").map_err(io)?;
                if let Some(p) = price_per_kg {
                    write!(buf, ",{:.2}", mass * p).map_err(io)?;
                }
            }
            Row::Rect {
                grade,
                rate,
                b,
                d,
                nominal,
            } => {
                // The name: the sizes written, or the nominal ones.
                let (nb, nd, wb, wd) = nominal.unwrap_or((b, d, b, d));
                if grade.is_empty() {
                    write!(buf, "{nb}x{nd},rect,,{wb},{wd}").map_err(io)?;
                } else {
                    write!(buf, "{nb}x{nd} {grade},rect,{grade},{wb},{wd}").map_err(io)?;
                }
                if has_cost {
                    match rate {
                        Some(r) => write!(buf, ",{:.2}", b * d * 1e-6 * r).map_err(io)?,
                        None => buf.push(b','),
                    }
                }
            }
        }
        buf.push(b'\n');
        out.write_all(&buf).map_err(io)?;
        n += 1;
        Ok(())
    })?;
    out.flush().map_err(io)?;
    Ok(n)
}

/// The default modulus for the slenderness limits (`--E`), as typed.
pub const DEFAULT_E: &str = "200GPa";

/// The default steel density (`--density`), as typed.
pub const DEFAULT_DENSITY: &str = "7850kg/m3";

/// The generation options as a front end gives them: sizes as a list
/// "150,180,200mm" or a range "150..400:10mm", stresses and the density
/// with their units. Each field is the option named in its comment, and in
/// every message about it; [`Options::spec`] checks them all and turns them
/// into a [`Spec`].
#[derive(Clone, Debug)]
pub struct Options {
    /// The family: welded-i or rect.
    pub family: String,
    /// `--bf`, `--tf`, `--hw`, `--tw` (welded-i).
    pub bf: Option<String>,
    pub tf: Option<String>,
    pub hw: Option<String>,
    pub tw: Option<String>,
    /// `--b`, `--d` (rect).
    pub b: Option<String>,
    pub d: Option<String>,
    /// `--grades` (rect): names with an optional price per m³, T1=650,T2=780.
    pub grades: Option<String>,
    /// `--max-aspect` (rect).
    pub max_aspect: Option<f64>,
    /// `--nominal` (rect): `--b` and `--d` are nominal sizes of this table.
    pub nominal: Option<Nominal>,
    /// `--lambda-f`, `--lambda-w` (welded-i; default from `fy`).
    pub lambda_f: Option<f64>,
    pub lambda_w: Option<f64>,
    /// `--Fy`, `--E` (welded-i): for the default compact limits.
    pub fy: Option<String>,
    pub e: String,
    /// `--density`, `--price-per-kg` (welded-i).
    pub density: String,
    pub price_per_kg: Option<f64>,
}

impl Default for Options {
    fn default() -> Self {
        Options {
            family: String::new(),
            bf: None,
            tf: None,
            hw: None,
            tw: None,
            b: None,
            d: None,
            grades: None,
            max_aspect: None,
            nominal: None,
            lambda_f: None,
            lambda_w: None,
            fy: None,
            e: DEFAULT_E.into(),
            density: DEFAULT_DENSITY.into(),
            price_per_kg: None,
        }
    }
}

impl Options {
    /// Check every option and build the spec: options of the other family
    /// are refused (nothing would use them), ratios and prices must be in
    /// range, sizes positive, at most 10 m and given once, grades named
    /// once each.
    pub fn spec(&self) -> Result<Spec> {
        let a = self;
        let family = crate::section::spec::normalise_family(&a.family);
        let foreign: &[(&str, bool)] = match family.as_str() {
            "welded-i" => &[
                ("--b", a.b.is_some()),
                ("--d", a.d.is_some()),
                ("--grades", a.grades.is_some()),
                ("--max-aspect", a.max_aspect.is_some()),
                ("--nominal", a.nominal.is_some()),
            ],
            "rect" => &[
                ("--bf", a.bf.is_some()),
                ("--tf", a.tf.is_some()),
                ("--hw", a.hw.is_some()),
                ("--tw", a.tw.is_some()),
                ("--lambda-f", a.lambda_f.is_some()),
                ("--lambda-w", a.lambda_w.is_some()),
                ("--Fy", a.fy.is_some()),
                ("--E", a.e != DEFAULT_E),
                ("--density", a.density != DEFAULT_DENSITY),
                ("--price-per-kg", a.price_per_kg.is_some()),
            ],
            _ => &[],
        };
        let unused: Vec<&str> = foreign.iter().filter(|f| f.1).map(|f| f.0).collect();
        if !unused.is_empty() {
            return Err(Error::msg(format!(
                "{} {} not apply to the {family} family (nothing would use {})",
                unused.join(", "),
                if unused.len() == 1 { "does" } else { "do" },
                if unused.len() == 1 { "it" } else { "them" }
            )));
        }
        for (name, v) in [
            ("--max-aspect", a.max_aspect),
            ("--lambda-f", a.lambda_f),
            ("--lambda-w", a.lambda_w),
        ] {
            if let Some(v) = v
                && !(v > 0.0 && v <= 1000.0)
            {
                return Err(Error::msg(format!(
                    "{name}: {v} is outside 0 < value ≤ 1000"
                )));
            }
        }
        if let Some(p) = a.price_per_kg
            && !(p > 0.0 && p < 1e6)
        {
            return Err(Error::msg(format!(
                "--price-per-kg: {p} is outside 0 < price < 1,000,000"
            )));
        }
        Ok(match family.as_str() {
            "welded-i" => {
                let e = units::parse(&a.e, Dim::Stress).map_err(|e| e.in_field("--E"))?;
                let fy =
                    a.fy.as_deref()
                        .map(|t| units::parse(t, Dim::Stress).map_err(|e| e.in_field("--Fy")))
                        .transpose()?;
                let (df, dw) = fy
                    .map(|fy| {
                        crate::optimise::compact_slenderness(
                            crate::optimise::Family::WeldedI,
                            e,
                            fy,
                        )
                    })
                    .unwrap_or((None, None));
                Spec::WeldedI {
                    bf: sizes(&a.bf, "bf")?,
                    tf: sizes(&a.tf, "tf")?,
                    hw: sizes(&a.hw, "hw")?,
                    tw: sizes(&a.tw, "tw")?,
                    lambda_f: a.lambda_f.or(df),
                    lambda_w: a.lambda_w.or(dw),
                    density: units::parse(&a.density, Dim::Density)
                        .map_err(|e| e.in_field("--density"))?,
                    price_per_kg: a.price_per_kg,
                }
            }
            "rect" => {
                let grades = match &a.grades {
                    Some(g) => g
                        .split(',')
                        .map(|p| match p.split_once('=') {
                            Some((n, r)) => {
                                units::parse_number(r).map(|r| (n.trim().to_string(), Some(r)))
                            }
                            None => Ok((p.trim().to_string(), None)),
                        })
                        .collect::<Result<Vec<_>>>()
                        .and_then(check_grades)
                        .map_err(|e| e.in_field("--grades"))?,
                    None => vec![(String::new(), None)],
                };
                let (b, d) = (sizes(&a.b, "b")?, sizes(&a.d, "d")?);
                if let Some(n) = a.nominal {
                    // Every nominal size must be in the table before
                    // anything is written.
                    for (list, name) in [(&b, "--b"), (&d, "--d")] {
                        for &v in list {
                            let v = v / units::MM_PER_IN;
                            n.dressed(v, v).map_err(|e| Error::msg(e).in_field(name))?;
                        }
                    }
                }
                Spec::Rect {
                    b,
                    d,
                    grades,
                    max_aspect: a.max_aspect,
                    nominal: a.nominal,
                }
            }
            other => {
                return Err(Error::msg(format!(
                    "catalog generate: '{other}' is not supported: expected welded-i or rect"
                )));
            }
        })
    }
}

/// A list "6,8,10mm" or a range "150..400:10mm".
fn sizes(text: &Option<String>, name: &str) -> Result<Vec<f64>> {
    let t = text
        .as_deref()
        .ok_or_else(|| Error::msg(format!("--{name} is required for this family")))?;
    if let Some((range, step)) = t.split_once(':')
        && let Some((a, b)) = range.split_once("..")
    {
        let unit: String = step
            .trim_start_matches(|c: char| c.is_ascii_digit() || c == '.')
            .to_string();
        let p = |v: &str| {
            let v = v.trim();
            let v = if v.chars().last().is_some_and(|c| c.is_ascii_digit()) {
                format!("{v}{unit}")
            } else {
                v.to_string()
            };
            units::parse(&v, Dim::Length).map_err(|e| e.in_field(&format!("--{name}")))
        };
        let (lo, hi, st) = (p(a)?, p(b)?, p(step)?);
        if !(st > 0.0 && hi >= lo) {
            return Err(Error::msg(format!(
                "--{name}: expected START..END:STEP with END ≥ START and STEP > 0"
            )));
        }
        let n = ((hi - lo) / st + 1e-9).floor();
        if n >= MAX_SIZES as f64 {
            return Err(Error::msg(format!(
                "--{name}: the range gives more than the {} values one list may give: use a coarser step",
                units::count(MAX_SIZES as u64)
            )));
        }
        let v: Vec<f64> = (0..=n as usize).map(|k| lo + k as f64 * st).collect();
        check_sizes(&v, name)?;
        return Ok(v);
    }
    let v = units::parse_list(t, Dim::Length, &format!("--{name}"))?;
    check_sizes(&v, name)?;
    Ok(v)
}

/// Grade names are plain CSV cells, given once each, with positive rates.
fn check_grades(g: Vec<(String, Option<f64>)>) -> Result<Vec<(String, Option<f64>)>> {
    for (k, (name, rate)) in g.iter().enumerate() {
        if name.is_empty() || name.chars().any(|c| c == '"' || c == ';' || c.is_control()) {
            return Err(Error::msg(format!(
                "grade {} '{name}': expected a non-empty name without quotes, semicolons or control characters",
                k + 1
            )));
        }
        if g[..k].iter().any(|o| o.0 == *name) {
            return Err(Error::msg(format!("grade '{name}' is given twice")));
        }
        if let Some(r) = rate
            && !(*r > 0.0 && *r < 1e7)
        {
            return Err(Error::msg(format!(
                "grade '{name}': price {r} per m³ is outside 0 < price < 10,000,000"
            )));
        }
    }
    Ok(g)
}

/// Most values one size list may give.
const MAX_SIZES: usize = 100_000;

fn check_sizes(v: &[f64], name: &str) -> Result<()> {
    if v.len() > MAX_SIZES {
        return Err(Error::msg(format!(
            "--{name}: {} values, more than the {} one list may give: use a coarser step",
            units::count(v.len() as u64),
            units::count(MAX_SIZES as u64)
        )));
    }
    let mut sorted = v.to_vec();
    sorted.sort_by(f64::total_cmp);
    if let Some(w) = sorted.windows(2).find(|w| w[0] == w[1]) {
        return Err(Error::msg(format!(
            "--{name}: {} mm is given twice (the rows would repeat a name)",
            w[0]
        )));
    }
    if let Some(x) = v.iter().find(|x| !(**x > 0.0 && **x <= 10_000.0)) {
        return Err(Error::msg(format!(
            "--{name}: {x} mm is outside 0 < size ≤ 10 m"
        )));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn options_as_typed_become_the_spec() {
        let s = |t: &str| Some(t.to_string());
        let o = Options {
            family: "welded-i".into(),
            bf: s("150..400:50mm"),
            tf: s("8,10mm"),
            hw: s("0.3..0.4:0.1m"),
            tw: s("6mm"),
            fy: s("345MPa"),
            ..Default::default()
        };
        let spec = o.spec().unwrap();
        let Spec::WeldedI { bf, tf, hw, tw, .. } = &spec else {
            panic!("welded-i gives a welded I spec")
        };
        let Spec::WeldedI {
            lambda_f: Some(lambda_f),
            lambda_w: Some(lambda_w),
            density,
            ..
        } = spec.clone()
        else {
            panic!("--Fy gives both slenderness limits")
        };
        // 150 to 400 by 50: six values, both ends included (arithmetic);
        // 1 m = 1000 mm.
        assert_eq!(*bf, vec![150.0, 200.0, 250.0, 300.0, 350.0, 400.0]);
        assert_eq!((tf, tw), (&vec![8.0, 10.0], &vec![6.0]));
        assert_eq!(hw.len(), 2);
        assert!((hw[0] - 300.0).abs() < 1e-9 && (hw[1] - 400.0).abs() < 1e-9);
        // AISC 360-16 Table B4.1b compact limits (from memory): flange
        // 0.38·√(E/Fy), web 3.76·√(E/Fy), at the default E = 200 GPa.
        let r = (200_000.0f64 / 345.0).sqrt();
        assert!((lambda_f - 0.38 * r).abs() < 1e-9);
        assert!((lambda_w - 3.76 * r).abs() < 1e-9);
        assert_eq!(density, 7850.0);
        // A rectangle option is refused for the welded I family.
        let e = Options { b: s("100mm"), ..o }
            .spec()
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("--b does not apply to the welded-i family"),
            "{e}"
        );
    }
}
