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
use crate::error::{Error, Result};
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

impl Given {
    /// Build the properties, checking every given value.
    pub fn properties(&self) -> Result<Properties> {
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
            return Err(Error::msg(format!(
                "c_top + c_bot = {} mm does not match the depth d = {} mm",
                crate::units::fmt_num(c_top + c_bot),
                crate::units::fmt_num(depth)
            )));
        }
        let i_geometry = match (self.bf, self.tf, self.tw) {
            (Some(bf), Some(tf), Some(tw)) if 2.0 * tf < depth => Some(IGeometry {
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
