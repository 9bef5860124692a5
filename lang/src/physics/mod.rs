//! The physics library: constants with their standards, typed formulas, mass–radius
//! composition curves, orbits, transit light curves, spectral-type estimates, reference
//! bodies and time scales. Pure functions of numbers; nothing here imports the pipeline's
//! stages (model, derivation, checks, output, editor features).

pub mod composition;
pub mod constants;
pub mod fastmath;
pub mod formulas;
pub mod lightcurve;
pub mod orbit;
pub mod sky;
pub mod solar_system;
pub mod spectral;
pub mod time;
