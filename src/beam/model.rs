//! The beam model: spans, supports, loads by case, combinations.
//!
//! Internal units (N, mm, N/mm, N·mm). Positions `x` are measured from the
//! left end of the whole beam. Sign conventions: forces and distributed
//! loads are positive downward (gravity); an applied moment is positive
//! clockwise; internal moment is positive sagging (tension in the bottom
//! fibre); deflection is positive downward.

use crate::error::{Error, Result};
use serde::{Deserialize, Serialize};

/// A support at a node between spans (or at an end).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Support {
    /// Prevents vertical movement, free to rotate.
    Pinned,
    /// As pinned for a beam in bending (free to slide along its axis).
    Roller,
    /// Prevents vertical movement and rotation.
    Fixed,
    /// No support (an overhang's tip, or an interior point of a longer span).
    Free,
    /// Vertical spring of stiffness k (N/mm), free to rotate.
    Spring(f64),
}

impl Support {
    pub fn restrains_vertical(&self) -> bool {
        !matches!(self, Support::Free)
    }
    pub fn name(&self) -> String {
        match self {
            Support::Pinned => "pinned".into(),
            Support::Roller => "roller".into(),
            Support::Fixed => "fixed".into(),
            Support::Free => "free".into(),
            Support::Spring(k) => format!("spring {} kN/m", crate::units::fmt_num(*k)),
        }
    }
}

/// Load case categories (they decide presets and pattern loading).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Category {
    Dead,
    Live,
    RoofLive,
    Snow,
    Rain,
    Wind,
    Other,
}

impl Category {
    pub fn parse(s: &str) -> Result<Category> {
        Ok(
            match s
                .trim()
                .to_ascii_lowercase()
                .replace(['-', ' '], "_")
                .as_str()
            {
                "dead" | "d" => Category::Dead,
                "live" | "l" => Category::Live,
                "roof_live" | "lr" => Category::RoofLive,
                "snow" | "s" => Category::Snow,
                "rain" | "r" => Category::Rain,
                "wind" | "w" => Category::Wind,
                "other" => Category::Other,
                other => {
                    return Err(Error::msg(format!(
                        "unknown load category '{other}': expected dead, live, roof_live, snow, rain, wind or other"
                    )));
                }
            },
        )
    }
    pub fn name(self) -> &'static str {
        match self {
            Category::Dead => "dead",
            Category::Live => "live",
            Category::RoofLive => "roof_live",
            Category::Snow => "snow",
            Category::Rain => "rain",
            Category::Wind => "wind",
            Category::Other => "other",
        }
    }
    /// Live-type loads may occupy any subset of spans (pattern loading).
    pub fn patterns_by_default(self) -> Pattern {
        match self {
            Category::Live | Category::RoofLive => Pattern::Skip,
            _ => Pattern::None,
        }
    }
}

/// How a case's loads are arranged over the spans.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Pattern {
    /// As given, on every span together.
    #[default]
    None,
    /// Skip loading: on each span present or absent, whichever is worse at
    /// every station (live load, ASCE 7-16 §4.3.3 partial loading).
    Skip,
    /// Partial loading: on each span full or half, whichever is worse (the
    /// balanced snow load on continuous beams, ASCE 7-16 §7.5, from memory).
    Partial,
}

impl Pattern {
    pub fn is_on(self) -> bool {
        self != Pattern::None
    }
    pub fn words(self) -> &'static str {
        match self {
            Pattern::None => "",
            Pattern::Skip => "patterned by span: on or off",
            Pattern::Partial => "patterned by span: full or half",
        }
    }
}

/// A named load case.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct LoadCase {
    pub name: String,
    pub category: Category,
    /// Arrangement over the spans (pattern loading).
    pub pattern: Pattern,
}

/// A load of one case.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "snake_case")]
pub enum LoadKind {
    /// Linearly varying line load from `w1` at `x1` to `w2` at `x2`
    /// (a uniform load has w1 = w2).
    Distributed { x1: f64, x2: f64, w1: f64, w2: f64 },
    /// Point force `p` at `x`.
    Point { x: f64, p: f64 },
    /// Point moment `m` (clockwise positive) at `x`.
    Moment { x: f64, m: f64 },
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Load {
    /// Index into `Beam::cases`.
    pub case: usize,
    pub kind: LoadKind,
    /// Where the load came from (for error messages), e.g. "load 3".
    #[serde(skip)]
    pub label: String,
    /// For a distributed load given as pressure × tributary width: (pressure
    /// N/mm², width mm), so span tables can vary the spacing.
    #[serde(default)]
    pub tributary: Option<(f64, f64)>,
}

/// Deflection limit of a serviceability combination.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct DeflectionLimit {
    /// n in L/n.
    pub ratio: Option<f64>,
    /// Absolute limit, mm.
    pub absolute: Option<f64>,
}

/// Strength combinations check stresses and stability; serviceability
/// combinations check deflection.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ComboKind {
    Strength,
    Service,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Combination {
    pub name: String,
    pub kind: ComboKind,
    /// (case index, factor).
    pub factors: Vec<(usize, f64)>,
    pub limit: Option<DeflectionLimit>,
    /// Where the combination comes from (a preset's standard and number).
    #[serde(default)]
    pub source: Option<String>,
}

/// A prismatic beam in a line of segments.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Beam {
    /// Segment lengths, left to right (overhangs included).
    pub spans: Vec<f64>,
    /// One support per node: `spans.len() + 1` of them.
    pub supports: Vec<Support>,
    pub cases: Vec<LoadCase>,
    pub loads: Vec<Load>,
    pub combinations: Vec<Combination>,
    /// Which case receives the section's self-weight (None = no self-weight).
    pub self_weight_case: Option<usize>,
    /// For a cantilever the deflection limit L/n is applied with L taken as
    /// this multiple of the overhang (2 by common practice).
    pub cantilever_factor: f64,
}

/// The parts of the beam a deflection limit applies to: stretches between
/// consecutive supported nodes (spans), and free-ended overhangs.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Stretch {
    pub x1: f64,
    pub x2: f64,
    /// True for an overhang (one end free).
    pub cantilever: bool,
    /// Supported node index at the left (span) or the supported end (overhang).
    pub left_node: Option<usize>,
    pub right_node: Option<usize>,
    pub label: String,
}

impl Beam {
    /// x of each node.
    pub fn node_x(&self) -> Vec<f64> {
        let mut x = Vec::with_capacity(self.spans.len() + 1);
        let mut acc = 0.0;
        x.push(0.0);
        for s in &self.spans {
            acc += s;
            x.push(acc);
        }
        x
    }

    pub fn length(&self) -> f64 {
        self.spans.iter().sum()
    }

    /// Spans and overhangs for deflection limits and pattern loading.
    pub fn stretches(&self) -> Vec<Stretch> {
        let xs = self.node_x();
        let sup: Vec<usize> = (0..self.supports.len())
            .filter(|&i| self.supports[i].restrains_vertical())
            .collect();
        let mut out = Vec::new();
        let n = self.supports.len() - 1;
        if let (Some(&first), Some(&last)) = (sup.first(), sup.last()) {
            if first > 0 {
                out.push(Stretch {
                    x1: 0.0,
                    x2: xs[first],
                    cantilever: true,
                    left_node: None,
                    right_node: Some(first),
                    label: "left overhang".into(),
                });
            }
            for (k, w) in (1..).zip(sup.windows(2)) {
                out.push(Stretch {
                    x1: xs[w[0]],
                    x2: xs[w[1]],
                    cantilever: false,
                    left_node: Some(w[0]),
                    right_node: Some(w[1]),
                    label: format!("span {k}"),
                });
            }
            if last < n {
                out.push(Stretch {
                    x1: xs[last],
                    x2: xs[n],
                    cantilever: true,
                    left_node: Some(last),
                    right_node: None,
                    label: "right overhang".into(),
                });
            }
        }
        out
    }

    /// Check the model is complete and stable; returns the first problem.
    pub fn validate(&self) -> Result<()> {
        if self.spans.is_empty() {
            return Err(Error::msg(
                "the beam has no spans: expected at least one span length",
            ));
        }
        for (i, s) in self.spans.iter().enumerate() {
            if !s.is_finite() || *s <= 0.0 {
                return Err(Error::msg(format!(
                    "span {} has length {} mm: expected a length greater than zero",
                    i + 1,
                    crate::units::fmt_num(*s)
                ))
                .in_field("spans"));
            }
        }
        if self.supports.len() != self.spans.len() + 1 {
            return Err(Error::msg(format!(
                "{} span(s) need {} supports (one at each end of every span, 'free' where there is none), but {} were given",
                self.spans.len(),
                self.spans.len() + 1,
                self.supports.len()
            ))
            .in_field("supports"));
        }
        let length = self.length();
        if !(1.0..=1e6).contains(&length) {
            return Err(Error::msg(format!(
                "the beam is {} mm long: supported range is 1 mm to 1 km",
                crate::units::fmt_num(length)
            )));
        }
        for s in &self.supports {
            if let Support::Spring(k) = s
                && (!k.is_finite() || *k <= 0.0)
            {
                return Err(Error::msg(format!(
                    "spring stiffness {} is not valid: expected a finite stiffness greater than zero",
                    crate::units::fmt_num(*k)
                ))
                .in_field("supports"));
            }
        }
        self.check_stability()?;
        let tol = 1e-9 * length;
        for l in &self.loads {
            let bad = |msg: String| Error::msg(msg).in_field(&l.label);
            // Supported magnitudes: 10⁹ kN/m, 10⁹ kN, 10⁹ kN·m — far beyond
            // any beam, but keeping every product finite.
            let (mag, limit, what) = match l.kind {
                LoadKind::Distributed { w1, w2, .. } => (w1.abs().max(w2.abs()), 1e9, "10⁹ kN/m"),
                LoadKind::Point { p, .. } => (p.abs(), 1e12, "10⁹ kN"),
                LoadKind::Moment { m, .. } => (m.abs(), 1e15, "10⁹ kN·m"),
            };
            if mag > limit {
                return Err(bad(format!(
                    "the load is outside the supported range (up to {what})"
                )));
            }
            if l.case >= self.cases.len() {
                return Err(Error::Internal(format!("{} names a missing case", l.label)));
            }
            match l.kind {
                LoadKind::Distributed { x1, x2, w1, w2 } => {
                    if !(x1.is_finite() && x2.is_finite() && w1.is_finite() && w2.is_finite()) {
                        return Err(bad("the load has a non-finite value".into()));
                    }
                    if x2 <= x1 {
                        return Err(bad(format!(
                            "the load ends (x = {} m) at or before it starts (x = {} m): expected the end after the start",
                            crate::units::fmt_num(x2 / 1000.0),
                            crate::units::fmt_num(x1 / 1000.0)
                        )));
                    }
                    if x1 < -tol || x2 > length + tol {
                        let (x, end) = if x1 < -tol { (x1, 0.0) } else { (x2, length) };
                        let (shown, _) = metres_apart(x, end);
                        let (other, l) = if x1 < -tol {
                            (metres_apart(x2, x2).0, metres_apart(length, length).0)
                        } else {
                            (metres_apart(x1, x1).0, metres_apart(length, x2).0)
                        };
                        let (from, to) = if x1 < -tol {
                            (shown, other)
                        } else {
                            (other, shown)
                        };
                        return Err(bad(format!(
                            "the load from x = {from} m to {to} m is not on the beam, which runs from 0 to {l} m"
                        )));
                    }
                }
                LoadKind::Point { x, p: v } | LoadKind::Moment { x, m: v } => {
                    if !x.is_finite() || !v.is_finite() {
                        return Err(bad("the load has a non-finite value".into()));
                    }
                    if x < -tol || x > length + tol {
                        let end = if x < 0.0 { 0.0 } else { length };
                        let (shown, _) = metres_apart(x, end);
                        let l = metres_apart(length, x).0;
                        return Err(bad(format!(
                            "the load at x = {shown} m is not on the beam, which runs from 0 to {l} m"
                        )));
                    }
                }
            }
        }
        for c in &self.combinations {
            for (case, f) in &c.factors {
                if *case >= self.cases.len() {
                    return Err(Error::Internal(format!(
                        "combination '{}' names a missing case",
                        c.name
                    )));
                }
                if !(f.is_finite() && f.abs() <= MAX_FACTOR) {
                    return Err(Error::msg(format!(
                        "combination '{}' gives case '{}' the factor {}: expected a factor between −{MAX_FACTOR} and {MAX_FACTOR}",
                        c.name,
                        self.cases[*case].name,
                        crate::units::fmt_num(*f)
                    )));
                }
            }
            if c.kind == ComboKind::Strength && c.limit.is_some() {
                return Err(Error::msg(format!(
                    "strength combination '{}' has a deflection limit, which only serviceability combinations check: give it kind = \"service\", or add a separate service combination",
                    c.name
                )));
            }
            if c.kind == ComboKind::Service && c.limit.is_none() {
                return Err(Error::msg(format!(
                    "serviceability combination '{}' has no deflection limit: expected limit = \"L/360\" and/or max = \"20 mm\"",
                    c.name
                )));
            }
        }
        // Every case that carries loads is in some strength combination:
        // otherwise its loads would be shown and never checked.
        for (i, case) in self.cases.iter().enumerate() {
            let loaded = self.loads.iter().any(|l| l.case == i) || self.self_weight_case == Some(i);
            let used = self.combinations.iter().any(|c| {
                c.kind == ComboKind::Strength && c.factors.iter().any(|(k, f)| *k == i && *f != 0.0)
            });
            if loaded
                && !used
                && self
                    .combinations
                    .iter()
                    .any(|c| c.kind == ComboKind::Strength)
            {
                return Err(Error::msg(format!(
                    "load case '{}' carries loads but no strength combination includes it, so they would never be checked: add it to a combination (or use [presets] strength = \"asce7-16-asd\"), or remove its loads",
                    case.name
                )));
            }
        }
        if !(self.cantilever_factor.is_finite() && self.cantilever_factor > 0.0) {
            return Err(Error::msg(
                "the cantilever factor must be greater than zero",
            ));
        }
        Ok(())
    }

    /// Positions in metres with enough decimals that `x` reads differently
    /// from the end `end` it passes (6.0000001 m against 6 m), and `y` and
    /// the length with the same decimals.
    /// A straight prismatic beam is stable when a fixed support or at least
    /// two vertical restraints remove both rigid-body motions.
    fn check_stability(&self) -> Result<()> {
        let fixed = self.supports.iter().any(|s| matches!(s, Support::Fixed));
        let restraints: Vec<usize> = (0..self.supports.len())
            .filter(|&i| self.supports[i].restrains_vertical())
            .collect();
        if fixed || restraints.len() >= 2 {
            return Ok(());
        }
        let xs = self.node_x();
        let msg = match restraints.as_slice() {
            [] => {
                "the supports form a mechanism: nothing holds the beam up (every support is 'free')"
                    .to_string()
            }
            [i] => format!(
                "the supports form a mechanism: the beam can rotate about its only support ({} at x = {} m); a cantilever needs a fixed end, a span needs two supports",
                self.supports[*i].name(),
                crate::units::fmt_num(xs[*i] / 1000.0)
            ),
            _ => unreachable!(),
        };
        Err(Error::msg(msg).in_field("supports"))
    }
}

/// Builder-style helpers for code and tests.
impl Beam {
    /// The same beam with every length (spans, load positions) multiplied
    /// by `factor`; load intensities are unchanged. Used by span sweeps.
    pub fn scaled(&self, factor: f64) -> Beam {
        let mut b = self.clone();
        for s in b.spans.iter_mut() {
            *s *= factor;
        }
        for l in b.loads.iter_mut() {
            match &mut l.kind {
                LoadKind::Distributed { x1, x2, .. } => {
                    *x1 *= factor;
                    *x2 *= factor;
                }
                LoadKind::Point { x, .. } | LoadKind::Moment { x, .. } => *x *= factor,
            }
        }
        b
    }

    /// The same beam with every area load's tributary width set to `width`.
    /// Returns None when the beam has no area loads.
    pub fn with_spacing(&self, width: f64) -> Option<Beam> {
        let mut b = self.clone();
        let mut any = false;
        for l in b.loads.iter_mut() {
            if let (Some((p, w)), LoadKind::Distributed { w1, w2, .. }) =
                (l.tributary.as_mut(), &mut l.kind)
            {
                *w = width;
                *w1 = *p * width;
                *w2 = *p * width;
                any = true;
            }
        }
        any.then_some(b)
    }

    /// The same beam with every live area load's pressure set to `pressure`.
    pub fn with_live_pressure(&self, pressure: f64) -> Option<Beam> {
        let mut b = self.clone();
        let mut any = false;
        for l in b.loads.iter_mut() {
            if b.cases[l.case].category != Category::Live {
                continue;
            }
            if let (Some((p, w)), LoadKind::Distributed { w1, w2, .. }) =
                (l.tributary.as_mut(), &mut l.kind)
            {
                *p = pressure;
                *w1 = pressure * *w;
                *w2 = pressure * *w;
                any = true;
            }
        }
        any.then_some(b)
    }

    /// A beam with no loads yet; the cantilever factor is 2 (common practice).
    pub fn new(spans: Vec<f64>, supports: Vec<Support>) -> Beam {
        Beam {
            spans,
            supports,
            cases: Vec::new(),
            loads: Vec::new(),
            combinations: Vec::new(),
            self_weight_case: None,
            cantilever_factor: 2.0,
        }
    }

    /// Add a load case; returns its index. Pattern loading is on for
    /// live-type categories.
    pub fn case(&mut self, name: &str, category: Category) -> usize {
        self.cases.push(LoadCase {
            name: name.to_string(),
            category,
            pattern: category.patterns_by_default(),
        });
        self.cases.len() - 1
    }

    pub fn load(&mut self, case: usize, kind: LoadKind) -> &mut Self {
        let label = format!("load {}", self.loads.len() + 1);
        self.loads.push(Load {
            case,
            kind,
            label,
            tributary: None,
        });
        self
    }

    /// A uniform load over the whole beam.
    pub fn udl(&mut self, case: usize, w: f64) -> &mut Self {
        let l = self.length();
        self.load(
            case,
            LoadKind::Distributed {
                x1: 0.0,
                x2: l,
                w1: w,
                w2: w,
            },
        )
    }

    pub fn combo(&mut self, name: &str, kind: ComboKind, factors: &[(usize, f64)]) -> &mut Self {
        self.combinations.push(Combination {
            name: name.to_string(),
            kind,
            factors: factors.to_vec(),
            limit: None,
            source: None,
        });
        self
    }

    pub fn service(
        &mut self,
        name: &str,
        factors: &[(usize, f64)],
        limit: DeflectionLimit,
    ) -> &mut Self {
        self.combinations.push(Combination {
            name: name.to_string(),
            kind: ComboKind::Service,
            factors: factors.to_vec(),
            limit: Some(limit),
            source: None,
        });
        self
    }
}

/// Largest |factor| a combination may give a case (a documented range that
/// keeps every product finite).
pub const MAX_FACTOR: f64 = 100.0;

/// Two positions (mm) in metres, with the fewest decimals (engineering
/// format, or more up to 0.001 mm) that show them apart: a load at
/// 6.0000001 m on a 6 m beam reads "6.0000001", not "6".
fn metres_apart(x: f64, other: f64) -> (String, String) {
    let (a, b) = (
        crate::units::fmt_num(x / 1000.0),
        crate::units::fmt_num(other / 1000.0),
    );
    if a != b || x == other {
        return (a, b);
    }
    for d in 4..=10usize {
        let (a, b) = (
            format!("{:.d$}", x / 1000.0),
            format!("{:.d$}", other / 1000.0),
        );
        if a != b {
            let trim = |t: String| {
                if t.contains('.') {
                    t.trim_end_matches('0').trim_end_matches('.').to_string()
                } else {
                    t
                }
            };
            return (trim(a), trim(b));
        }
    }
    (a, b)
}
