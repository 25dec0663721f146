//! Numerical foundation: the `Series` vector type, SI prefixes, quadrature and root finding.
pub mod alloc;
pub mod math;
pub mod quad;
pub mod roots;
pub mod series;
pub mod si;

pub use series::Series;
