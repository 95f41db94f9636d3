//! The involute function `inv α = tan α − α` and its inverse, both to full double precision.
//!
//! Owns only these two functions of an angle in radians; it knows nothing of gears. Every
//! centre-distance and profile-shift relation goes through them, and a shift sum is a small
//! difference of two involute values, so `inv` is evaluated without the cancellation that the
//! plain `tan α − α` suffers at small angles (at 20° that form already loses about five bits).

use std::f64::consts::FRAC_PI_2;

/// Taylor coefficients of `tan x − x` in powers `x³, x⁵, …, x³⁹`: `c[n−1]` multiplies
/// `x^(2n+1)`. They are the exact rationals 1/3, 2/15, 17/315, 62/2835, … (tangent numbers divided
/// by factorials, from the recurrence `(2n+1)·c_n = Σ c_k·c_(n−1−k)` of `tan' = 1 + tan²`), each
/// rounded to the nearest double. A test rebuilds them from that recurrence.
const TAN_MINUS_X: [f64; 19] = [
    0.333_333_333_333_333_3,
    0.133_333_333_333_333_33,
    0.053_968_253_968_253_97,
    0.021_869_488_536_155_203,
    0.008_863_235_529_902_197,
    0.003_592_128_036_572_481,
    0.001_455_834_387_051_318_3,
    0.000_590_027_440_945_586,
    0.000_239_129_114_243_552_48,
    9.691_537_956_929_451e-5,
    3.927_832_388_331_683e-5,
    1.591_890_506_932_896_4e-5,
    6.451_689_215_655_431e-6,
    2.614_771_151_290_754_6e-6,
    1.059_726_832_010_465_4e-6,
    4.294_911_078_273_806e-7,
    1.740_661_896_357_164_8e-7,
    7.054_636_946_400_968e-8,
    2.859_136_662_305_254e-8,
];

/// Up to this angle (rad) the series is summed directly. Successive terms shrink by about
/// `(2α/π)² ≈ 0.1` here, so the 19 terms carry it below half an ulp.
const SERIES_LIMIT_RAD: f64 = 0.5;

/// Up to this angle (rad) one angle-doubling step is taken from the series at `α/2`. Above it
/// `tan α − α` loses less than two bits to cancellation and is used as it stands.
const DOUBLING_LIMIT_RAD: f64 = 1.0;

/// Above this value `inv α = v` is solved in closed form: with `α = π/2 − δ`,
/// `cot δ − π/2 + δ = v` gives `δ = 1/(v + π/2)` to a relative `δ/v` < 10⁻¹⁶.
const LARGE_INVOLUTE: f64 = 1e8;

/// The involute function `inv α = tan α − α` of an angle in radians.
///
/// Accurate to a few ulps over `|α| < π/2` (the only range with a meaning for a tooth flank); odd,
/// so `inv(−α) = −inv(α)`; NaN in, NaN out. Small angles are summed from the Taylor series and
/// middle ones from the double-angle identity
/// `inv 2β = (2·inv β + 2β·tan²β) / (1 − tan²β)`, whose terms are all positive, so neither loses
/// digits to cancellation.
pub fn inv(alpha_rad: f64) -> f64 {
    let a = alpha_rad.abs();
    let value = if a <= SERIES_LIMIT_RAD {
        inv_series(a)
    } else if a <= DOUBLING_LIMIT_RAD {
        let half = 0.5 * a;
        let t = half.tan();
        let t2 = t * t;
        (2.0 * inv_series(half) + 2.0 * half * t2) / (1.0 - t2)
    } else {
        a.tan() - a
    };
    value.copysign(alpha_rad)
}

/// `tan α − α` by Horner's rule in `α²`, for `0 ≤ α ≤ SERIES_LIMIT_RAD`. All terms are positive.
fn inv_series(a: f64) -> f64 {
    let t = a * a;
    // Plain multiply-add rather than `mul_add`: without a hardware FMA that is a slow library
    // call, and with all terms positive it gains nothing measurable.
    let poly = TAN_MINUS_X.iter().rev().fold(0.0, |acc, &c| acc * t + c);
    a * t * poly
}

/// The angle `α` in radians with `inv α = v`: the inverse involute function.
///
/// `|α| < π/2`, except that it rounds to `±π/2` once `|v|` passes about 10¹⁶.
/// Odd like [`inv`]: `inv_inverse(−v) = −inv_inverse(v)`; `±0` gives `±0`, `±∞` gives `±π/2`,
/// NaN gives NaN. For `|v|` up to about 1 (angles to about 60°) `inv(inv_inverse(v))` returns `v`
/// to within 10⁻¹⁵ of `v`; beyond, the answer is still the nearest double or so to the true
/// angle, but `tan` near `π/2` is so steep that the round trip cannot be that close.
///
/// Method: Newton's iteration on `tan α − α − v` (derivative `tan²α`). For small `v` it starts
/// from the series inversion `α ≈ q − 2q³/15 + 3q⁵/175` with `q = ∛(3v)`, which is within about
/// 10⁻⁵ at 20° and needs two or three steps. For larger `v` it starts from
/// `min(q, atan(v + π/2))`, both of which lie above the root; the function is increasing and
/// convex there, so Newton then falls monotonically onto the root and never leaves `(0, π/2)`.
/// Above 10⁸ the closed form `α = π/2 − 1/(v + π/2)` is exact to double precision.
pub fn inv_inverse(v: f64) -> f64 {
    if v.is_nan() || v == 0.0 {
        return v;
    }
    let x = v.abs();
    if x >= LARGE_INVOLUTE {
        // Also covers +∞: 1/∞ = 0.
        return (FRAC_PI_2 - 1.0 / (x + FRAC_PI_2)).copysign(v);
    }
    let q = (3.0 * x).cbrt();
    let mut alpha = if q <= 1.0 {
        let q2 = q * q;
        q * (1.0 - q2 * (2.0 / 15.0 - q2 * (3.0 / 175.0)))
    } else {
        q.min((x + FRAC_PI_2).atan())
    };
    // Quadratic convergence needs at most a handful of steps; the cap only guards against a
    // pathological cycle of one or two ulps.
    for _ in 0..64 {
        let t = alpha.tan();
        let step = (inv(alpha) - x) / (t * t);
        let next = alpha - step;
        if !(next > 0.0 && next < FRAC_PI_2) {
            break;
        }
        alpha = next;
        if step.abs() <= f64::EPSILON * alpha {
            break;
        }
    }
    alpha.copysign(v)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Relative difference, for checks near full precision.
    fn rel(a: f64, b: f64) -> f64 {
        ((a - b) / b).abs()
    }

    #[test]
    fn printed_table_values() {
        // Source: definition inv α = tan α − α; "computed, agree with printed involute tables":
        // inv 14.5° = 0.0055448, inv 20° = 0.0149044, inv 25° = 0.0299753.
        assert!((inv(14.5f64.to_radians()) - 0.005_544_8).abs() < 5e-8);
        assert!((inv(20f64.to_radians()) - 0.014_904_4).abs() < 5e-8);
        assert!((inv(25f64.to_radians()) - 0.029_975_3).abs() < 5e-8);
    }

    #[test]
    fn series_coefficients_follow_the_tangent_recurrence() {
        // tan' = 1 + tan², so with tan x = Σ a_n x^(2n+1), a_0 = 1:
        // (2n+1)·a_n = Σ_{k<n} a_k·a_(n−1−k).
        let mut a = vec![1.0f64];
        for n in 1..=TAN_MINUS_X.len() {
            let s: f64 = (0..n).map(|k| a[k] * a[n - 1 - k]).sum();
            a.push(s / (2 * n + 1) as f64);
        }
        for (n, &c) in TAN_MINUS_X.iter().enumerate() {
            assert!(rel(c, a[n + 1]) < 1e-14, "coefficient {n}: {c} vs {}", a[n + 1]);
        }
    }

    #[test]
    fn agrees_with_plain_formula_within_its_cancellation_error() {
        // Where tan α − α is evaluated plainly its error is about ulp(tan α), i.e. a relative
        // error of ε·tan α / inv α. The careful branches must agree with it to that bound.
        let mut alpha = 0.2f64;
        while alpha < 1.5 {
            let plain = alpha.tan() - alpha;
            let bound = 4.0 * f64::EPSILON * alpha.tan() / plain;
            assert!(rel(inv(alpha), plain) <= bound, "alpha {alpha}");
            alpha += 0.013;
        }
    }

    #[test]
    fn small_angles_follow_the_leading_terms() {
        for &a in &[1e-8f64, 1e-5, 1e-3] {
            let lead = a.powi(3) / 3.0 + 2.0 * a.powi(5) / 15.0 + 17.0 * a.powi(7) / 315.0;
            assert!(rel(inv(a), lead) < 1e-15, "alpha {a}");
        }
        assert_eq!(inv(0.0), 0.0);
    }

    #[test]
    fn increasing_across_the_branch_limits() {
        for &edge in &[SERIES_LIMIT_RAD, DOUBLING_LIMIT_RAD] {
            let below = f64::from_bits(edge.to_bits() - 1);
            let above = f64::from_bits(edge.to_bits() + 1);
            assert!(inv(below) <= inv(edge) && inv(edge) <= inv(above), "edge {edge}");
            // A step of one ulp in α moves inv by about 3 ulps; a seam would show as more.
            assert!(rel(inv(above), inv(below)) < 2e-15, "edge {edge}");
        }
    }

    #[test]
    fn odd_symmetry() {
        for &a in &[0.1f64, 0.4, 0.8, 1.2] {
            assert_eq!(inv(-a), -inv(a));
            assert_eq!(inv_inverse(-inv(a)), -inv_inverse(inv(a)));
        }
    }

    #[test]
    fn round_trip_to_full_precision_over_a_wide_range() {
        // v from 1e-12 (α ≈ 1.4e-4 rad) to 1 (α ≈ 64°), 40 values per decade.
        let mut worst = 0.0f64;
        for i in 0..=480 {
            let v = 10f64.powf(-12.0 + f64::from(i) / 40.0);
            let back = inv(inv_inverse(v));
            worst = worst.max(((back - v) / v).abs());
        }
        assert!(worst <= 1e-15, "worst relative round-trip error {worst:e}");
    }

    #[test]
    fn inverse_of_known_angles() {
        for &deg in &[14.5f64, 20.0, 25.0, 40.0, 60.0, 75.0] {
            let a = deg.to_radians();
            assert!(rel(inv_inverse(inv(a)), a) < 4.0 * f64::EPSILON, "{deg}°");
        }
    }

    #[test]
    fn zero_tiny_and_special_values() {
        assert_eq!(inv_inverse(0.0), 0.0);
        assert!(inv_inverse(-0.0).is_sign_negative());
        assert!(inv_inverse(f64::NAN).is_nan());
        assert_eq!(inv_inverse(f64::INFINITY), FRAC_PI_2);
        assert_eq!(inv_inverse(f64::NEG_INFINITY), -FRAC_PI_2);
        // inv α ≈ α³/3 for tiny α.
        let v = 1e-300;
        assert!(rel(inv_inverse(v), (3.0 * v).cbrt()) < 1e-15);
    }

    #[test]
    fn large_values_approach_a_right_angle() {
        let mut previous = 0.0;
        for &v in &[2.0, 10.0, 1e3, 1e6, 1e12, 1e300] {
            let a = inv_inverse(v);
            assert!(a > previous && a <= FRAC_PI_2, "v {v}");
            // The distance from π/2 is about 1/(v + π/2), to a relative 2/(3v²) or so.
            if v >= 10.0 {
                let delta = FRAC_PI_2 - a;
                let want = 1.0 / (v + FRAC_PI_2);
                // Below the spacing of doubles at π/2 (2.2e-16) only rounding is left.
                assert!((delta - want).abs() <= 0.01 * want + f64::EPSILON, "v {v}");
            }
            previous = a;
        }
        // No seam where Newton hands over to the closed form.
        let below = inv_inverse(f64::from_bits(LARGE_INVOLUTE.to_bits() - 1));
        let at = inv_inverse(LARGE_INVOLUTE);
        // Both are within an ulp of the root, which is all a double near π/2 can resolve.
        assert!((at - below).abs() <= 2.0 * f64::EPSILON);
        // Where tan is still well conditioned the equation itself is met.
        for &v in &[2.0f64, 10.0, 100.0] {
            assert!(rel(inv(inv_inverse(v)), v) < 1e-13, "v {v}");
        }
    }
}
