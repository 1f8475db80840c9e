//! The job's words and values that flags and schedule rows share: deflection
//! limits, bracing, braced flange, load height, material kind, supports.

use crate::beam::model::Support;
use crate::check::{BracedFlange, Bracing, LoadHeight, MaterialKind};
use crate::error::{Error, Result};
use crate::units::{self, Dim};

/// Parse a deflection limit like `L/360`.
pub fn parse_ratio(s: &str) -> Result<f64> {
    let t = s.trim().replace(' ', "");
    let n = t
        .strip_prefix("L/")
        .or_else(|| t.strip_prefix("l/"))
        .and_then(|n| n.parse::<f64>().ok())
        .filter(|n| n.is_finite() && *n > 0.0);
    let n = n.ok_or_else(|| {
        Error::msg(format!(
            "'{s}' is not a deflection limit: expected the form L/360 (and/or an absolute limit with a length unit)"
        ))
    })?;
    if !(RATIO_RANGE.0..=RATIO_RANGE.1).contains(&n) {
        return Err(Error::msg(format!(
            "'{s}' is outside the supported limits L/{} to L/{}: a typing error is likelier than such a limit",
            RATIO_RANGE.0, RATIO_RANGE.1
        )));
    }
    Ok(n)
}

/// Supported n of a deflection limit L/n (L/60 for a lenient cantilever
/// roof to L/10000 for a machine foundation cover the trade's usual range
/// with room to spare; common practice).
pub const RATIO_RANGE: (f64, f64) = (20.0, 20_000.0);

/// Parse a lateral bracing description.
pub fn parse_bracing(s: &str) -> Result<Bracing> {
    match s.trim().to_ascii_lowercase().as_str() {
        "continuous" => Ok(Bracing::Continuous),
        "supports" | "at supports" | "span" => Ok(Bracing::Supports),
        "none" | "not given" => Ok(Bracing::NotGiven),
        _ => units::parse(s, Dim::Length).map(Bracing::Spacing).map_err(|_| {
            Error::msg(format!(
                "'{s}' is not a lateral bracing: expected \"continuous\", \"supports\" or a brace spacing such as \"1.5 m\""
            ))
        }),
    }
}

/// Parse which flange the braces restrain.
pub fn parse_braced_flange(s: &str) -> Result<BracedFlange> {
    match s.trim().to_ascii_lowercase().as_str() {
        "top" => Ok(BracedFlange::Top),
        "both" => Ok(BracedFlange::Both),
        other => Err(Error::msg(format!(
            "unknown braced flange '{other}': expected top (braces restrain the top flange only) or both"
        ))),
    }
}

/// Parse where the loads act.
pub fn parse_load_height(s: &str) -> Result<LoadHeight> {
    match s
        .trim()
        .to_ascii_lowercase()
        .replace([' ', '-'], "_")
        .as_str()
    {
        "shear_centre" | "shear_center" => Ok(LoadHeight::ShearCentre),
        "top_flange" => Ok(LoadHeight::TopFlange),
        other => Err(Error::msg(format!(
            "unknown load height '{other}': expected shear_centre or top_flange"
        ))),
    }
}

/// Parse a material kind.
pub fn parse_kind(s: &str) -> Result<MaterialKind> {
    match s.trim().to_ascii_lowercase().as_str() {
        "steel" => Ok(MaterialKind::Steel),
        "timber" | "wood" => Ok(MaterialKind::Timber),
        "other" | "unspecified" => Ok(MaterialKind::Unspecified),
        other => Err(Error::msg(format!(
            "unknown material kind '{other}': expected steel, timber or other"
        ))),
    }
}

/// Parse a support name.
pub fn parse_support(s: &str) -> Result<Support> {
    match s.trim().to_ascii_lowercase().as_str() {
        "pinned" | "pin" => Ok(Support::Pinned),
        "roller" => Ok(Support::Roller),
        "fixed" => Ok(Support::Fixed),
        "free" | "none" => Ok(Support::Free),
        other => Err(Error::msg(format!(
            "unknown support '{other}': expected pinned, roller, fixed, free or {{ spring = \"5000 kN/m\" }}"
        ))),
    }
}
