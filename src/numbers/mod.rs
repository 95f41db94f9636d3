//! Numbers the domain is made of: exact rationals and their relative errors, smooth-number
//! arithmetic, exact lengths, `LO..HI` ranges, and the ratio and tolerance syntax.

pub mod exact;
pub mod range;
pub mod rational;
pub mod smooth;
pub mod target;
