//! Checks of one section against a prepared demand, and the verdict.
//!
//! Every check line is demand against capacity at a stated place and
//! combination:
//!
//! * Bending stress at the top and bottom fibres, sagging and hogging:
//!   f = M·c/I = M/S (flexure formula) against the allowable bending
//!   stress F_b the user gives (for timber, the adjusted F_b′ of [`timber`]).
//! * Shear stress: the average web shear V/(d·t_w) for I-shapes, otherwise
//!   the peak V·Q/(I·t) (Jourawski), against the allowable F_v.
//! * Steel (material kind `steel` with F_y): the flexural and shear limit
//!   states of AISC 360-16 Chapters F and G, see [`steel`].
//! * Lateral stability of every unbraced segment: lateral-torsional
//!   buckling (steel) or the beam stability factor C_L (timber).
//! * Deflection: δ = y/(E·I) against L/n and/or an absolute limit per span,
//!   measured from the chord of the span's (displaced) supports; an
//!   overhang's L is `cantilever_factor` × its length (2 by common
//!   practice).
//!
//! The verdict (see [`Verdict`]): a section passes only when every limit
//! state that applies to it was evaluated by a stated method and passed.
//! A limit state that applies but cannot be evaluated (a missing input, a
//! shape outside a method's range, no method for the material) leaves a
//! [`Gap`] and the verdict is *not verified* — never a pass. A limit state
//! the user excludes explicitly ([`Exclusions`]) is not evaluated and is
//! listed as excluded on every output.
//!
//! Bracing: supports restrain the member laterally and against twist;
//! brace points restrain the top flange only unless `braced_flange` is
//! `both`; so under hogging (bottom flange in compression) a top-flange
//! brace does not end an unbraced length. The per-section path allocates
//! nothing: it scales and adds the demand's polynomials.

mod criteria;
mod material;
mod prepared;
mod segments;
mod setup;
pub mod steel;
pub mod timber;
mod verdict;
pub mod working;

pub use criteria::{
    BracedFlange, Bracing, Criteria, Exclusions, LoadHeight, LongTerm, ShearMethod,
};
pub use material::{FY_MAX, Material, MaterialKind};
pub use prepared::{Prepared, SectionInput, Sink, shear_factor};
pub use segments::Segment;
pub use timber::TimberFactors;
pub use verdict::{CheckKind, Gap, Gaps, Group, Item, Sense, Summary, Verdict};
