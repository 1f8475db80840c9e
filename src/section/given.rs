//! A section whose properties come straight from a table row (a supplier's
//! catalogue, a handbook), rather than from dimensions.
//!
//! Required: A and Ix, and enough to place the extreme fibres: either both
//! c_top and c_bot, or the depth d (the section is then taken as
//! symmetric about its mid-depth, c = d/2). Elastic moduli given in the row
//! are used as given (tables round); otherwise S = Ix/c. An I-shape's web
//! (d, tw) enables the average web shear check; flanges (bf, tf) with Iy, J
//! and Cw enable lateral-torsional buckling.

use super::{IGeometry, Properties, positive_value};
use crate::error::{Error, Location, Result};
use crate::units::System;
use serde::{Deserialize, Serialize};

/// Table values of a section, internal units. `None` = not given.
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
pub struct Given {
    pub area: Option<f64>,
    pub ix: Option<f64>,
    pub depth: Option<f64>,
    pub width: Option<f64>,
    pub c_top: Option<f64>,
    pub c_bot: Option<f64>,
    pub s_top: Option<f64>,
    pub s_bot: Option<f64>,
    pub zx: Option<f64>,
    pub iy: Option<f64>,
    pub j: Option<f64>,
    pub cw: Option<f64>,
    pub tw: Option<f64>,
    pub bf: Option<f64>,
    pub tf: Option<f64>,
    pub q_na: Option<f64>,
    pub t_na: Option<f64>,
}

fn opt_positive(name: &str, v: Option<f64>) -> Result<()> {
    match v {
        Some(v) => positive_value(name, v),
        None => Ok(()),
    }
}

/// Relative slack on the bounds below: tables round to three or four
/// significant figures, so a bound is only enforced beyond 2 %.
const BOUND_SLACK: f64 = 0.02;

impl Given {
    /// Bounds every cross-section obeys whatever its shape; a given value
    /// outside them is a wrong unit or a wrong column, never a section.
    ///
    /// - I_x ≤ A·c_top·c_bot: the second moment about the centroid is the
    ///   area times the variance of the fibre position, and a distribution
    ///   on [−c_bot, c_top] with mean zero has variance at most
    ///   c_top·c_bot (the Bhatia–Davis inequality).
    /// - S = I_x/c at each extreme fibre (a definition; tables round).
    /// - S_min ≤ Z_x ≤ A·d/2: the plastic moment is at least the first-yield
    ///   moment, and Z = (A/2)·(ȳ_above + ȳ_below) with both distances
    ///   within the depth.
    /// - Q ≤ A·c_top·c_bot/d: Q is the first moment of the area on either
    ///   side of the neutral axis, at most A_above·c_top and A_below·c_bot.
    /// - I_y ≤ A·(b/2)² for a section symmetric about its vertical axis of
    ///   width b (the same inequality across the width).
    /// - J ≤ I_x + I_y: the torsion constant never exceeds the polar moment
    ///   of area (Saint-Venant).
    /// - t_w, t_f and b_f within the section: t_w ≤ b_f, 2·t_f < d.
    fn physical_bounds(
        &self,
        area: f64,
        ix: f64,
        c_top: f64,
        c_bot: f64,
        depth: f64,
        sys: System,
    ) -> Result<()> {
        use crate::units::Show;
        // Values in the units the row was typed in (`sys`).
        let i4 = |v: f64| Show::SecondMoment.fmt(v, sys);
        let i3 = |v: f64| Show::SectionModulus.fmt(v, sys);
        let len = |v: f64| Show::Dimension.fmt(v, sys);
        let over = |v: f64, bound: f64| v > bound * (1.0 + BOUND_SLACK);
        let hint = "check the column's unit and that the value belongs to this row";
        let cap = area * c_top * c_bot;
        if over(ix, cap) {
            return Err(Error::input(
                Location::field("Ix"),
                format!(
                    "{} exceeds A·c_top·c_bot = {}, which no section can: {hint}",
                    i4(ix),
                    i4(cap)
                ),
            ));
        }
        for (label, s, c) in [("S_top", self.s_top, c_top), ("S_bot", self.s_bot, c_bot)] {
            if let Some(s) = s {
                let def = ix / c;
                if (s - def).abs() > BOUND_SLACK * def {
                    return Err(Error::input(
                        Location::field(label),
                        format!(
                            "{} but Ix/c = {} (c = {} from the centroid to that fibre): expected agreement within 2 %; {hint}",
                            i3(s),
                            i3(def),
                            len(c)
                        ),
                    ));
                }
            }
        }
        if let Some(z) = self.zx {
            let s_min = self
                .s_top
                .unwrap_or(ix / c_top)
                .min(self.s_bot.unwrap_or(ix / c_bot));
            if z < s_min * (1.0 - BOUND_SLACK) {
                return Err(Error::input(
                    Location::field("Zx"),
                    format!(
                        "{} is below the elastic modulus S = {}; the plastic modulus is never smaller: {hint}",
                        i3(z),
                        i3(s_min)
                    ),
                ));
            }
            if over(z, area * depth / 2.0) {
                return Err(Error::input(
                    Location::field("Zx"),
                    format!(
                        "{} exceeds A·d/2 = {}, which no section can: {hint}",
                        i3(z),
                        i3(area * depth / 2.0)
                    ),
                ));
            }
        }
        if let Some(q) = self.q_na {
            let qcap = area * c_top * c_bot / (c_top + c_bot);
            if over(q, qcap) {
                return Err(Error::input(
                    Location::field("Q"),
                    format!(
                        "{} exceeds A·c_top·c_bot/d = {}, which no section can: {hint}",
                        i3(q),
                        i3(qcap)
                    ),
                ));
            }
        }
        if let (Some(iy), Some(b)) = (self.iy, self.width.or(self.bf)) {
            let icap = area * b * b / 4.0;
            if over(iy, icap) {
                return Err(Error::input(
                    Location::field("Iy"),
                    format!(
                        "{} exceeds A·(b/2)² = {} for a width of {}, which no section can: {hint}",
                        i4(iy),
                        i4(icap),
                        len(b)
                    ),
                ));
            }
        }
        if let (Some(j), Some(iy)) = (self.j, self.iy)
            && over(j, ix + iy)
        {
            return Err(Error::input(
                Location::field("J"),
                format!(
                    "{} exceeds the polar moment Ix + Iy = {}, which no section can: {hint}",
                    i4(j),
                    i4(ix + iy)
                ),
            ));
        }
        if let (Some(tw), Some(bf)) = (self.tw, self.bf)
            && tw > bf
        {
            return Err(Error::input(
                Location::field("tw"),
                format!("{} is wider than the flange bf = {}", len(tw), len(bf)),
            ));
        }
        if let Some(tf) = self.tf
            && 2.0 * tf >= depth
        {
            return Err(Error::input(
                Location::field("tf"),
                format!(
                    "two flanges of {} do not fit in the depth d = {}",
                    len(tf),
                    len(depth)
                ),
            ));
        }
        Ok(())
    }

    /// Build the properties, checking every given value (problems in SI).
    pub fn properties(&self) -> Result<Properties> {
        self.properties_in(System::Si)
    }

    /// [`Given::properties`] with the problems in the units of `sys` (the
    /// system the row was typed in).
    pub fn properties_in(&self, sys: System) -> Result<Properties> {
        for (name, v) in [
            ("A", self.area),
            ("Ix", self.ix),
            ("d", self.depth),
            ("b", self.width),
            ("c_top", self.c_top),
            ("c_bot", self.c_bot),
            ("S_top", self.s_top),
            ("S_bot", self.s_bot),
            ("Zx", self.zx),
            ("Iy", self.iy),
            ("J", self.j),
            ("Cw", self.cw),
            ("tw", self.tw),
            ("bf", self.bf),
            ("tf", self.tf),
            ("Q", self.q_na),
            ("t_na", self.t_na),
        ] {
            opt_positive(name, v)?;
        }
        let area = self.area.ok_or_else(|| {
            Error::msg("the area A is required for a section given by its properties")
        })?;
        let ix = self.ix.ok_or_else(|| {
            Error::msg("the second moment Ix is required for a section given by its properties")
        })?;
        let (c_top, c_bot, depth) = match (self.c_top, self.c_bot, self.depth) {
            (Some(t), Some(b), d) => (t, b, d.unwrap_or(t + b)),
            (_, _, Some(d)) => (d / 2.0, d / 2.0, d),
            _ => {
                return Err(Error::msg(
                    "the depth d (or both c_top and c_bot) is required to place the extreme fibres",
                ));
            }
        };
        if (c_top + c_bot - depth).abs() > 0.02 * depth {
            let len = |v: f64| crate::units::Show::Dimension.fmt(v, sys);
            return Err(Error::msg(format!(
                "c_top + c_bot = {} does not match the depth d = {}",
                len(c_top + c_bot),
                len(depth)
            )));
        }
        self.physical_bounds(area, ix, c_top, c_bot, depth, sys)?;
        // bf, tf and tw describe a doubly symmetric I only: a row whose
        // extreme fibres (or moduli) differ is mono-symmetric, and one
        // flange width and thickness cannot say which flange is which, so
        // no plate geometry is assumed (the steel limit states that need
        // it are then not verified, never evaluated as if symmetric).
        let s_top = self.s_top.unwrap_or(ix / c_top);
        let s_bot = self.s_bot.unwrap_or(ix / c_bot);
        let symmetric = (c_top - c_bot).abs() <= 0.005 * depth
            && (s_top - s_bot).abs() <= 0.005 * s_top.max(s_bot);
        let i_geometry = match (self.bf, self.tf, self.tw) {
            (Some(bf), Some(tf), Some(tw)) if symmetric && 2.0 * tf < depth => Some(IGeometry {
                d: depth,
                bf_top: bf,
                tf_top: tf,
                bf_bot: bf,
                tf_bot: tf,
                tw,
                hw: depth - 2.0 * tf,
                h0: depth - tf,
                r: 0.0,
            }),
            _ => None,
        };
        Ok(Properties {
            area,
            depth,
            width: self.width.or(self.bf).unwrap_or(0.0),
            y_c: c_bot,
            ix,
            iy: self.iy,
            c_top,
            c_bot,
            s_top: self.s_top.unwrap_or(ix / c_top),
            s_bot: self.s_bot.unwrap_or(ix / c_bot),
            zx: self.zx,
            rx: (ix / area).sqrt(),
            ry: self.iy.map(|iy| (iy / area).sqrt()),
            q_na: self.q_na,
            t_na: self.t_na,
            j: self.j,
            cw: self.cw,
            web_area: self.tw.map(|tw| depth * tw),
            i_geometry,

            form: super::Form::Given,
            sy: match (self.iy, self.width.or(self.bf)) {
                (Some(iy), Some(b)) => Some(iy / (b / 2.0)),
                _ => None,
            },
            zy: None,
            y_sc: None,
        })
    }
}
