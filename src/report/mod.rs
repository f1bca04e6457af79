//! Plain result structs for each analysis, built from the physics modules and consumed by `export`/`plot`.

pub mod bundle;
pub mod derive;
pub mod evolve;
pub mod figures;
pub mod map;
