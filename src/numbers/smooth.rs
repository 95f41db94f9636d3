//! Smooth-number arithmetic for exact searches: whole numbers held with their prime
//! factorisation, their divisors within bounds, the numbers up to a bound whose primes all come
//! from a given list, and the count of ordered ways to write a number as a product of members of
//! a set of tooth counts (members possibly raised to powers).
//!
//! Owns nothing of stages, trains or ratios; the factor engine builds on it.

/// Most distinct primes a `u64` can have: the product of the first 16 primes passes 2⁶⁴.
const MAX_PRIMES: usize = 15;

use std::sync::Arc;

/// The primes up to `n`, ascending.
pub fn primes_up_to(n: u32) -> Vec<u32> {
    let n = n as usize;
    let mut composite = vec![false; n + 1];
    let mut primes = Vec::new();
    for i in 2..=n {
        if !composite[i] {
            primes.push(i as u32);
            let mut j = i * i;
            while j <= n {
                composite[j] = true;
                j += i;
            }
        }
    }
    primes
}

/// A positive whole number with its factorisation: distinct primes ascending, each with its
/// exponent. Invariant: `value` is the product of `primes[i]^exps[i]` over the first `len`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Factored {
    value: u64,
    len: u8,
    primes: [u32; MAX_PRIMES],
    exps: [u8; MAX_PRIMES],
}

impl Factored {
    /// The number 1.
    pub const ONE: Factored = Factored { value: 1, len: 0, primes: [0; MAX_PRIMES], exps: [0; MAX_PRIMES] };

    /// Factor `n` over `primes` (ascending); `None` when `n` is zero or has a prime factor not in
    /// the list.
    pub fn of(mut n: u64, primes: &[u32]) -> Option<Factored> {
        if n == 0 {
            return None;
        }
        let mut f = Factored { value: n, ..Factored::ONE };
        for &p in primes {
            if n == 1 {
                break;
            }
            let mut e = 0u8;
            while n % p as u64 == 0 {
                n /= p as u64;
                e += 1;
            }
            if e > 0 {
                f.primes[f.len as usize] = p;
                f.exps[f.len as usize] = e;
                f.len += 1;
            }
        }
        (n == 1).then_some(f)
    }

    /// The number.
    pub fn value(&self) -> u64 {
        self.value
    }

    /// `(prime, exponent)` pairs, prime ascending.
    pub fn powers(&self) -> impl Iterator<Item = (u32, u8)> + '_ {
        (0..self.len as usize).map(|i| (self.primes[i], self.exps[i]))
    }

    /// The largest prime factor (1 for the number 1).
    pub fn largest_prime(&self) -> u64 {
        self.len.checked_sub(1).map_or(1, |i| self.primes[i as usize] as u64)
    }

    /// The product, or `None` if it passes `u64`.
    pub fn mul(&self, other: &Factored) -> Option<Factored> {
        let value = self.value.checked_mul(other.value)?;
        let mut out = Factored { value, ..Factored::ONE };
        let (mut i, mut j) = (0, 0);
        while i < self.len as usize || j < other.len as usize {
            let a = (i < self.len as usize).then(|| self.primes[i]);
            let b = (j < other.len as usize).then(|| other.primes[j]);
            let (p, e) = match (a, b) {
                (Some(x), Some(y)) if x == y => {
                    i += 1;
                    j += 1;
                    (x, self.exps[i - 1] + other.exps[j - 1])
                }
                (Some(x), Some(y)) if x < y => {
                    i += 1;
                    (x, self.exps[i - 1])
                }
                (Some(x), None) => {
                    i += 1;
                    (x, self.exps[i - 1])
                }
                (_, Some(y)) => {
                    j += 1;
                    (y, other.exps[j - 1])
                }
                (None, None) => unreachable!("the loop runs while one side has primes left"),
            };
            out.primes[out.len as usize] = p;
            out.exps[out.len as usize] = e;
            out.len += 1;
        }
        Some(out)
    }

    /// `self / t^power` when `t^power` divides this number.
    pub fn divided_by(&self, t: u64, power: u32) -> Option<Factored> {
        let d = t.checked_pow(power)?;
        (t > 0 && self.value % d == 0).then(|| self.div_pow(t, power))
    }

    /// `self / t^power`, for `t^power` dividing this number.
    fn div_pow(&self, mut t: u64, power: u32) -> Factored {
        let mut out = Factored { value: self.value / t.pow(power), ..Factored::ONE };
        for (&p, &e) in self.primes.iter().zip(&self.exps).take(self.len as usize) {
            let mut e = e;
            while t % p as u64 == 0 {
                t /= p as u64;
                e -= power as u8;
            }
            if e > 0 {
                out.primes[out.len as usize] = p;
                out.exps[out.len as usize] = e;
                out.len += 1;
            }
        }
        out
    }

    /// The largest `r` with `r^power` dividing this number, as exponents.
    fn root_part(&self, power: u32) -> Factored {
        let mut out = Factored::ONE;
        for i in 0..self.len as usize {
            let e = self.exps[i] / power as u8;
            if e > 0 {
                out.primes[out.len as usize] = self.primes[i];
                out.exps[out.len as usize] = e;
                out.len += 1;
                out.value *= (self.primes[i] as u64).pow(e as u32);
            }
        }
        out
    }

    /// Call `f(d)` for every divisor `d` with `lo ≤ d ≤ hi`, in a fixed order.
    pub fn for_each_divisor(&self, lo: u64, hi: u64, f: &mut impl FnMut(u64)) {
        // suffix[i]: the product of the prime powers from i on, the most the rest can multiply by.
        let mut suffix = [1u64; MAX_PRIMES + 1];
        for i in (0..self.len as usize).rev() {
            suffix[i] = suffix[i + 1] * (self.primes[i] as u64).pow(self.exps[i] as u32);
        }
        self.divisors_from(0, 1, lo, hi, &suffix, f);
    }

    fn divisors_from(
        &self,
        i: usize,
        d: u64,
        lo: u64,
        hi: u64,
        suffix: &[u64; MAX_PRIMES + 1],
        f: &mut impl FnMut(u64),
    ) {
        if d.saturating_mul(suffix[i]) < lo {
            return;
        }
        if i == self.len as usize {
            f(d);
            return;
        }
        let p = self.primes[i] as u64;
        let mut x = d;
        for _ in 0..=self.exps[i] {
            if x > hi {
                break;
            }
            self.divisors_from(i + 1, x, lo, hi, suffix, f);
            // Past the last exponent x·p may not divide the number; the loop ends before using it.
            x = x.saturating_mul(p);
        }
    }
}

/// `base·p^e` for every prime `p` of `primes[next..]` and `e ≥ 1` within `hi`, with the index
/// after `p`.
fn for_each_child(primes: &[u32], base: Factored, next: usize, hi: u64, f: &mut impl FnMut(Factored, usize)) {
    for (j, &p) in primes.iter().enumerate().skip(next) {
        let Some(mut x) = base.value.checked_mul(p as u64).filter(|&x| x <= hi) else { break };
        let mut child = base;
        child.primes[child.len as usize] = p;
        child.len += 1;
        let mut e = 1u8;
        loop {
            child.value = x;
            child.exps[child.len as usize - 1] = e;
            f(child, j + 1);
            match x.checked_mul(p as u64) {
                Some(y) if y <= hi => {
                    x = y;
                    e += 1;
                }
                _ => break,
            }
        }
    }
}

/// Call `f` on every number within `lo..=hi` whose prime factors all lie in `primes`
/// (ascending), 1 included. Stops early when `f` returns false; returns false then.
pub fn for_each_smooth(primes: &[u32], lo: u64, hi: u64, f: &mut impl FnMut(&Factored) -> bool) -> bool {
    if lo <= 1 && hi >= 1 && !f(&Factored::ONE) {
        return false;
    }
    walk_smooth(primes, Factored::ONE, 0, lo, hi, f)
}

fn walk_smooth(
    primes: &[u32],
    base: Factored,
    next: usize,
    lo: u64,
    hi: u64,
    f: &mut impl FnMut(&Factored) -> bool,
) -> bool {
    let mut go = true;
    for_each_child(primes, base, next, hi, &mut |child, after| {
        if go && child.value >= lo {
            go = f(&child);
        }
        if go {
            go = walk_smooth(primes, child, after, lo, hi, f);
        }
    });
    go
}

/// Most members for which [`ToothSet::new`] builds the table of triples: 255² fits 16 bits.
pub const MAX_MEMBERS_FOR_TRIPLES: usize = 255;

/// A set of tooth counts with tables that count ordered products of its members.
#[derive(Debug, Clone)]
pub struct ToothSet {
    lo: u64,
    hi: u64,
    member: Vec<bool>,
    /// `pairs[x]`: ordered pairs of members whose product is `x`, for `x ≤ hi²`.
    pairs: Vec<u32>,
    /// `triples[x]`: ordered triples with product `x`, for `x ≤ hi³` (empty when not built).
    /// A triple is fixed by its first two members, so a count is at most members², which
    /// 16 bits hold for at most [`MAX_MEMBERS_FOR_TRIPLES`] members; the narrow entries keep the
    /// table (read at scattered places) half as large in the caches. Clones share it.
    triples: Arc<[u16]>,
}

impl ToothSet {
    /// The set of `members` (non-empty, each at least 1). `with_triples` builds the table that
    /// products of five and six members need (`hi³` entries), when there are at most
    /// [`MAX_MEMBERS_FOR_TRIPLES`] members (see [`ToothSet::supports`]).
    pub fn new(members: &[u32], with_triples: bool) -> ToothSet {
        let lo = members.iter().copied().min().unwrap_or(1).max(1) as u64;
        let hi = members.iter().copied().max().unwrap_or(1) as u64;
        let mut member = vec![false; hi as usize + 1];
        for &t in members {
            member[t as usize] = true;
        }
        let mut pairs = vec![0u32; (hi * hi) as usize + 1];
        for &a in members {
            for &b in members {
                pairs[a as usize * b as usize] += 1;
            }
        }
        let mut triples = Vec::new();
        let distinct = member.iter().filter(|&&m| m).count();
        if with_triples && distinct <= MAX_MEMBERS_FOR_TRIPLES {
            triples = vec![0u16; (hi * hi * hi) as usize + 1];
            for (x, &c) in pairs.iter().enumerate().filter(|(_, &c)| c > 0) {
                for &t in members {
                    // c ≤ members, and the sum over t stays within members² (see the field).
                    triples[x * t as usize] += c as u16;
                }
            }
        }
        ToothSet { lo, hi, member, pairs, triples: triples.into() }
    }

    /// Smallest member.
    pub fn lo(&self) -> u64 {
        self.lo
    }

    /// Largest member.
    pub fn hi(&self) -> u64 {
        self.hi
    }

    /// Is `t` a member?
    pub fn contains(&self, t: u64) -> bool {
        t <= self.hi && self.member[t as usize]
    }

    /// Can [`ToothSet::ordered_products`] take products of `factors` members?
    pub fn supports(&self, factors: u32) -> bool {
        factors <= 4 || (factors <= 6 && !self.triples.is_empty())
    }

    /// The number of tuples `(t₁, …, t_m)` of members with `∏ t_c^{powers[c]} = n`; `powers`
    /// sorted descending, their sum at most 4 (6 with triples).
    pub fn ordered_products(&self, n: &Factored, powers: &[u32]) -> u64 {
        self.ordered_products_in(n, powers, &mut Divisors::new())
    }

    /// [`ToothSet::ordered_products`], listing divisors in `divisors`: asked about the same
    /// number for several shapes in a row, it lists them once.
    pub fn ordered_products_in(&self, n: &Factored, powers: &[u32], divisors: &mut Divisors) -> u64 {
        match powers.first() {
            None => (n.value == 1) as u64,
            Some(&l) if l >= 2 => {
                // The `c` members raised to the same power `l` count by their product `y`
                // (`y^l` divides n): as many tuples as the ordered `c`-tuples with product `y`,
                // which the tables give at once for up to three members.
                let c = powers.iter().take_while(|&&x| x == l).count();
                let c = if c == 3 && self.triples.is_empty() { 1 } else { c as u32 };
                let rest = &powers[c as usize..];
                let pow = |x: u64| x.checked_pow(c).unwrap_or(u64::MAX);
                // Up to three single members are counted from the tables by their product
                // alone, which needs no factorisation of it.
                let by_value = rest.iter().all(|&x| x == 1)
                    && (rest.len() <= 2 || (rest.len() == 3 && !self.triples.is_empty()));
                let mut total = 0;
                n.root_part(l).for_each_divisor(pow(self.lo), pow(self.hi), &mut |y| {
                    let ways = self.ordered_of_value(y, c);
                    if ways > 0 {
                        // y divides the root part, so y^l divides n.
                        total += ways
                            * if by_value {
                                self.ordered_of_value(n.value / y.pow(l), rest.len() as u32)
                            } else {
                                self.ordered_products_in(&n.div_pow(y, l), rest, divisors)
                            };
                    }
                });
                total
            }
            Some(_) => self.ordered_ones(n, powers.len() as u32, divisors),
        }
    }

    /// Ordered `c`-tuples of members with product `y`, for `c` of 0 to 3 (3 with triples).
    fn ordered_of_value(&self, y: u64, c: u32) -> u64 {
        match c {
            0 => (y == 1) as u64,
            1 => self.contains(y) as u64,
            2 => self.pairs.get(y as usize).copied().unwrap_or(0) as u64,
            _ => self.triples.get(y as usize).copied().unwrap_or(0) as u64,
        }
    }

    /// Ordered `m`-tuples of members with product `n`. Four to six members split the product
    /// into a divisor and its cofactor, read from the list of every divisor of `n` (cheaper
    /// than a walk that prunes, and the cofactor comes without a division).
    fn ordered_ones(&self, n: &Factored, m: u32, divisors: &mut Divisors) -> u64 {
        let v = n.value;
        let (lo, hi) = (self.lo, self.hi);
        let pow = |x: u64, e: u32| x.checked_pow(e).unwrap_or(u64::MAX);
        if v < pow(lo, m) || v > pow(hi, m) {
            return 0;
        }
        let pairs = |x: u64| self.pairs.get(x as usize).copied().unwrap_or(0) as u64;
        let triples = |x: u64| self.triples.get(x as usize).copied().unwrap_or(0) as u64;
        // Products of two (three) members lie within these bounds, which the tables cover.
        let (two_lo, two_hi) = (lo * lo, hi * hi);
        let (three_lo, three_hi) = (two_lo * lo, two_hi * hi);
        let mut total = 0u64;
        match m {
            0 => total = (v == 1) as u64,
            1 => total = self.contains(v) as u64,
            2 => total = pairs(v),
            3 if !self.triples.is_empty() => total = triples(v),
            3 => n.for_each_divisor(lo.max(v.div_ceil(two_hi)), hi.min(v / two_lo), &mut |d| {
                if self.member[d as usize] {
                    total += pairs(v / d);
                }
            }),
            4 => {
                // Two pairs; each unordered split d·e with d < e counts twice.
                let list = divisors.of(n);
                for (&d, &e) in list.iter().zip(list.iter().rev()) {
                    if (two_lo..=two_hi).contains(&d) && (d..=two_hi).contains(&e) {
                        let w = self.pairs[d as usize] as u64 * self.pairs[e as usize] as u64;
                        total += if d < e { 2 * w } else { w };
                    }
                }
            }
            5 => {
                let list = divisors.of(n);
                for (&d, &e) in list.iter().zip(list.iter().rev()) {
                    if (two_lo..=two_hi).contains(&d) && (three_lo..=three_hi).contains(&e) {
                        let w = self.pairs[d as usize];
                        // The table of triples is large: read it only where a pair is.
                        if w > 0 {
                            total += w as u64 * self.triples[e as usize] as u64;
                        }
                    }
                }
            }
            6 => {
                let list = divisors.of(n);
                for (&d, &e) in list.iter().zip(list.iter().rev()) {
                    if (three_lo..=three_hi).contains(&d) && (d..=three_hi).contains(&e) {
                        let w = self.triples[d as usize] as u64 * self.triples[e as usize] as u64;
                        total += if d < e { 2 * w } else { w };
                    }
                }
            }
            _ => unreachable!("products of at most six members are counted"),
        }
        total
    }
}

/// Every divisor of one number, listed once and read by several counts of it.
#[derive(Debug, Default)]
pub struct Divisors {
    /// The number listed (0 before any).
    of: u64,
    /// Its divisors, ordered by their exponents read as a mixed-radix number (the first
    /// prime's exponent the lowest digit): the divisors at `i` and `len − 1 − i` then have
    /// complementary exponents, and multiply to the number.
    list: Vec<u64>,
}

impl Divisors {
    /// An empty list, to be filled when first asked.
    pub fn new() -> Divisors {
        Divisors::default()
    }

    /// The divisors of `n`, listed anew unless `n` was the number last asked for.
    pub fn of(&mut self, n: &Factored) -> &[u64] {
        if self.of != n.value {
            let len = n.powers().map(|(_, e)| e as usize + 1).product();
            self.list.clear();
            self.list.resize(len, 1);
            // The divisors of the primes before p fill `block` places; each further block of
            // as many is the one before times p.
            let mut block = 1;
            for (p, e) in n.powers() {
                for a in 1..=e as usize {
                    let (done, rest) = self.list.split_at_mut(a * block);
                    for (x, &y) in rest[..block].iter_mut().zip(&done[(a - 1) * block..]) {
                        *x = y * p as u64;
                    }
                }
                block *= e as usize + 1;
            }
            self.of = n.value;
        }
        &self.list
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn primes_are_the_primes() {
        assert_eq!(primes_up_to(30), vec![2, 3, 5, 7, 11, 13, 17, 19, 23, 29]);
        assert_eq!(primes_up_to(1000).len(), 168); // π(1000) = 168, common knowledge
        assert!(primes_up_to(1).is_empty());
    }

    #[test]
    fn divisors_are_listed_opposite_their_cofactors() {
        let primes = primes_up_to(130);
        let mut divisors = Divisors::new();
        for n in [1u64, 2, 12, 360, 720_720, 127 * 120, 2 * 3 * 5 * 7 * 11 * 13 * 17 * 19 * 23, 1 << 40, 12] {
            let f = Factored::of(n, &primes).unwrap();
            let list = divisors.of(&f).to_vec();
            for (&d, &e) in list.iter().zip(list.iter().rev()) {
                assert_eq!(d * e, n, "{d} and {e} in the list of {n}");
            }
            let mut sorted = list.clone();
            sorted.sort_unstable();
            let mut want = Vec::new();
            f.for_each_divisor(1, u64::MAX, &mut |d| want.push(d));
            want.sort_unstable();
            assert_eq!(sorted, want, "every divisor of {n} once");
        }
    }

    #[test]
    fn factorisation_round_trips() {
        let primes = primes_up_to(200);
        let f = Factored::of(127 * 120 * 120, &primes).unwrap();
        assert_eq!(f.powers().collect::<Vec<_>>(), vec![(2, 6), (3, 2), (5, 2), (127, 1)]);
        assert_eq!(Factored::of(211, &primes), None, "211 is a prime above the list");
        assert_eq!(Factored::of(0, &primes), None);
        let g = Factored::of(365, &primes).unwrap();
        let h = f.mul(&g).unwrap();
        assert_eq!(h.value(), 127 * 120 * 120 * 365);
        assert_eq!(Factored::of(h.value(), &primes), Some(h));
        assert_eq!(Factored::of(u64::MAX / 2, &primes), None);
        let big = Factored::of(1 << 62, &primes).unwrap();
        assert_eq!(big.mul(&Factored::of(4, &primes).unwrap()), None, "2^64 does not fit");
    }

    #[test]
    fn divisors_within_bounds_are_all_found_once() {
        let primes = primes_up_to(50);
        for n in [1u64, 2, 12, 360, 720_720, 2 * 3 * 5 * 7 * 11 * 13 * 17 * 19 * 23, 1 << 40] {
            let f = Factored::of(n, &primes).unwrap();
            for (lo, hi) in [(1, u64::MAX), (10, 1000), (7, 7), (100, 10)] {
                let mut got = Vec::new();
                f.for_each_divisor(lo, hi, &mut |d| got.push(d));
                got.sort_unstable();
                let want: Vec<u64> = (1..=n.min(2_000_000))
                    .filter(|d| n % d == 0 && (lo..=hi).contains(d))
                    .chain(if n > 2_000_000 && (lo..=hi).contains(&n) { Some(n) } else { None })
                    .collect();
                if n <= 2_000_000 {
                    assert_eq!(got, want, "divisors of {n} in {lo}..={hi}");
                } else {
                    assert!(got.iter().all(|d| n % d == 0 && (lo..=hi).contains(d)));
                    let mut dedup = got.clone();
                    dedup.dedup();
                    assert_eq!(dedup.len(), got.len());
                }
            }
        }
    }

    #[test]
    fn the_smooth_numbers_are_walked_once() {
        let primes = primes_up_to(7);
        let want: Vec<u64> =
            (1..=5000u64).filter(|&k| Factored::of(k, &primes).is_some() && k >= 30).collect();
        let mut got = Vec::new();
        for_each_smooth(&primes, 30, 5000, &mut |k| {
            assert_eq!(Factored::of(k.value(), &primes).as_ref(), Some(k));
            got.push(k.value());
            true
        });
        got.sort_unstable();
        assert_eq!(got, want);
    }

    #[test]
    fn triples_are_built_only_where_sixteen_bits_hold_them() {
        // 1..=255 gives the largest counts the bound allows; debug builds would stop on an
        // overflow of a 16-bit entry while the table is built.
        let few: Vec<u32> = (1..=255).collect();
        let set = ToothSet::new(&few, true);
        assert!(set.supports(6));
        let f = Factored::of(2 * 3 * 4 * 5 * 6 * 8, &primes_up_to(255)).unwrap();
        assert_eq!(set.ordered_products(&f, &[1, 1, 1]), brute(&few, f.value(), &[1, 1, 1]));
        let many: Vec<u32> = (1..=256).collect();
        let set = ToothSet::new(&many, true);
        assert!(set.supports(4) && !set.supports(5), "no table of triples past 255 members");
    }

    /// Brute force: tuples of members with the weighted product.
    fn brute(members: &[u32], n: u64, powers: &[u32]) -> u64 {
        match powers.split_first() {
            None => (n == 1) as u64,
            Some((&l, rest)) => members
                .iter()
                .map(|&t| (t as u64).pow(l))
                .filter(|&tl| n % tl == 0)
                .map(|tl| brute(members, n / tl, rest))
                .sum(),
        }
    }

    #[test]
    fn ordered_products_match_brute_force() {
        let members: Vec<u32> = vec![2, 3, 4, 6, 7, 9, 10, 12];
        let set = ToothSet::new(&members, true);
        let primes = primes_up_to(12);
        let shapes: [&[u32]; 14] = [
            &[],
            &[1],
            &[1, 1],
            &[1, 1, 1],
            &[1, 1, 1, 1],
            &[1, 1, 1, 1, 1],
            &[1, 1, 1, 1, 1, 1],
            &[2],
            &[2, 1, 1],
            &[2, 2],
            &[3, 1],
            &[4],
            &[3, 2, 1],
            &[2, 2, 1, 1],
        ];
        // One list of divisors carried from number to number and shape to shape, as the
        // factor engine carries it.
        let mut shared = Divisors::new();
        for n in 1..=5000u64 {
            let Some(f) = Factored::of(n, &primes) else { continue };
            for powers in shapes {
                let want = brute(&members, n, powers);
                assert_eq!(set.ordered_products(&f, powers), want, "{n} as {powers:?}");
                assert_eq!(
                    set.ordered_products_in(&f, powers, &mut shared),
                    want,
                    "{n} as {powers:?}, shared"
                );
            }
        }
        // A product of six members near the top of the range.
        let f = Factored::of(12u64.pow(5) * 9, &primes).unwrap();
        assert_eq!(set.ordered_products(&f, &[1; 6]), brute(&members, f.value(), &[1; 6]));
    }
}
