//! The planetary trade held to computations that do not share its code: Willis' equation
//! against the tabular (superposition) method, the search's count and listing against a brute
//! force over every (Zs, Zp, Zr, N) that recomputes each condition from its plain formula, the
//! search's pruning against the per-design judge, and worked examples.

use std::cmp::Ordering;
use std::sync::atomic::{AtomicU32, Ordering as AtomicOrdering};

use gearsieve::geometry::MeshLimits;
use gearsieve::model::train::Direction;
use gearsieve::numbers::range::IntRange;
use gearsieve::numbers::rational::Ratio;
use gearsieve::trades::planetary::conditions::{check_design, Condition, Design, Unmet};
use gearsieve::trades::planetary::layout::Gear;
use gearsieve::trades::planetary::{
    search, search_explained, Arrangement, Member, PlanetaryOutcome, PlanetaryProblem, PlanetarySpec,
    Spacing, Teeth,
};
use proptest::prelude::*;
use proptest::test_runner::TestCaseError;

const MEMBERS: [Member; 3] = [Member::Sun, Member::Ring, Member::Carrier];

fn range(lo: u32, hi: u32) -> IntRange {
    IntRange { lo, hi }
}

/// Speeds of (sun or held ring, ring or output ring, carrier) by the tabular method (common
/// practice): lock the whole train and turn it `u` times, then hold the carrier and turn the
/// first central member so the gears carry the motion through each mesh (an external mesh
/// reverses, an internal one does not); choose `u` so the held member ends at rest.
/// Returned as whole numbers proportional to the speeds.
fn tabular_speeds(teeth: &Teeth, fixed: usize) -> [i128; 3] {
    let w = i128::from;
    // With the carrier held, the first central member turning by `first` turns the second by
    // `second` (both scaled to whole numbers).
    let (first, second) = match *teeth {
        // The sun turning Zp·Zr times turns the planet −Zs·Zr times (external mesh: reversed)
        // and the ring −Zs·Zp times (internal mesh: the planet's sense).
        Teeth::Simple { sun, planet, ring } => (w(planet) * w(ring), -w(sun) * w(planet)),
        // The sun turning Zp1·Zr times turns the planet −Zs·Zr times through its first gear;
        // its second gear turns the ring −Zs·Zp2 times.
        Teeth::Stepped { sun, planet, ring } => (w(planet[0]) * w(ring), -w(sun) * w(planet[1])),
        // The held ring turning Zp1·Zr2 times turns the planet Zr1·Zr2 times (internal: same
        // sense), whose second gear turns the output ring Zr1·Zp2 times.
        Teeth::TwoRing { planet, ring } => (w(planet[0]) * w(ring[1]), w(ring[0]) * w(planet[1])),
    };
    let carrier_held = [first, second, 0];
    // Locked turns: u on every member; pick u so the held member is at rest.
    let u = -carrier_held[fixed];
    [u + carrier_held[0], u + carrier_held[1], u + carrier_held[2]]
}

/// Input over output speed from the tabular method as a signed fraction, or `None` when the
/// output (or the input) stands still.
fn tabular_ratio(teeth: &Teeth, fixed: usize, input: usize) -> Option<(i128, i128)> {
    let n = tabular_speeds(teeth, fixed);
    let output = (0..3).find(|&k| k != fixed && k != input)?;
    (n[input] != 0 && n[output] != 0).then_some((n[input], n[output]))
}

fn slot(m: Member) -> usize {
    match m {
        Member::Sun => 0,
        Member::Ring => 1,
        Member::Carrier => 2,
    }
}

/// Does the library's signed ratio equal the fraction `a/b`? By cross-multiplication.
fn same_ratio(got: gearsieve::trades::planetary::SpeedRatio, (a, b): (i128, i128)) -> bool {
    let sign = if got.direction == Direction::Same { 1 } else { -1 };
    a * i128::from(got.magnitude.den()) == sign * i128::from(got.magnitude.num()) * b
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    #[test]
    fn willis_equation_agrees_with_the_tabular_method(
        sun in 8u32..80, p1 in 8u32..60, p2 in 8u32..60, extra in 0u32..30,
    ) {
        let ring = sun + p1 + p2 + extra;
        for teeth in [Teeth::Simple { sun, planet: p1, ring }, Teeth::Stepped { sun, planet: [p1, p2], ring }] {
            for fixed in MEMBERS {
                for input in MEMBERS {
                    let arrangement = match teeth {
                        Teeth::Simple { .. } => Arrangement::Simple { fixed, input },
                        _ => Arrangement::Stepped { fixed, input },
                    };
                    let got = arrangement.ratio(&teeth);
                    match tabular_ratio(&teeth, slot(fixed), slot(input)) {
                        Some(want) if fixed != input => {
                            let got = got.unwrap();
                            prop_assert!(same_ratio(got, want), "{teeth:?} {fixed:?}/{input:?}: {got} vs {want:?}");
                        }
                        _ => prop_assert_eq!(got, None),
                    }
                }
            }
        }
        // The two-ring train: first ring held (slot 0), carrier driving (slot 2).
        let two = Teeth::TwoRing { planet: [p1, p2], ring: [p1 + extra + 10, p2 + extra + 10] };
        match tabular_ratio(&two, 0, 2) {
            Some(want) => prop_assert!(same_ratio(Arrangement::TwoRing.ratio(&two).unwrap(), want)),
            None => prop_assert_eq!(Arrangement::TwoRing.ratio(&two), None),
        }
    }
}

/// `| |a|/|b| / (P/Q) − 1 | ≤ t`, decided by cross-multiplication in the test's own integers.
fn within(a: i128, b: i128, target: Ratio, tol: Ratio) -> bool {
    let (a, b) = (a.unsigned_abs(), b.unsigned_abs());
    let (p, q) = (u128::from(target.num()), u128::from(target.den()));
    let difference = (a * q).abs_diff(b * p);
    difference * u128::from(tol.den()) <= u128::from(tol.num()) * b * p
}

/// A design as the brute force sees it: teeth, planets, and its error as an exact fraction.
#[derive(Debug, Clone, Copy)]
struct Found {
    teeth: Teeth,
    planets: u32,
    /// Signed error numerator `|a|·Q − |b|·P` and denominator `|b|·P`.
    error: (i128, i128),
}

/// The ranking as documented: |error| exactly, negative before positive, ring size, planets,
/// teeth.
fn brute_rank(x: &Found, y: &Found) -> Ordering {
    let mag = |f: &Found| (f.error.0.abs(), f.error.1);
    let (xm, ym) = (mag(x), mag(y));
    (xm.0 * ym.1)
        .cmp(&(ym.0 * xm.1))
        .then_with(|| x.error.0.signum().cmp(&y.error.0.signum()))
        .then_with(|| x.teeth.largest_ring().cmp(&y.teeth.largest_ring()))
        .then_with(|| x.planets.cmp(&y.planets))
        .then_with(|| x.teeth.cmp(&y.teeth))
}

/// Every simple-train design in the ranges of `spec`, by the plain conditions: ratio by the
/// tabular method, unshifted coaxiality `Zr = Zs + 2·Zp`, `(Zs + Zr)/N` whole (or the nearest
/// places), and `2·a·sin(π·step/L) − m(Zp + 2) > margin` with `a = m(Zs + Zp)/2`. Needs sun and
/// planets of at least 18 teeth, so that no gear takes a shift against undercut and every tip is
/// `m(z + 2)`.
fn brute_force_simple(spec: &PlanetarySpec) -> Vec<Found> {
    let Arrangement::Simple { fixed, input } = spec.arrangement else { unreachable!() };
    assert!(spec.sun_teeth.lo >= 18 && spec.planet_teeth.lo >= 18 && spec.shift_sum == (0.0, 0.0));
    let m = spec.module_mm;
    let mut found = Vec::new();
    for sun in spec.sun_teeth.lo..=spec.sun_teeth.hi {
        for planet in spec.planet_teeth.lo..=spec.planet_teeth.hi {
            for ring in spec.ring_teeth.lo..=spec.ring_teeth.hi {
                let teeth = Teeth::Simple { sun, planet, ring };
                let Some((a, b)) = tabular_ratio(&teeth, slot(fixed), slot(input)) else { continue };
                if !within(a, b, spec.ratio, spec.tolerance) {
                    continue;
                }
                let same = (a > 0) == (b > 0);
                if spec.direction.is_some_and(|d| (d == Direction::Same) != same) {
                    continue;
                }
                if ring != sun + 2 * planet {
                    continue;
                }
                for n in spec.planets.lo..=spec.planets.hi {
                    let l = u64::from(sun + ring);
                    let step = match spec.spacing {
                        Spacing::Equal if l % u64::from(n) == 0 => l / u64::from(n),
                        Spacing::Equal => continue,
                        Spacing::NearEqual if l < u64::from(n) => continue,
                        Spacing::NearEqual => {
                            let place = |k: u64| ((k as f64) * l as f64 / f64::from(n) + 0.5).floor() as u64;
                            (0..u64::from(n)).map(|k| place(k + 1) - place(k)).min().unwrap()
                        }
                    };
                    let centre = m * f64::from(sun + planet) / 2.0;
                    let gap = 2.0 * centre * (std::f64::consts::PI * step as f64 / l as f64).sin()
                        - m * f64::from(planet + 2);
                    if gap <= spec.tip_clearance_mm {
                        continue;
                    }
                    let (p, q) = (i128::from(spec.ratio.num()), i128::from(spec.ratio.den()));
                    let error = (a.abs() * q - b.abs() * p, b.abs() * p);
                    found.push(Found { teeth, planets: n, error });
                }
            }
        }
    }
    found.sort_by(brute_rank);
    found
}

fn listed(outcome: &PlanetaryOutcome) -> Vec<(Teeth, u32)> {
    outcome.designs.iter().map(|d| (d.teeth, d.planets)).collect()
}

fn arb_drive() -> impl Strategy<Value = (Member, Member)> {
    (0usize..3, 1usize..3).prop_map(|(f, step)| (MEMBERS[f], MEMBERS[(f + step) % 3]))
}

/// Runs `case` on `cases` random inputs from `strategy` (failing inputs are shrunk and
/// reported as by `proptest!`) and returns how many found at least one design, so a test can
/// make sure its comparisons were not all of empty results.
fn run_cases<S: Strategy>(
    cases: u32,
    strategy: S,
    case: impl Fn(S::Value) -> Result<u64, TestCaseError>,
) -> u32
where
    S::Value: std::fmt::Debug,
{
    let found = AtomicU32::new(0);
    // A fixed seed: the callers assert that enough cases find designs, which a random draw of
    // a dozen cases does not always give.
    let mut runner = proptest::test_runner::TestRunner::new_with_rng(
        ProptestConfig::with_cases(cases),
        proptest::test_runner::TestRng::deterministic_rng(proptest::test_runner::RngAlgorithm::ChaCha),
    );
    let outcome = runner.run(&strategy, |input| {
        if case(input)? > 0 {
            found.fetch_add(1, AtomicOrdering::Relaxed);
        }
        Ok(())
    });
    if let Err(e) = outcome {
        panic!("{e}");
    }
    found.into_inner()
}

#[test]
fn simple_count_and_listing_equal_the_brute_force() {
    let strategy = (
        arb_drive(),
        (18u32..30, 0u32..20, 18u32..30, 0u32..20, 0u32..30, 0u32..60),
        (2u32..4, 0u32..4),
        (0u32..20, 0u32..20),
        (0usize..4, any::<bool>(), 0usize..3, 0.0f64..3.0),
    );
    let found = run_cases(
        64,
        strategy,
        |((fixed, input), ranges, planets, target, (tol, near, direction, margin))| {
            let (sun_lo, sun_span, planet_lo, planet_span, below, ring_span) = ranges;
            // A target from teeth inside the ranges, so that some designs hit it.
            let ts = sun_lo + target.0 % (sun_span + 1);
            let tp = planet_lo + target.1 % (planet_span + 1);
            let aim = Teeth::Simple { sun: ts, planet: tp, ring: ts + 2 * tp };
            let (ring_lo, ring_span) = (ts + 2 * tp - below, ring_span.max(below));
            let Some(ratio) = Arrangement::Simple { fixed, input }.ratio(&aim) else { return Ok(0) };
            let tolerance = [
                Ratio::integer(0),
                Ratio::new(1, 1000).unwrap(),
                Ratio::new(1, 50).unwrap(),
                Ratio::new(1, 5).unwrap(),
            ][tol];
            let spec = PlanetarySpec {
                arrangement: Arrangement::Simple { fixed, input },
                ratio: ratio.magnitude,
                tolerance,
                direction: [None, Some(Direction::Same), Some(Direction::Opposite)][direction],
                sun_teeth: range(sun_lo, sun_lo + sun_span),
                planet_teeth: range(planet_lo, planet_lo + planet_span),
                ring_teeth: range(ring_lo, ring_lo + ring_span),
                planets: range(planets.0, planets.0 + planets.1),
                spacing: if near { Spacing::NearEqual } else { Spacing::Equal },
                tip_clearance_mm: margin,
                limit: 7,
                ..PlanetarySpec::reduction(Ratio::integer(1))
            };
            let problem = PlanetaryProblem::new(spec.clone()).unwrap();
            let outcome = search(&problem);
            let brute = brute_force_simple(&spec);
            prop_assert_eq!(outcome.count, brute.len() as u64);
            let want: Vec<(Teeth, u32)> = brute.iter().take(7).map(|f| (f.teeth, f.planets)).collect();
            prop_assert_eq!(listed(&outcome), want);
            Ok(outcome.count)
        },
    );
    assert!(found >= 16, "only {found} of 64 cases found designs");
}

/// Every candidate in the ranges of `problem`, each set of tooth counts with each planet count,
/// judged one by one by [`check_design`].
fn judge_each(problem: &PlanetaryProblem) -> Vec<(Teeth, u32, Result<Design, Vec<Unmet>>)> {
    let spec = problem.spec();
    let range = |gear| {
        let r: IntRange = spec.range_of(gear);
        r.lo..=r.hi
    };
    let mut all = Vec::new();
    let mut each = |teeth: Teeth| {
        for n in spec.planets.lo..=spec.planets.hi {
            all.push((teeth, n, check_design(problem, &teeth, n)));
        }
    };
    match spec.arrangement {
        Arrangement::Simple { .. } => {
            for sun in range(Gear::Sun) {
                for planet in range(Gear::Planet) {
                    for ring in range(Gear::Ring) {
                        each(Teeth::Simple { sun, planet, ring });
                    }
                }
            }
        }
        Arrangement::Stepped { .. } => {
            for sun in range(Gear::Sun) {
                for p1 in range(Gear::PlanetSun) {
                    for p2 in range(Gear::PlanetRing) {
                        for ring in range(Gear::Ring) {
                            each(Teeth::Stepped { sun, planet: [p1, p2], ring });
                        }
                    }
                }
            }
        }
        Arrangement::TwoRing => {
            for p1 in range(Gear::PlanetRing) {
                for p2 in range(Gear::PlanetRing2) {
                    for r1 in range(Gear::Ring) {
                        for r2 in range(Gear::Ring2) {
                            each(Teeth::TwoRing { planet: [p1, p2], ring: [r1, r2] });
                        }
                    }
                }
            }
        }
    }
    all
}

/// Every design in the ranges of `problem` judged one by one by [`check_design`], ranked as
/// documented.
fn judge_everything(problem: &PlanetaryProblem) -> Vec<Design> {
    let mut all: Vec<Design> = judge_each(problem).into_iter().filter_map(|(_, _, d)| d.ok()).collect();
    let key = |d: &Design| Found {
        teeth: d.teeth,
        planets: d.planets,
        error: {
            let e = d.error;
            let sign = i128::from(e.sign);
            (sign * e.abs_num as i128, e.den as i128)
        },
    };
    all.sort_by(|a, b| brute_rank(&key(a), &key(b)));
    all
}

fn judged_spec(arrangement: Arrangement, ratio: Ratio, tolerance: Ratio, offset: f64) -> PlanetarySpec {
    PlanetarySpec {
        arrangement,
        ratio,
        tolerance,
        shift_sum: (-0.2, 1.0),
        carrier_offset_modules: offset,
        mesh_limits: Some(MeshLimits { allow_undercut: true, ..MeshLimits::default() }),
        planets: range(2, 5),
        limit: 5,
        ..PlanetarySpec::reduction(Ratio::integer(1))
    }
}

/// Ranges where designs of `arrangement` exist with the meshes checked, shifted by `lo`, and a
/// design inside them to aim the ratio at.
fn judged_ranges(
    arrangement: Arrangement,
    lo: u32,
    aim: (u32, u32, u32),
) -> (IntRange, IntRange, IntRange, Teeth) {
    let (a, b, c) = aim;
    match arrangement {
        Arrangement::Simple { .. } => (
            range(20 + lo, 32 + lo),
            range(20 + lo, 34 + lo),
            range(60 + lo, 100 + lo),
            Teeth::Simple { sun: 20 + lo + a, planet: 20 + lo + b, ring: 60 + 3 * lo + a + 2 * b },
        ),
        Arrangement::Stepped { .. } => (
            range(20 + lo, 26 + lo),
            range(20 + lo, 30 + lo),
            range(64 + lo, 84 + lo),
            Teeth::Stepped {
                sun: 20 + lo + a % 7,
                planet: [20 + lo + b % 11, 20 + lo + c % 11],
                ring: 70 + lo,
            },
        ),
        Arrangement::TwoRing => (
            range(3, 3),
            range(20 + lo, 28 + lo),
            range(70 + lo, 90 + lo),
            Teeth::TwoRing { planet: [20 + lo + b % 9, 20 + lo + c % 9], ring: [78 + lo + a % 5, 80 + lo] },
        ),
    }
}

#[test]
fn search_with_shifts_and_mesh_checks_equals_the_judge() {
    let strategy = (
        arb_drive(),
        0usize..3,
        0u32..8,
        (0u32..12, 0u32..14, 0u32..14),
        (0usize..3, any::<bool>()),
        prop_oneof![Just(0.0), Just(0.5), -0.3f64..0.8],
    );
    let found = run_cases(32, strategy, |((fixed, input), arrangement, lo, aim, (tol, near), offset)| {
        let arrangement = [
            Arrangement::Simple { fixed, input },
            Arrangement::Stepped { fixed, input },
            Arrangement::TwoRing,
        ][arrangement];
        let (sun, planet, ring, aim) = judged_ranges(arrangement, lo, aim);
        let Some(ratio) = arrangement.ratio(&aim) else { return Ok(0) };
        let tolerance =
            [Ratio::new(1, 100).unwrap(), Ratio::new(1, 20).unwrap(), Ratio::new(1, 5).unwrap()][tol];
        let spec = PlanetarySpec {
            sun_teeth: sun,
            planet_teeth: planet,
            ring_teeth: ring,
            spacing: if near { Spacing::NearEqual } else { Spacing::Equal },
            ..judged_spec(arrangement, ratio.magnitude, tolerance, offset)
        };
        let problem = PlanetaryProblem::new(spec).unwrap();
        let outcome = search(&problem);
        let judged = judge_everything(&problem);
        prop_assert_eq!(outcome.count, judged.len() as u64);
        let want: Vec<(Teeth, u32)> = judged.iter().take(5).map(|d| (d.teeth, d.planets)).collect();
        prop_assert_eq!(listed(&outcome), want);
        prop_assert_eq!(&outcome.designs[..], &judged[..outcome.designs.len()]);
        Ok(outcome.count)
    });
    assert!(found >= 4, "only {found} of 32 cases found designs");
}

#[test]
fn explained_search_counts_each_candidate_under_its_first_unmet_condition() {
    let strategy = (
        arb_drive(),
        0usize..3,
        0u32..6,
        (0u32..12, 0u32..14, 0u32..14),
        (0usize..3, any::<bool>(), any::<bool>()),
        (prop_oneof![Just(0.0), Just(0.5)], any::<bool>(), 0usize..3),
    );
    let seen = std::sync::Mutex::new(std::collections::BTreeSet::new());
    let found = run_cases(
        12,
        strategy,
        |((fixed, input), arrangement, lo, aim, (tol, near, second), (offset, checked, direction))| {
            let arrangement = [
                Arrangement::Simple { fixed, input },
                Arrangement::Stepped { fixed, input },
                Arrangement::TwoRing,
            ][arrangement];
            let (sun, planet, ring, aim) = judged_ranges(arrangement, lo, aim);
            let Some(ratio) = arrangement.ratio(&aim) else { return Ok(0) };
            let tolerance =
                [Ratio::new(1, 100).unwrap(), Ratio::new(1, 20).unwrap(), Ratio::new(1, 5).unwrap()][tol];
            let base = judged_spec(arrangement, ratio.magnitude, tolerance, offset);
            let spec = PlanetarySpec {
                sun_teeth: sun,
                planet_teeth: planet,
                ring_teeth: ring,
                // Planet gears and the output ring in ranges of their own.
                planet_ring_teeth: (second && arrangement != Arrangement::Simple { fixed, input })
                    .then_some(range(planet.lo, planet.lo + 6)),
                planet_ring2_teeth: (second && arrangement == Arrangement::TwoRing)
                    .then_some(range(planet.lo + 2, planet.hi)),
                output_ring_teeth: (second && arrangement == Arrangement::TwoRing)
                    .then_some(range(ring.lo + 6, ring.hi)),
                spacing: if near { Spacing::NearEqual } else { Spacing::Equal },
                mesh_limits: if checked { base.mesh_limits } else { None },
                direction: [None, Some(Direction::Same), Some(Direction::Opposite)][direction],
                ..base
            };
            let problem = PlanetaryProblem::new(spec).unwrap();
            let plain = search(&problem);
            let explained = search_explained(&problem);
            prop_assert_eq!(plain.left_out.as_ref(), None);
            prop_assert_eq!(explained.count, plain.count);
            prop_assert_eq!(&explained.designs, &plain.designs);
            let left = explained.left_out.unwrap();
            // Candidate by candidate: the first condition check_design names, and the first
            // candidate (by tooth counts, then planets) of each condition with its complaint.
            let judged = judge_each(&problem);
            let mut want: Vec<(Condition, u64, Teeth, u32, Unmet)> = Vec::new();
            let mut passed = 0u64;
            for (teeth, planets, verdict) in &judged {
                let first = match verdict {
                    Ok(_) => {
                        passed += 1;
                        continue;
                    }
                    Err(unmet) => unmet[0].clone(),
                };
                match want.iter_mut().find(|w| w.0 == first.condition()) {
                    Some(w) => {
                        w.1 += 1;
                        if (*teeth, *planets) < (w.2, w.3) {
                            (w.2, w.3, w.4) = (*teeth, *planets, first);
                        }
                    }
                    None => want.push((first.condition(), 1, *teeth, *planets, first)),
                }
            }
            want.sort_by_key(|w| w.0);
            prop_assert_eq!(left.candidates, judged.len() as u64);
            prop_assert_eq!(passed, explained.count);
            let got: Vec<(Condition, u64, Teeth, u32, Unmet)> = left
                .conditions
                .iter()
                .map(|c| (c.condition, c.count, c.teeth, c.planets, c.unmet.clone()))
                .collect();
            prop_assert_eq!(got, want);
            seen.lock().unwrap().extend(left.conditions.iter().map(|c| c.condition));
            Ok(explained.count)
        },
    );
    assert!(found >= 2, "only {found} of 12 cases found designs");
    // The cases reached the conditions that matter, not only the ratio.
    let seen = seen.into_inner().unwrap();
    for condition in [Condition::Ratio, Condition::Coaxiality, Condition::Assembly] {
        assert!(seen.contains(&condition), "{condition} never left anything out: {seen:?}");
    }
}

#[test]
fn the_judged_cases_find_designs_of_every_arrangement() {
    // The property test above would pass on two empty results; make sure cases like it find
    // designs of every arrangement with the meshes checked, shifted ones among them.
    for arrangement in [
        Arrangement::Simple { fixed: Member::Ring, input: Member::Sun },
        Arrangement::Stepped { fixed: Member::Ring, input: Member::Sun },
        Arrangement::TwoRing,
    ] {
        let (sun, planet, ring, aim) = judged_ranges(arrangement, 2, (4, 6, 3));
        let ratio = arrangement.ratio(&aim).unwrap();
        let spec = PlanetarySpec {
            sun_teeth: sun,
            planet_teeth: planet,
            ring_teeth: ring,
            ..judged_spec(arrangement, ratio.magnitude, Ratio::new(1, 20).unwrap(), 0.5)
        };
        let problem = PlanetaryProblem::new(spec).unwrap();
        let outcome = search(&problem);
        let judged = judge_everything(&problem);
        assert_eq!(outcome.count, judged.len() as u64);
        assert!(outcome.count >= 10, "{arrangement:?}: {}", outcome.count);
        assert!(judged.iter().all(|d| d.carrier.mesh_shift.iter().all(|&x| x > 0.0)), "{arrangement:?}");
        // Unchecked meshes let more through.
        let loose = PlanetarySpec { mesh_limits: None, ..problem.spec().clone() };
        assert!(search(&PlanetaryProblem::new(loose).unwrap()).count >= outcome.count);
    }
}

#[test]
fn results_do_not_depend_on_the_thread_count() {
    let spec = PlanetarySpec {
        arrangement: Arrangement::Stepped { fixed: Member::Ring, input: Member::Sun },
        ratio: Ratio::new(37, 4).unwrap(),
        tolerance: Ratio::new(1, 100).unwrap(),
        sun_teeth: range(12, 40),
        planet_teeth: range(12, 40),
        ring_teeth: range(40, 120),
        shift_sum: (-0.5, 0.5),
        spacing: Spacing::NearEqual,
        limit: 25,
        ..PlanetarySpec::reduction(Ratio::integer(1))
    };
    let problem = PlanetaryProblem::new(spec).unwrap();
    let run = |threads| {
        rayon::ThreadPoolBuilder::new().num_threads(threads).build().unwrap().install(|| search(&problem))
    };
    let one = run(1);
    assert!(one.count > 25, "{}", one.count);
    for threads in [2, 3, 8] {
        assert_eq!(run(threads), one, "{threads} threads");
    }
}

#[test]
fn listed_designs_are_what_they_claim() {
    let spec = PlanetarySpec {
        ratio: Ratio::new(61, 10).unwrap(),
        tolerance: Ratio::new(1, 200).unwrap(),
        ring_teeth: range(40, 200),
        shift_sum: (-0.5, 0.8),
        spacing: Spacing::NearEqual,
        limit: 40,
        ..PlanetarySpec::reduction(Ratio::integer(1))
    };
    let problem = PlanetaryProblem::new(spec.clone()).unwrap();
    let outcome = search(&problem);
    assert_eq!(outcome.designs.len(), 40);
    for d in &outcome.designs {
        // Ratio from the teeth by the tabular method, ring held (1), sun driving (0).
        let (a, b) = tabular_ratio(&d.teeth, 1, 0).unwrap();
        assert!(same_ratio(d.ratio, (a, b)));
        assert!(within(a, b, spec.ratio, spec.tolerance));
        // The planets clear by the margin at the angles listed.
        let step = d.positions.smallest_step() as f64 / d.positions.places as f64;
        let tip = d.carrier.planet_tip_diameter_mm[0];
        let gap = 2.0 * d.carrier.centre_distance_mm * (std::f64::consts::PI * step).sin() - tip;
        assert!((gap - d.neighbour_gap_mm).abs() < 1e-9 && gap > spec.tip_clearance_mm);
        assert_eq!(d.positions.at.len() as u32, d.planets);
    }
    // Best first: the errors never shrink down the list.
    for pair in outcome.designs.windows(2) {
        assert_ne!(pair[0].error.cmp_abs(&pair[1].error), Ordering::Greater);
    }
}

#[test]
fn ratio_five_from_the_default_ranges() {
    // Worked by hand from the conditions (check-values.md relations, from memory): ratio 5
    // with the ring held needs Zr = 4·Zs, and coaxiality Zp = 1.5·Zs, so Zs is even. 12/18/48
    // has 60 places: 3 planets clear (30·sin 60° = 25.98 > 20 + 1 mm), so do 4
    // (30·sin 45° = 21.21 > 21), 5 do not (30·sin 36° = 17.63). 14/21/56 has 70 places, a
    // multiple of neither 3, 4 nor 6, and 5 planets would overlap (35·sin 36° = 20.57 < 24).
    // 16/24/64 has 80 places: not 3, but 4 (40·sin 45° = 28.28 > 27).
    let problem = PlanetaryProblem::new(PlanetarySpec::reduction(Ratio::integer(5))).unwrap();
    let outcome = search(&problem);
    let first: Vec<(Teeth, u32)> = listed(&outcome).into_iter().take(3).collect();
    assert_eq!(
        first,
        vec![
            (Teeth::Simple { sun: 12, planet: 18, ring: 48 }, 3),
            (Teeth::Simple { sun: 12, planet: 18, ring: 48 }, 4),
            (Teeth::Simple { sun: 16, planet: 24, ring: 64 }, 4),
        ]
    );
    assert!(outcome.designs.iter().all(|d| d.error.is_exact()));
}

#[test]
fn stepped_and_two_ring_examples() {
    // Computed: Zs 20, Zp1 40, Zp2 20, Zr 80 — coaxial (20 + 40 = 80 − 20), ring held, sun
    // driving: 1 + (80·40)/(20·20) = 9; places (20·20 + 80·40)/gcd(40, 20) = 180, so 3, 4, 5
    // or 6 equally spaced planets assemble.
    let stepped = PlanetarySpec {
        arrangement: Arrangement::Stepped { fixed: Member::Ring, input: Member::Sun },
        ratio: Ratio::integer(9),
        sun_teeth: range(20, 20),
        planet_teeth: range(20, 40),
        ring_teeth: range(80, 80),
        tip_clearance_mm: 0.0,
        ..PlanetarySpec::reduction(Ratio::integer(1))
    };
    let problem = PlanetaryProblem::new(stepped).unwrap();
    let teeth = Teeth::Stepped { sun: 20, planet: [40, 20], ring: 80 };
    let d = check_design(&problem, &teeth, 3).unwrap();
    assert_eq!(d.ratio.to_string(), "9");
    assert_eq!(d.positions.places, 180);
    // Neighbouring 42 mm tips on a 30 mm carrier radius: 60·sin 60° = 51.96 > 42 for three,
    // 60·sin 45° = 42.43 > 42 for four, 60·sin 36° = 35.27 < 42 for five.
    assert!(check_design(&problem, &teeth, 4).is_ok());
    assert!(check_design(&problem, &teeth, 5).is_err());
    // Computed: a two-ring train with Zp1 20, Zp2 21, Zr1 80, Zr2 82 (coaxial up to one tooth:
    // 80 − 20 = 60, 82 − 21 = 61) gives −41 with the carrier driving: places
    // |82·20 − 80·21| / gcd(20, 21) = 40, so 4 or 5 planets but not 3.
    let two = PlanetarySpec {
        arrangement: Arrangement::TwoRing,
        ratio: Ratio::integer(41),
        direction: Some(Direction::Opposite),
        planet_teeth: range(18, 22),
        ring_teeth: range(78, 84),
        shift_sum: (-0.5, 0.5),
        tip_clearance_mm: 0.5,
        ..PlanetarySpec::reduction(Ratio::integer(1))
    };
    let problem = PlanetaryProblem::new(two).unwrap();
    let teeth = Teeth::TwoRing { planet: [20, 21], ring: [80, 82] };
    let d = check_design(&problem, &teeth, 4).unwrap();
    assert_eq!(d.ratio.to_string(), "-41");
    assert_eq!(d.positions.places, 40);
    assert!(d.carrier.mesh_shift[0] > 0.0 && d.carrier.mesh_shift[1] < 0.0);
    assert!(check_design(&problem, &teeth, 3).is_err());
    let outcome = search(&problem);
    assert!(listed(&outcome).contains(&(teeth, 4)));
}
