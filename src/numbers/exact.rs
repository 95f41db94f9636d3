//! Exact products and quotients of [`Ratio`]s for the thread arithmetic. Lengths on a lathe are
//! ratios of small whole numbers (1 in = 127/5 mm), so almost every result stays exact; only a
//! value that carries π (a module or diametral-pitch worm) can outgrow 64-bit parts, and then it
//! is replaced by its nearest fraction whose parts fit, a relative change below 10⁻³⁰.

use crate::numbers::rational::{gcd, Ratio};

/// A ratio and whether it is exactly the value it stands for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Exact {
    /// The value, or its nearest fraction with 64-bit parts.
    pub value: Ratio,
    /// False once any step had to round.
    pub exact: bool,
}

impl Exact {
    /// An exact value.
    pub fn of(value: Ratio) -> Exact {
        Exact { value, exact: true }
    }

    /// `self · other`.
    pub fn times(self, other: Exact) -> Exact {
        let (n, d) = (
            self.value.num() as u128 * other.value.num() as u128,
            self.value.den() as u128 * other.value.den() as u128,
        );
        let (value, exact) = fit(n, d);
        Exact { value, exact: exact && self.exact && other.exact }
    }

    /// `self / other`; `other` is never zero (every length and ratio here is positive).
    pub fn over(self, other: Exact) -> Exact {
        let inv =
            Ratio::new(other.value.den() as u128, other.value.num().max(1) as u128).unwrap_or(other.value);
        self.times(Exact { value: inv, exact: other.exact })
    }
}

/// `n/d` reduced; when the reduced parts exceed 64 bits, the last continued-fraction convergent
/// whose parts fit (`false` says it was rounded). `d` must be positive.
pub fn fit(n: u128, d: u128) -> (Ratio, bool) {
    let g = gcd(n, d).max(1);
    let (n, d) = (n / g, d / g);
    if let Some(r) = Ratio::new(n, d) {
        return (r, true);
    }
    let limit = u64::MAX as u128;
    // Convergents h/k of n/d: h₋₁/k₋₁ = 1/0, h₋₂/k₋₂ = 0/1.
    let (mut h0, mut k0, mut h1, mut k1) = (0u128, 1u128, 1u128, 0u128);
    let (mut a, mut b) = (n, d);
    let mut best = (h1, k1.max(1));
    while b != 0 {
        let q = a / b;
        let (h2, k2) = match (q.checked_mul(h1), q.checked_mul(k1)) {
            (Some(x), Some(y)) => match (x.checked_add(h0), y.checked_add(k0)) {
                (Some(h), Some(k)) => (h, k),
                _ => break,
            },
            _ => break,
        };
        if h2 > limit || k2 > limit {
            break;
        }
        best = (h2, k2);
        (h0, k0, h1, k1) = (h1, k1, h2, k2);
        (a, b) = (b, a % b);
    }
    let r = Ratio::new(best.0, best.1).unwrap_or_else(|| Ratio::integer(u64::MAX));
    (r, false)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numbers::target::PI;

    #[test]
    fn small_products_stay_exact() {
        let inch = Exact::of(Ratio::new(127, 5).unwrap());
        let six = Exact::of(Ratio::integer(6));
        let p = inch.over(six);
        assert!(p.exact);
        assert_eq!(p.value.to_string(), "127/30");
        assert_eq!(p.times(six).value, inch.value);
    }

    #[test]
    fn products_with_pi_round_far_below_any_tolerance() {
        let p = Exact::of(PI).times(Exact::of(Ratio::new(127, 5).unwrap()));
        assert!(!p.exact);
        let want = std::f64::consts::PI * 25.4;
        assert!((p.value.to_f64() / want - 1.0).abs() < 1e-15);
        // Rounded, then divided back: still π to double precision.
        let back = p.over(Exact::of(Ratio::new(127, 5).unwrap()));
        assert!((back.value.to_f64() - std::f64::consts::PI).abs() < 1e-15);
    }
}
