//! Beam model and analysis: spans, supports, loads by case, combinations;
//! the direct stiffness solution; and the demand (analysed once, checked
//! many times). No I/O.

pub mod analysis;
pub mod demand;
pub mod model;
pub mod presets;
pub mod solve;

pub use demand::{Applied, Demand, Extremes, Quantity, SectionLoad};
pub use model::{
    Beam, Category, Combination, ComboKind, DeflectionLimit, Load, LoadCase, LoadKind, Pattern,
    Stretch, Support,
};
