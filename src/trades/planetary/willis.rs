//! Willis' equation: the speeds of the two central members and the carrier of an epicyclic
//! train, seen from the carrier, turn in the train's basic ratio. For central members `a` and
//! `b` (sun and ring; held ring and output ring) and carrier `c`,
//! `(n_a − n_c) / (n_b − n_c) = i0`, where `i0` is the ratio `a` to `b` with the carrier held.
//!
//! Owns turning a basic ratio and a choice of held and driving member into the ratio input to
//! output, exactly, with the output's direction beside it. Knows nothing of geometry.

use crate::model::train::Direction;
use crate::numbers::rational::Ratio;

use super::{Arrangement, Member, Teeth};

/// A signed ratio of speeds, held as an exact magnitude and a direction: `Same` for a positive
/// ratio (both turn the same way), `Opposite` for a negative one.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct SpeedRatio {
    /// `|n_in / n_out|`, exact and reduced.
    pub magnitude: Ratio,
    /// Which way the output turns relative to the input.
    pub direction: Direction,
}

impl SpeedRatio {
    /// `num/den` with `direction`; `None` when `den` is zero or the reduced parts do not fit
    /// in `u64`.
    pub fn new(num: u128, den: u128, direction: Direction) -> Option<SpeedRatio> {
        Some(SpeedRatio { magnitude: Ratio::new(num, den)?, direction })
    }

    /// The ratio as a signed `f64`, for display.
    pub fn to_f64(self) -> f64 {
        match self.direction {
            Direction::Same => self.magnitude.to_f64(),
            Direction::Opposite => -self.magnitude.to_f64(),
        }
    }

    /// Numerator and denominator with the sign on the numerator.
    fn signed(self) -> (i128, i128) {
        let num = i128::from(self.magnitude.num());
        let sign = if self.direction == Direction::Same { 1 } else { -1 };
        (sign * num, i128::from(self.magnitude.den()))
    }
}

impl std::fmt::Display for SpeedRatio {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self.direction {
            Direction::Same => write!(f, "{}", self.magnitude),
            Direction::Opposite => write!(f, "-{}", self.magnitude),
        }
    }
}

/// The place of a member in Willis' equation.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Slot {
    /// The central member the basic ratio is measured from.
    First,
    /// The central member it is measured to.
    Second,
    /// The carrier.
    Carrier,
}

/// Input turns per output turn when `fixed` is held and `input` drives, from the basic ratio
/// `basic = (n_a/n_b)` with the carrier held. `None` when the two are the same member, or the
/// train cannot run that way (the output cannot turn, or the input cannot).
///
/// Willis' equation `(n_a − n_c) = i0·(n_b − n_c)` with `i0 = P/Q` (signed) is the linear
/// relation `Q·n_a − P·n_b + (P − Q)·n_c = 0`. With one speed held at zero it links the other
/// two, `k_in·n_in + k_out·n_out = 0`, so `n_in/n_out = −k_out/k_in`, in whole numbers.
fn solve(basic: SpeedRatio, fixed: Slot, input: Slot) -> Option<SpeedRatio> {
    let (p, q) = basic.signed();
    let (num, den, direction) = unreduced(p, q, fixed, input)?;
    SpeedRatio::new(num, den, direction)
}

/// The ratio `n_in/n_out` for a signed basic ratio `p/q` as unreduced whole numbers with the
/// output's direction: `(|k_out|, |k_in|, direction)`. `None` as for [`solve`].
fn unreduced(p: i128, q: i128, fixed: Slot, input: Slot) -> Option<(u128, u128, Direction)> {
    if fixed == input {
        return None;
    }
    let coefficient = |slot| match slot {
        Slot::First => q,
        Slot::Second => -p,
        Slot::Carrier => p - q,
    };
    let output =
        [Slot::First, Slot::Second, Slot::Carrier].into_iter().find(|&s| s != fixed && s != input)?;
    let (k_in, k_out) = (coefficient(input), coefficient(output));
    if k_in == 0 || k_out == 0 {
        return None;
    }
    let direction = if (k_in > 0) == (k_out > 0) { Direction::Opposite } else { Direction::Same };
    Some((k_out.unsigned_abs(), k_in.unsigned_abs(), direction))
}

fn slot(member: Member) -> Slot {
    match member {
        Member::Sun => Slot::First,
        Member::Ring => Slot::Second,
        Member::Carrier => Slot::Carrier,
    }
}

/// Input turns per output turn of a train with a sun, ring and carrier whose basic ratio (sun
/// to ring, carrier held) is `basic`, with `fixed` held and `input` driving; the third member
/// is the output. `None` when `fixed` and `input` are the same member or the train cannot run
/// so.
///
/// For the simple train `basic` is `−Zr/Zs`; ring held, sun driving gives `1 + Zr/Zs`.
pub fn willis_ratio(basic: SpeedRatio, fixed: Member, input: Member) -> Option<SpeedRatio> {
    solve(basic, slot(fixed), slot(input))
}

impl Teeth {
    /// The basic ratio with the carrier held: sun to ring, `−Zr/Zs` or `−(Zr·Zp1)/(Zs·Zp2)`;
    /// held ring to output ring for the two-ring train, `+(Zp1·Zr2)/(Zr1·Zp2)`.
    pub fn basic_ratio(&self) -> Option<SpeedRatio> {
        let w = u128::from;
        match *self {
            Teeth::Simple { sun, ring, .. } => SpeedRatio::new(w(ring), w(sun), Direction::Opposite),
            Teeth::Stepped { sun, planet, ring } => {
                SpeedRatio::new(w(ring) * w(planet[0]), w(sun) * w(planet[1]), Direction::Opposite)
            }
            Teeth::TwoRing { planet, ring } => {
                SpeedRatio::new(w(planet[0]) * w(ring[1]), w(ring[0]) * w(planet[1]), Direction::Same)
            }
        }
    }
}

impl Teeth {
    /// The basic ratio as an unreduced signed fraction `(p, q)`, `q > 0`: what
    /// [`Teeth::basic_ratio`] reduces, without the cost of a greatest common divisor.
    fn basic_unreduced(&self) -> (i128, i128) {
        let w = i128::from;
        match *self {
            Teeth::Simple { sun, ring, .. } => (-w(ring), w(sun)),
            Teeth::Stepped { sun, planet, ring } => (-w(ring) * w(planet[0]), w(sun) * w(planet[1])),
            Teeth::TwoRing { planet, ring } => (w(planet[0]) * w(ring[1]), w(ring[0]) * w(planet[1])),
        }
    }
}

impl Arrangement {
    /// The ratio of `teeth` driven this way as unreduced whole numbers `(num, den, direction)`
    /// with `num/den` = input turns per output turn; for the search, which decides the
    /// tolerance by cross-multiplication and needs no reduced form. `None` as for
    /// [`Arrangement::ratio`].
    pub fn unreduced_ratio(&self, teeth: &Teeth) -> Option<(u64, u64, Direction)> {
        let (p, q) = teeth.basic_unreduced();
        let (num, den, direction) = match (self, teeth) {
            (Arrangement::Simple { fixed, input }, Teeth::Simple { .. })
            | (Arrangement::Stepped { fixed, input }, Teeth::Stepped { .. }) => {
                unreduced(p, q, slot(*fixed), slot(*input))?
            }
            (Arrangement::TwoRing, Teeth::TwoRing { .. }) => unreduced(p, q, Slot::First, Slot::Carrier)?,
            _ => return None,
        };
        Some((u64::try_from(num).ok()?, u64::try_from(den).ok()?, direction))
    }

    /// Input turns per output turn of `teeth` driven as this arrangement says. `None` when the
    /// output cannot turn (a two-ring train whose products `Zp1·Zr2` and `Zr1·Zp2` are equal),
    /// when `teeth` is of another arrangement, or when the held and driving member are one.
    pub fn ratio(&self, teeth: &Teeth) -> Option<SpeedRatio> {
        let (num, den, direction) = self.unreduced_ratio(teeth)?;
        SpeedRatio::new(u128::from(num), u128::from(den), direction)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn ratio(n: u128, d: u128, dir: Direction) -> SpeedRatio {
        SpeedRatio::new(n, d, dir).unwrap()
    }

    #[test]
    fn ring_held_sun_driving_is_one_plus_ring_over_sun() {
        // check-values.md, "Gear measurement and internal gears" (from memory): simple
        // planetary with the ring fixed, sun driving, carrier driven: i = 1 + z_ring/z_sun.
        let teeth = Teeth::Simple { sun: 20, planet: 30, ring: 80 };
        let arrangement = Arrangement::Simple { fixed: Member::Ring, input: Member::Sun };
        assert_eq!(arrangement.ratio(&teeth), Some(ratio(5, 1, Direction::Same)));
        assert_eq!(arrangement.ratio(&teeth).unwrap().to_string(), "5");
    }

    #[test]
    fn the_six_drives_of_a_simple_train() {
        // Willis' equation solved by hand for Zs = 24, Zr = 84 (i0 = −7/2), common practice:
        // ring held: sun→carrier 1 + 7/2, carrier→sun its inverse; sun held: ring→carrier
        // 1 + 2/7, carrier→ring its inverse; carrier held: sun→ring −7/2, ring→sun −2/7.
        let teeth = Teeth::Simple { sun: 24, planet: 30, ring: 84 };
        let cases = [
            (Member::Ring, Member::Sun, ratio(9, 2, Direction::Same)),
            (Member::Ring, Member::Carrier, ratio(2, 9, Direction::Same)),
            (Member::Sun, Member::Ring, ratio(9, 7, Direction::Same)),
            (Member::Sun, Member::Carrier, ratio(7, 9, Direction::Same)),
            (Member::Carrier, Member::Sun, ratio(7, 2, Direction::Opposite)),
            (Member::Carrier, Member::Ring, ratio(2, 7, Direction::Opposite)),
        ];
        for (fixed, input, want) in cases {
            let got = Arrangement::Simple { fixed, input }.ratio(&teeth);
            assert_eq!(got, Some(want), "{fixed:?} held, {input:?} driving");
        }
        assert_eq!(willis_ratio(teeth.basic_ratio().unwrap(), Member::Sun, Member::Sun), None);
    }

    #[test]
    fn two_ring_train_reduces_by_the_difference_of_products() {
        // Zp1·Zr2 = 20·82 = 1640, Zr1·Zp2 = 80·21 = 1680: ratio 1640/(1640 − 1680) = −41,
        // the output ring turning against the carrier.
        let teeth = Teeth::TwoRing { planet: [20, 21], ring: [80, 82] };
        assert_eq!(Arrangement::TwoRing.ratio(&teeth), Some(ratio(41, 1, Direction::Opposite)));
        // Equal products: the output ring stands still whatever the carrier does.
        let stuck = Teeth::TwoRing { planet: [20, 21], ring: [80, 84] };
        assert_eq!(Arrangement::TwoRing.ratio(&stuck), None);
        // Through Willis' equation with the reduced basic ratio, the same.
        let basic = teeth.basic_ratio().unwrap();
        assert_eq!(basic, ratio(41, 42, Direction::Same));
        assert_eq!(solve(basic, Slot::First, Slot::Carrier), Arrangement::TwoRing.ratio(&teeth));
        // A mismatched arrangement gives no ratio.
        assert_eq!(Arrangement::TwoRing.ratio(&Teeth::Simple { sun: 20, planet: 30, ring: 80 }), None);
    }

    #[test]
    fn reduced_basic_ratio_gives_the_same_drive_ratios() {
        // The search works with unreduced products; Willis' equation on the reduced basic ratio
        // must agree for every drive.
        let members = [Member::Sun, Member::Ring, Member::Carrier];
        for teeth in [
            Teeth::Simple { sun: 18, planet: 27, ring: 72 },
            Teeth::Stepped { sun: 21, planet: [35, 14], ring: 70 },
            Teeth::Stepped { sun: 17, planet: [29, 23], ring: 69 },
        ] {
            let basic = teeth.basic_ratio().unwrap();
            for fixed in members {
                for input in members {
                    let arrangement = match teeth {
                        Teeth::Simple { .. } => Arrangement::Simple { fixed, input },
                        _ => Arrangement::Stepped { fixed, input },
                    };
                    assert_eq!(arrangement.ratio(&teeth), willis_ratio(basic, fixed, input), "{teeth:?}");
                }
            }
        }
    }

    #[test]
    fn signed_display() {
        let a = ratio(7, 2, Direction::Opposite);
        assert_eq!(a.to_string(), "-7/2");
        assert!((a.to_f64() + 3.5).abs() < 1e-15);
        assert_eq!(ratio(14, 4, Direction::Same).to_string(), "7/2");
    }
}
