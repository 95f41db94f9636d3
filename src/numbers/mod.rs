//! Numbers the domain is made of: exact rationals and their relative errors, smooth-number
//! arithmetic, exact products, lengths and periods with their units, `LO..HI` ranges, and the
//! number, ratio and tolerance syntax every quantity shares.

pub mod exact;
pub mod length;
pub mod period;
pub mod range;
pub mod rational;
pub mod smooth;
pub mod target;
