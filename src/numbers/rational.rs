//! Exact positive rationals held as reduced `u64` pairs, and the wide (256-bit) products needed
//! to compare them by cross-multiplication. Ratios of gear trains are products of integers; every
//! decision about them (is a train within tolerance, which of two is closer) is made here, exactly.
//! Floats appear only as a convenience value for display and for conservative pruning.

use std::cmp::Ordering;
use std::fmt;

/// Greatest common divisor.
pub fn gcd(mut a: u128, mut b: u128) -> u128 {
    while b != 0 {
        let t = a % b;
        a = b;
        b = t;
    }
    a
}

/// A non-negative rational `num/den`, always reduced, `den > 0`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Ratio {
    num: u64,
    den: u64,
}

impl Ratio {
    /// `num/den` reduced. `None` if `den` is zero or the reduced parts do not fit in `u64`.
    pub fn new(num: u128, den: u128) -> Option<Ratio> {
        if den == 0 {
            return None;
        }
        let g = gcd(num, den).max(1);
        let (n, d) = (num / g, den / g);
        Some(Ratio { num: u64::try_from(n).ok()?, den: u64::try_from(d).ok()? })
    }

    /// `num/den` if it is already reduced with `den > 0` (usable in constants).
    pub const fn from_parts(num: u64, den: u64) -> Option<Ratio> {
        let (mut a, mut b) = (num, den);
        while b != 0 {
            let t = a % b;
            a = b;
            b = t;
        }
        if den == 0 || a != 1 {
            None
        } else {
            Some(Ratio { num, den })
        }
    }

    /// The integer `n` as a ratio.
    pub fn integer(n: u64) -> Ratio {
        Ratio { num: n, den: 1 }
    }

    /// Numerator of the reduced form.
    pub fn num(self) -> u64 {
        self.num
    }

    /// Denominator of the reduced form.
    pub fn den(self) -> u64 {
        self.den
    }

    /// Nearest `f64`.
    pub fn to_f64(self) -> f64 {
        self.num as f64 / self.den as f64
    }

    /// True for zero.
    pub fn is_zero(self) -> bool {
        self.num == 0
    }
}

impl Ord for Ratio {
    fn cmp(&self, other: &Self) -> Ordering {
        (self.num as u128 * other.den as u128).cmp(&(other.num as u128 * self.den as u128))
    }
}

impl PartialOrd for Ratio {
    fn partial_cmp(&self, other: &Self) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}

impl fmt::Display for Ratio {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.den == 1 {
            write!(f, "{}", self.num)
        } else {
            write!(f, "{}/{}", self.num, self.den)
        }
    }
}

/// An unsigned 256-bit product, `hi·2^128 + lo`, only ever compared.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub struct Wide {
    hi: u128,
    lo: u128,
}

/// The full 256-bit product of two `u128`.
pub fn mul_wide(a: u128, b: u128) -> Wide {
    const MASK: u128 = u64::MAX as u128;
    let (a1, a0) = (a >> 64, a & MASK);
    let (b1, b0) = (b >> 64, b & MASK);
    let p00 = a0 * b0;
    let p01 = a0 * b1;
    let p10 = a1 * b0;
    let p11 = a1 * b1;
    let mid = (p00 >> 64) + (p01 & MASK) + (p10 & MASK);
    let lo = (p00 & MASK) | (mid << 64);
    let hi = p11 + (p01 >> 64) + (p10 >> 64) + (mid >> 64);
    Wide { hi, lo }
}

/// A train ratio `p/q` (unreduced products of teeth are fine) judged against a target.
///
/// The relative error is `e = (p/q)/(P/Q) − 1 = (p·Q − q·P)/(q·P)`; its numerator `p·Q − q·P`
/// and denominator `q·P` are held exactly.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct RelError {
    /// `|p·Q − q·P|`, exact.
    pub abs_num: u128,
    /// Sign of `p·Q − q·P`: -1, 0 or 1.
    pub sign: i8,
    /// `q·P`, exact; never zero.
    pub den: u128,
}

impl RelError {
    /// The error of `p/q` against `target`. Needs `p, q < 2^64`; target parts are `u64`.
    pub fn of(p: u64, q: u64, target: Ratio) -> RelError {
        let lhs = p as u128 * target.den as u128;
        let rhs = q as u128 * target.num as u128;
        let (abs_num, sign) = match lhs.cmp(&rhs) {
            Ordering::Greater => (lhs - rhs, 1),
            Ordering::Less => (rhs - lhs, -1),
            Ordering::Equal => (0, 0),
        };
        RelError { abs_num, sign, den: rhs }
    }

    /// `|e| ≤ tol`, decided exactly: `|pQ − qP|·td ≤ tn·qP`.
    pub fn within(&self, tol: Ratio) -> bool {
        mul_wide(self.abs_num, tol.den as u128) <= mul_wide(self.den, tol.num as u128)
    }

    /// Compare `|e|` of two errors exactly.
    pub fn cmp_abs(&self, other: &RelError) -> Ordering {
        // Both denominators are q·P with the same P; compare |d1|/(q1 P) with |d2|/(q2 P).
        mul_wide(self.abs_num, other.den).cmp(&mul_wide(other.abs_num, self.den))
    }

    /// The signed error as an `f64` (for display and JSON).
    pub fn to_f64(&self) -> f64 {
        if self.sign == 0 {
            return 0.0;
        }
        let v = self.abs_num as f64 / self.den as f64;
        if self.sign < 0 {
            -v
        } else {
            v
        }
    }

    /// True when the train hits the target exactly.
    pub fn is_exact(&self) -> bool {
        self.sign == 0
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reduces_and_orders() {
        let a = Ratio::new(150, 4).unwrap();
        assert_eq!((a.num(), a.den()), (75, 2));
        assert!(Ratio::new(1, 3).unwrap() < Ratio::new(1, 2).unwrap());
        assert_eq!(Ratio::new(1, 0), None);
        assert_eq!(Ratio::new(u128::from(u64::MAX) + 1, 1), None);
        assert_eq!(a.to_string(), "75/2");
        assert_eq!(Ratio::integer(12).to_string(), "12");
    }

    #[test]
    fn wide_product_matches_split_arithmetic() {
        let m = u128::MAX;
        let w = mul_wide(m, m);
        // (2^128 − 1)^2 = 2^256 − 2^129 + 1
        assert_eq!(w, Wide { hi: m - 1, lo: 1 });
        assert_eq!(mul_wide(1 << 64, 1 << 64), Wide { hi: 1, lo: 0 });
        assert_eq!(mul_wide(12345, 67890), Wide { hi: 0, lo: 12345 * 67890 });
    }

    #[test]
    fn tolerance_is_decided_exactly_at_the_edge() {
        let target = Ratio::integer(100);
        let tol = Ratio::new(1, 100).unwrap(); // 1 %
                                               // 101/1 is exactly 1 % high: inside. 10101/100 is just above: outside.
        assert!(RelError::of(101, 1, target).within(tol));
        assert!(RelError::of(99, 1, target).within(tol));
        assert!(!RelError::of(10101, 100, target).within(tol));
        assert!(!RelError::of(9899, 100, target).within(tol));
        assert!(RelError::of(100, 1, target).is_exact());
    }

    #[test]
    fn errors_compare_by_magnitude_exactly() {
        let t = Ratio::new(127, 120).unwrap();
        let a = RelError::of(127, 120, t);
        let b = RelError::of(18, 17, t);
        let c = RelError::of(55, 52, t);
        assert_eq!(a.cmp_abs(&b), Ordering::Less);
        // 18/17 = 1.058823…, 55/52 = 1.057692…, 127/120 = 1.058333…: 18/17 is nearer.
        assert_eq!(b.cmp_abs(&c), Ordering::Less);
        assert!(c.to_f64() < 0.0 && b.to_f64() > 0.0);
    }

    #[test]
    fn extreme_values_do_not_overflow() {
        let t = Ratio::new(u64::MAX as u128, (u64::MAX - 1) as u128).unwrap();
        let e = RelError::of(u64::MAX, 1, t);
        assert!(!e.within(Ratio::new(1, 2).unwrap()));
        let tiny = RelError::of(u64::MAX, u64::MAX - 1, t);
        assert!(tiny.is_exact());
    }

    #[test]
    fn the_largest_allowed_trains_fit() {
        // Six stages of at most 1000 teeth: products up to 10^18, below u64::MAX (1.8·10^19).
        let p = 1000u64.pow(6);
        let q = 999u64.pow(6);
        let target = Ratio::new(u64::MAX as u128, 3).unwrap();
        let e = RelError::of(p, q, target);
        assert!(e.to_f64() < 0.0 && !e.within(Ratio::new(999_999, 1_000_000).unwrap()));
        let near = RelError::of(p, q, Ratio::new(p as u128, q as u128).unwrap());
        assert!(near.is_exact());
        // A tolerance with a 20-digit denominator and a 19-digit target still compares exactly.
        let tol = Ratio::new(1, 10u128.pow(19)).unwrap();
        assert!(near.within(tol));
        assert!(!RelError::of(p + 1, q, Ratio::new(p as u128, q as u128).unwrap()).within(tol));
    }
}
