//! Cross-sections and their properties.
//!
//! This module owns geometry: from a shape's dimensions (or a catalogue
//! row's given values) to the properties the checks need. It knows nothing
//! of loads, materials' strengths or files.
//!
//! Bending is about the horizontal (x) axis; y is measured up from the
//! bottom fibre. The flexure formula f = M·y/I gives the extreme-fibre
//! stresses f_top = M/S_top and f_bot = M/S_bot with S = I/c.

mod composite;
pub mod given;
pub mod hollow;
pub mod ishape;
pub mod rect;
pub mod spec;

use crate::error::{Error, Result};
use crate::units::{Show, System};
use serde::{Deserialize, Serialize};

pub use given::Given;

/// Geometry of an I-shape's flanges and web, kept for web shear, the
/// slenderness limits and lateral-torsional buckling.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct IGeometry {
    /// Overall depth d.
    pub d: f64,
    pub bf_top: f64,
    pub tf_top: f64,
    pub bf_bot: f64,
    pub tf_bot: f64,
    pub tw: f64,
    /// Clear web depth between flanges (fillets not deducted).
    pub hw: f64,
    /// Distance between flange centroids h0.
    pub h0: f64,
    /// Root fillet radius (0 for welded shapes).
    pub r: f64,
}

/// What kind of cross-section the properties describe, so the checks know
/// which methods apply (and which cannot be evaluated).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize, Default)]
#[serde(tag = "form", rename_all = "snake_case")]
pub enum Form {
    /// Solid rectangle, width b, depth d.
    Rect { b: f64, d: f64 },
    /// Hot-rolled I-shape (doubly symmetric, root fillets).
    RolledI,
    /// Built-up (welded) I-shape, doubly or singly symmetric.
    WeldedI,
    /// Rectangular hollow section: width b, depth h, wall t, outer corner
    /// radius r_out.
    Rhs { b: f64, h: f64, t: f64, r_out: f64 },
    /// Circular hollow section: outside diameter d, wall t.
    Chs { d: f64, t: f64 },
    /// Solid round bar of diameter d.
    Round { d: f64 },
    /// Table values only: the shape is not known (an I-shape's flange and
    /// web sizes may still be given, see `Properties::i_geometry`).
    #[default]
    Given,
}

/// Section properties, all in internal units (mm, mm², mm³, mm⁴, mm⁶).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Properties {
    /// Cross-sectional area A.
    pub area: f64,
    /// Overall depth.
    pub depth: f64,
    /// Overall width.
    pub width: f64,
    /// Height of the elastic neutral axis (centroid) above the bottom fibre.
    pub y_c: f64,
    /// Second moment of area about the horizontal (strong) axis.
    pub ix: f64,
    /// Second moment of area about the vertical (weak) axis, if known.
    pub iy: Option<f64>,
    /// Distance from the neutral axis to the top fibre.
    pub c_top: f64,
    /// Distance from the neutral axis to the bottom fibre.
    pub c_bot: f64,
    /// Elastic section modulus to the top fibre, Ix/c_top.
    pub s_top: f64,
    /// Elastic section modulus to the bottom fibre, Ix/c_bot.
    pub s_bot: f64,
    /// Plastic section modulus about the horizontal axis, if known.
    pub zx: Option<f64>,
    /// Radius of gyration √(Ix/A).
    pub rx: f64,
    /// Radius of gyration √(Iy/A), if Iy is known.
    pub ry: Option<f64>,
    /// First moment of area about the neutral axis of the part above it.
    pub q_na: Option<f64>,
    /// Width of material at the neutral axis (for V·Q/(I·t)).
    pub t_na: Option<f64>,
    /// St Venant torsion constant J.
    pub j: Option<f64>,
    /// Warping constant Cw.
    pub cw: Option<f64>,
    /// Elastic section modulus about the vertical (weak) axis, Iy/(b/2).
    #[serde(default)]
    pub sy: Option<f64>,
    /// Plastic section modulus about the vertical axis.
    #[serde(default)]
    pub zy: Option<f64>,
    /// Height of the shear centre above the bottom fibre (on the vertical
    /// axis of symmetry).
    #[serde(default)]
    pub y_sc: Option<f64>,
    /// Web area d·tw of an I-shape, for the average web shear V/(d·tw).
    pub web_area: Option<f64>,
    /// I-shape geometry, for the slenderness limits and lateral stability.
    pub i_geometry: Option<IGeometry>,
    /// The kind of section.
    #[serde(flatten)]
    pub form: Form,
}

impl Properties {
    /// All zero, no shape: a slot for the catalogue reader to fill in
    /// place, never a section (crate-private for that reason).
    pub(crate) fn unset() -> Properties {
        Properties {
            area: 0.0,
            depth: 0.0,
            width: 0.0,
            y_c: 0.0,
            ix: 0.0,
            iy: None,
            c_top: 0.0,
            c_bot: 0.0,
            s_top: 0.0,
            s_bot: 0.0,
            zx: None,
            rx: 0.0,
            ry: None,
            q_na: None,
            t_na: None,
            j: None,
            cw: None,
            sy: None,
            zy: None,
            y_sc: None,
            web_area: None,
            i_geometry: None,
            form: Form::Given,
        }
    }

    /// Mass per length (kg/m) for a density in kg/m³.
    pub fn mass_per_length(&self, density: f64) -> f64 {
        self.area * 1e-6 * density
    }

    /// Property lines for printing: (label, value in internal units, kind).
    pub fn rows(&self) -> Vec<(&'static str, f64, Show)> {
        let mut v = vec![
            ("Depth d", self.depth, Show::Dimension),
            ("Width b", self.width, Show::Dimension),
            ("Area A", self.area, Show::Area),
            ("Centroid above bottom y_c", self.y_c, Show::Dimension),
            ("Second moment Ix", self.ix, Show::SecondMoment),
        ];
        if let Some(iy) = self.iy {
            v.push(("Second moment Iy", iy, Show::SecondMoment));
        }
        v.push(("Extreme fibre c_top", self.c_top, Show::Dimension));
        v.push(("Extreme fibre c_bot", self.c_bot, Show::Dimension));
        v.push((
            "Elastic modulus S_top = Ix/c_top",
            self.s_top,
            Show::SectionModulus,
        ));
        v.push((
            "Elastic modulus S_bot = Ix/c_bot",
            self.s_bot,
            Show::SectionModulus,
        ));
        if let Some(z) = self.zx {
            v.push(("Plastic modulus Zx", z, Show::SectionModulus));
        }
        v.push(("Radius of gyration rx", self.rx, Show::Dimension));
        if let Some(ry) = self.ry {
            v.push(("Radius of gyration ry", ry, Show::Dimension));
        }
        if let Some(q) = self.q_na {
            v.push(("First moment at NA Q", q, Show::SectionModulus));
        }
        if let Some(t) = self.t_na {
            v.push(("Width at NA t", t, Show::Dimension));
        }
        if let Some(j) = self.j {
            v.push(("Torsion constant J", j, Show::SecondMoment));
        }
        if let Some(cw) = self.cw {
            v.push(("Warping constant Cw", cw, Show::Warping));
        }
        if let Some(sy) = self.sy {
            v.push(("Elastic modulus Sy = Iy/(b/2)", sy, Show::SectionModulus));
        }
        if let Some(zy) = self.zy {
            v.push(("Plastic modulus Zy", zy, Show::SectionModulus));
        }
        if let Some(y) = self.y_sc {
            v.push(("Shear centre above bottom y_sc", y, Show::Dimension));
        }
        v
    }
}

/// A shape defined by its dimensions (internal units, mm).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "shape", rename_all = "snake_case")]
pub enum Shape {
    /// Solid rectangle, width b, depth d.
    Rect { b: f64, d: f64 },
    /// Doubly symmetric welded I (plate girder), no fillets.
    WeldedI { bf: f64, tf: f64, hw: f64, tw: f64 },
    /// Rolled I with root fillets of radius r.
    RolledI {
        d: f64,
        bf: f64,
        tf: f64,
        tw: f64,
        r: f64,
    },
    /// Mono-symmetric welded I: separate top and bottom flanges.
    MonoI {
        bf_top: f64,
        tf_top: f64,
        bf_bot: f64,
        tf_bot: f64,
        hw: f64,
        tw: f64,
    },
    /// Rectangular hollow section, width b, depth h, wall t, outer corner
    /// radius r_out (0 = sharp corners).
    Rhs { b: f64, h: f64, t: f64, r_out: f64 },
    /// Circular hollow section, outside diameter d, wall t.
    Chs { d: f64, t: f64 },
    /// Solid round bar, diameter d.
    Round { d: f64 },
}

/// Supported range of a section dimension: 1 µm to 100 m.
const DIM_RANGE: (f64, f64) = (1e-3, 1e5);

#[inline]
pub(crate) fn positive(name: &str, v: f64, sys: System) -> Result<()> {
    if v >= DIM_RANGE.0 && v <= DIM_RANGE.1 {
        return Ok(());
    }
    not_positive(name, v, sys)
}

/// The problem of a dimension `positive` refuses (off the per-row path).
#[cold]
#[inline(never)]
fn not_positive(name: &str, v: f64, sys: System) -> Result<()> {
    if v.is_finite() && v > 0.0 && !(DIM_RANGE.0..=DIM_RANGE.1).contains(&v) {
        return Err(Error::msg(format!(
            "{name} = {} is outside the supported range of section dimensions (0.001 mm to 100 m)",
            len(v, sys)
        ))
        .in_field(name));
    }
    if !v.is_finite() || v <= 0.0 {
        return Err(Error::msg(format!(
            "{name} = {} is not valid: expected a finite dimension greater than zero",
            shown(v, sys)
        ))
        .in_field(name));
    }
    Ok(())
}

/// A property value (area, second moment, ...): finite and above zero.
pub(crate) fn positive_value(name: &str, v: f64) -> Result<()> {
    if !v.is_finite() || v <= 0.0 {
        return Err(Error::msg(format!(
            "{name} = {} is not valid: expected a finite value greater than zero",
            crate::units::fmt_num(v)
        ))
        .in_field(name));
    }
    Ok(())
}

pub(crate) fn non_negative(name: &str, v: f64, sys: System) -> Result<()> {
    if !v.is_finite() || v < 0.0 {
        return Err(Error::msg(format!(
            "{name} = {} is not valid: expected a finite dimension of zero or more",
            shown(v, sys)
        ))
        .in_field(name));
    }
    Ok(())
}

/// A value that may not be a length (NaN, infinite) in words.
fn shown(v: f64, sys: System) -> String {
    if v.is_finite() {
        len(v, sys)
    } else {
        crate::units::fmt_num(v)
    }
}

/// A length (mm) in words, in the units of `sys`.
pub(crate) fn len(v: f64, sys: System) -> String {
    crate::units::Show::Dimension.fmt(v, sys)
}

impl Shape {
    /// Short family name, as used in catalogue files and on the command line.
    pub fn family(&self) -> &'static str {
        match self {
            Shape::Rect { .. } => "rect",
            Shape::WeldedI { .. } => "welded-i",
            Shape::RolledI { .. } => "rolled-i",
            Shape::MonoI { .. } => "mono-i",
            Shape::Rhs { .. } => "rhs",
            Shape::Chs { .. } => "chs",
            Shape::Round { .. } => "round",
        }
    }

    /// Check the dimensions are physically possible.
    pub fn validate(&self) -> Result<()> {
        self.validate_in(System::Si)
    }

    /// [`Shape::validate`], with the lengths of its messages in the units
    /// of `sys` (those the user typed).
    pub fn validate_in(&self, sys: System) -> Result<()> {
        match *self {
            Shape::Rect { b, d } => rect::validate(b, d, sys),
            Shape::WeldedI { bf, tf, hw, tw } => ishape::validate_welded(bf, tf, hw, tw, sys),
            Shape::RolledI { d, bf, tf, tw, r } => ishape::validate_rolled(d, bf, tf, tw, r, sys),
            Shape::MonoI {
                bf_top,
                tf_top,
                bf_bot,
                tf_bot,
                hw,
                tw,
            } => ishape::validate_mono(bf_top, tf_top, bf_bot, tf_bot, hw, tw, sys),
            Shape::Rhs { b, h, t, r_out } => hollow::validate_rhs(b, h, t, r_out, sys),
            Shape::Chs { d, t } => hollow::validate_chs(d, t, sys),
            Shape::Round { d } => positive("d", d, sys),
        }
    }

    /// Properties of a valid shape (call `validate` first; `properties`
    /// validates too and returns the error).
    pub fn properties(&self) -> Result<Properties> {
        self.validate()?;
        Ok(self.properties_of_valid())
    }

    /// Properties of a shape already validated (the catalogue path
    /// validates once, while building the shape).
    pub(crate) fn properties_of_valid(&self) -> Properties {
        let mut p = self.properties_unformed();
        p.form = self.form();
        p
    }

    /// The form of this shape.
    pub fn form(&self) -> Form {
        match *self {
            Shape::Rect { b, d } => Form::Rect { b, d },
            Shape::WeldedI { .. } | Shape::MonoI { .. } => Form::WeldedI,
            Shape::RolledI { .. } => Form::RolledI,
            Shape::Rhs { b, h, t, r_out } => Form::Rhs { b, h, t, r_out },
            Shape::Chs { d, t } => Form::Chs { d, t },
            Shape::Round { d } => Form::Round { d },
        }
    }

    fn properties_unformed(&self) -> Properties {
        match *self {
            Shape::Rect { b, d } => rect::properties(b, d),
            Shape::WeldedI { bf, tf, hw, tw } => ishape::properties_welded(bf, tf, hw, tw),
            Shape::RolledI { d, bf, tf, tw, r } => {
                ishape::properties_mono(bf, tf, bf, tf, d - 2.0 * tf, tw, r)
            }
            Shape::MonoI {
                bf_top,
                tf_top,
                bf_bot,
                tf_bot,
                hw,
                tw,
            } => ishape::properties_mono(bf_top, tf_top, bf_bot, tf_bot, hw, tw, 0.0),
            Shape::Rhs { b, h, t, r_out } => hollow::properties_rhs(b, h, t, r_out),
            Shape::Chs { d, t } => hollow::properties_chs(d, t),
            Shape::Round { d } => hollow::properties_chs(d, d / 2.0),
        }
    }

    /// Width of material at height y above the bottom fibre (for checks that
    /// integrate over the section).
    pub fn width_at(&self, y: f64) -> f64 {
        match *self {
            Shape::Chs { d, t } => hollow::circle_width(d, y) - hollow::circle_width_inner(d, t, y),
            Shape::Round { d } => hollow::circle_width(d, y),
            _ => self.composite().map(|c| c.width_at(y)).unwrap_or(0.0),
        }
    }

    fn composite(&self) -> Option<composite::Composite> {
        match *self {
            Shape::Rect { b, d } => Some(rect::composite(b, d)),
            Shape::WeldedI { bf, tf, hw, tw } => {
                Some(ishape::composite(bf, tf, bf, tf, hw, tw, 0.0))
            }
            Shape::RolledI { d, bf, tf, tw, r } => {
                Some(ishape::composite(bf, tf, bf, tf, d - 2.0 * tf, tw, r))
            }
            Shape::MonoI {
                bf_top,
                tf_top,
                bf_bot,
                tf_bot,
                hw,
                tw,
            } => Some(ishape::composite(
                bf_top, tf_top, bf_bot, tf_bot, hw, tw, 0.0,
            )),
            Shape::Rhs { b, h, t, r_out } => Some(hollow::composite_rhs(b, h, t, r_out)),
            Shape::Chs { .. } | Shape::Round { .. } => None,
        }
    }

    /// Overall depth.
    pub fn depth(&self) -> f64 {
        match *self {
            Shape::Rect { d, .. } => d,
            Shape::WeldedI { tf, hw, .. } => hw + 2.0 * tf,
            Shape::RolledI { d, .. } => d,
            Shape::MonoI {
                tf_top, tf_bot, hw, ..
            } => tf_top + hw + tf_bot,
            Shape::Rhs { h, .. } => h,
            Shape::Chs { d, .. } | Shape::Round { d } => d,
        }
    }

    /// The dimensions as (name, value) for printing.
    pub fn dimensions(&self) -> Vec<(&'static str, f64)> {
        match *self {
            Shape::Rect { b, d } => vec![("b", b), ("d", d)],
            Shape::WeldedI { bf, tf, hw, tw } => {
                vec![("bf", bf), ("tf", tf), ("hw", hw), ("tw", tw)]
            }
            Shape::RolledI { d, bf, tf, tw, r } => {
                vec![("d", d), ("bf", bf), ("tf", tf), ("tw", tw), ("r", r)]
            }
            Shape::MonoI {
                bf_top,
                tf_top,
                bf_bot,
                tf_bot,
                hw,
                tw,
            } => vec![
                ("bf_top", bf_top),
                ("tf_top", tf_top),
                ("bf_bot", bf_bot),
                ("tf_bot", tf_bot),
                ("hw", hw),
                ("tw", tw),
            ],
            Shape::Rhs { b, h, t, r_out } => vec![("b", b), ("h", h), ("t", t), ("r_out", r_out)],
            Shape::Chs { d, t } => vec![("d", d), ("t", t)],
            Shape::Round { d } => vec![("d", d)],
        }
    }

    /// A one-line description, e.g. `welded-i bf 300 × tf 20, hw 800 × tw 10 mm`.
    pub fn describe(&self, sys: System) -> String {
        let dims = self
            .dimensions()
            .iter()
            .map(|(n, v)| format!("{n} {}", Show::Dimension.num(*v, sys)))
            .collect::<Vec<_>>()
            .join(", ");
        format!("{} ({dims} {})", self.family(), Show::Dimension.label(sys))
    }
}

/// Assemble properties from the integrated values of a composite section.
pub(crate) fn from_composite(
    c: &composite::Composite,
    depth: f64,
    width: f64,
    j: Option<f64>,
    cw: Option<f64>,
    i_geometry: Option<IGeometry>,
) -> Properties {
    let int = c.integrate();
    let total_m = c.below(depth).1;
    let q = c.q_above(int.y_c, int.area, total_m);
    let (z, _) = c.plastic(depth, int.area);
    let c_top = depth - int.y_c;
    let c_bot = int.y_c;
    Properties {
        area: int.area,
        depth,
        width,
        y_c: int.y_c,
        ix: int.ix,
        iy: Some(int.iy),
        c_top,
        c_bot,
        s_top: int.ix / c_top,
        s_bot: int.ix / c_bot,
        zx: Some(z),
        rx: (int.ix / int.area).sqrt(),
        ry: Some((int.iy / int.area).sqrt()),
        q_na: Some(q),
        t_na: Some(c.width_at(int.y_c)),
        j,
        cw,
        web_area: i_geometry.map(|g| g.d * g.tw),
        i_geometry,
        form: Form::Given,
        sy: (width > 0.0).then(|| int.iy / (width / 2.0)),
        zy: None,
        y_sc: None,
    }
}
