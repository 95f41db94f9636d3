//! The defect vocabulary of a mesh: which gear of a pair is meant ([`GearRef`], [`Role`]) and
//! what can be wrong with a pair ([`MeshDefect`]), each in shop words. It owns the words only;
//! the geometry that finds a defect is in [`super::working`] and [`super::check`].

use std::fmt;

/// Which gear of a pair a defect concerns, with enough to name it in a message.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub struct GearRef {
    /// Position in the pair, 0 or 1 (the index into the `[_; 2]` fields of [`MeshGeometry`](super::MeshGeometry)).
    pub index: usize,
    /// Its tooth count.
    pub teeth: u32,
    /// Pinion or wheel, by tooth count.
    pub role: Role,
}

/// The part a gear plays in its pair, by size.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum Role {
    /// The gear with fewer teeth.
    Pinion,
    /// The gear with more teeth.
    Wheel,
    /// Both gears have the same tooth count.
    Twin,
}

impl GearRef {
    /// Gear `index` of a pair with `teeth`; `index` is 0 or 1, and anything larger is taken as 1.
    pub fn of(teeth: [u32; 2], index: usize) -> GearRef {
        let index = index.min(1);
        let (own, other) = (teeth[index], teeth[1 - index]);
        let role = match own.cmp(&other) {
            std::cmp::Ordering::Less => Role::Pinion,
            std::cmp::Ordering::Greater => Role::Wheel,
            std::cmp::Ordering::Equal => Role::Twin,
        };
        GearRef { index, teeth: own, role }
    }
}

impl fmt::Display for GearRef {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.role {
            Role::Pinion => write!(f, "the {}-tooth pinion", self.teeth),
            Role::Wheel => write!(f, "the {}-tooth wheel", self.teeth),
            Role::Twin if self.index == 0 => write!(f, "the first {}-tooth gear", self.teeth),
            Role::Twin => write!(f, "the second {}-tooth gear", self.teeth),
        }
    }
}

/// A reason a mesh cannot be built, or would not run well, with its numbers. Holds no heap data,
/// so returning one costs nothing.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub enum MeshDefect {
    /// An input is outside the range where the geometry means anything.
    InvalidInput {
        /// What was wanted, as a sentence fragment ("the module must be …").
        what: &'static str,
        /// The value found.
        value: f64,
    },
    /// The centre distance is not larger than the sum of the base radii, so there is no working
    /// pressure angle.
    CentreDistanceUnreachable {
        /// The centre distance asked for, mm.
        centre_distance_mm: f64,
        /// It must be larger than this, mm (where the base circles touch).
        min_mm: f64,
    },
    /// Gears already cut would have to overlap at this centre distance.
    WouldJam {
        /// The centre distance asked for, mm.
        centre_distance_mm: f64,
        /// The least centre distance the cut gears fit at (tight mesh), mm.
        tight_mm: f64,
    },
    /// Gears already made would stand further apart than the centre-distance tolerance allows.
    TooMuchPlay {
        /// The centre distance asked for, mm.
        centre_distance_mm: f64,
        /// The distance at which they mesh tight, mm.
        tight_mm: f64,
        /// How far beyond it they may stand, mm.
        play_mm: f64,
    },
    /// The profile shift sum lies outside the range allowed.
    ShiftSumOutOfRange {
        /// The shift sum x1 + x2 the centre distance needs, in modules.
        shift_sum: f64,
        /// The lowest sum allowed, in modules.
        lo: f64,
        /// The highest sum allowed, in modules.
        hi: f64,
    },
    /// The shifts add up to so little that no working pressure angle exists.
    ShiftSumTooNegative {
        /// The shift sum x1 + x2 given, in modules.
        shift_sum: f64,
        /// It must be larger than this, in modules.
        min: f64,
    },
    /// A tip circle lies inside its base circle, so the tooth has no involute flank to work on.
    NoInvoluteAtTip {
        /// The gear concerned.
        gear: GearRef,
    },
    /// The rack would cut away the foot of the involute.
    Undercut {
        /// The gear concerned.
        gear: GearRef,
        /// Its profile shift, in modules.
        shift: f64,
        /// The least shift that avoids undercut, in modules.
        min_shift: f64,
    },
    /// The tooth is too thin at the tip (or comes to a point below it).
    PointedTip {
        /// The gear concerned.
        gear: GearRef,
        /// Tooth thickness at the tip circle, mm (negative: the flanks cross below the tip).
        thickness_mm: f64,
        /// The least thickness wanted, mm.
        min_mm: f64,
    },
    /// The tips of one gear reach past the point where the line of action meets the mate's base
    /// circle, so they would dig into the mate's flank below its base circle.
    TipInterference {
        /// The gear whose tips interfere.
        tips_of: GearRef,
        /// The gear whose flank they dig into.
        flank_of: GearRef,
    },
    /// Too little overlap between one tooth pair and the next.
    ContactRatioTooLow {
        /// The transverse contact ratio.
        value: f64,
        /// The least contact ratio wanted.
        min: f64,
    },
    /// A defect only an internal mesh (a pinion inside a ring gear) can have.
    Internal(InternalDefect),
    /// Too little radial room between one gear's root circle and the mate's tips.
    RootClearanceTooSmall {
        /// The gear whose tips come close.
        tips_of: GearRef,
        /// The gear whose root they come close to.
        root_of: GearRef,
        /// The clearance, mm (negative: the tips would strike the root).
        clearance_mm: f64,
        /// The least clearance wanted, mm.
        min_mm: f64,
    },
    /// A cycloidal pair drives too much of each leaf before the line of centres, where the
    /// teeth engage with friction.
    ActionBeforeLineOfCentres {
        /// The driving gear.
        driver: GearRef,
        /// The part of each leaf's pitch driven before the line of centres.
        fraction: f64,
        /// The largest part allowed.
        max: f64,
    },
}

impl fmt::Display for MeshDefect {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            MeshDefect::InvalidInput { what, value } => write!(f, "{what}, found {value}"),
            MeshDefect::CentreDistanceUnreachable { centre_distance_mm, min_mm } => write!(
                f,
                "the gears cannot mesh at a centre distance of {centre_distance_mm:.3} mm: it \
                 must be more than {min_mm:.3} mm, where their base circles touch"
            ),
            MeshDefect::WouldJam { centre_distance_mm, tight_mm } => write!(
                f,
                "the gears as cut would jam at a centre distance of {centre_distance_mm:.3} mm: \
                 they need at least {tight_mm:.3} mm"
            ),
            MeshDefect::TooMuchPlay { centre_distance_mm, tight_mm, play_mm } => write!(
                f,
                "the gears as made mesh tight at {tight_mm:.3} mm; at {centre_distance_mm:.3} mm they \
                 would stand {:.3} mm apart beyond that, more than the centre-distance tolerance of \
                 {play_mm:.3} mm",
                centre_distance_mm - tight_mm
            ),
            MeshDefect::ShiftSumOutOfRange { shift_sum, lo, hi } => write!(
                f,
                "the profile shifts would have to add up to {shift_sum:.3}, outside the allowed \
                 {lo:.3} to {hi:.3}"
            ),
            MeshDefect::ShiftSumTooNegative { shift_sum, min } => write!(
                f,
                "profile shifts adding up to {shift_sum:.3} leave no working pressure angle: the \
                 sum must be more than {min:.3}"
            ),
            MeshDefect::NoInvoluteAtTip { gear } => write!(
                f,
                "the tip circle of {gear} would lie inside its base circle, leaving no involute \
                 flank to run on"
            ),
            MeshDefect::Undercut { gear, shift, min_shift } => write!(
                f,
                "{gear} would be undercut: it needs a profile shift of at least {min_shift:.3}, \
                 it has {shift:.3}"
            ),
            MeshDefect::PointedTip { gear, thickness_mm, min_mm } => {
                if thickness_mm <= 0.0 {
                    write!(
                        f,
                        "the teeth of {gear} would come to a point below the tip circle: at \
                         least {min_mm:.3} mm of tip is wanted"
                    )
                } else {
                    write!(
                        f,
                        "the teeth of {gear} would be too thin at the tip: {thickness_mm:.3} mm, \
                         at least {min_mm:.3} mm is wanted"
                    )
                }
            }
            MeshDefect::TipInterference { tips_of, flank_of } => write!(
                f,
                "the tips of {tips_of} would dig into the flanks of {flank_of} below its base \
                 circle (interference)"
            ),
            MeshDefect::ContactRatioTooLow { value, min } => write!(
                f,
                "the contact ratio would be {value:.3}, below the {min:.2} wanted for smooth \
                 running"
            ),
            MeshDefect::Internal(defect) => defect.fmt(f),
            MeshDefect::RootClearanceTooSmall { tips_of, root_of, clearance_mm, min_mm } => write!(
                f,
                "the tips of {tips_of} would come within {clearance_mm:.3} mm of the root of \
                 {root_of}: at least {min_mm:.3} mm of clearance is wanted"
            ),
            MeshDefect::ActionBeforeLineOfCentres { driver, fraction, max } => write!(
                f,
                "driven by {driver}, {:.0}% of each leaf's action would come before the line of \
                 centres (engaging friction), more than the {:.0}% allowed",
                100.0 * fraction,
                100.0 * max
            ),
        }
    }
}

impl std::error::Error for MeshDefect {}

impl From<MeshDefect> for crate::error::Error {
    fn from(defect: MeshDefect) -> Self {
        crate::error::Error::problem(defect.to_string())
    }
}

/// Which member of an internal pair a defect concerns.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum InternalGear {
    /// The external gear inside the ring, with its tooth count.
    Pinion(u32),
    /// The ring gear, with its tooth count.
    Ring(u32),
}

impl fmt::Display for InternalGear {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            InternalGear::Pinion(z) => write!(f, "the {z}-tooth pinion"),
            InternalGear::Ring(z) => write!(f, "the {z}-tooth ring"),
        }
    }
}

/// A reason an internal mesh cannot be built or would not run, beyond those it shares with an
/// external mesh. Carried inside [`MeshDefect::Internal`].
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub enum InternalDefect {
    /// The ring does not have more teeth than the pinion.
    NotInternal {
        /// Pinion teeth.
        pinion: u32,
        /// Ring teeth.
        ring: u32,
    },
    /// The shift difference `x2 − x1` is so negative that no working pressure angle exists.
    ShiftDifferenceTooNegative {
        /// The difference given, in modules.
        shift_difference: f64,
        /// It must be more than this, in modules.
        min: f64,
    },
    /// The ring's tip circle lies inside its base circle, leaving its teeth no involute to run
    /// on (with `ha* = 1` at 20° an unshifted ring needs `z2 ≥ 2/(1 − cos 20°) ≈ 33.2`).
    RingTipInsideBase {
        /// Ring teeth.
        ring: u32,
        /// Its tip diameter, mm.
        tip_diameter_mm: f64,
        /// Its base diameter, mm.
        base_diameter_mm: f64,
    },
    /// The ring's tips meet the pinion below its base circle (involute interference).
    InvoluteInterference {
        /// Pinion teeth.
        pinion: u32,
        /// Ring teeth.
        ring: u32,
    },
    /// The ring's tips meet the pinion above its base circle but below where its involute
    /// begins, on the root fillet the rack left.
    BelowFormCircle {
        /// Pinion teeth.
        pinion: u32,
        /// Where contact would begin, mm (diameter).
        active_diameter_mm: f64,
        /// Where the pinion's involute begins, mm (diameter).
        form_diameter_mm: f64,
    },
    /// Leaving the mesh, the pinion's tips strike the ring's tooth tips (trochoid interference).
    TrochoidInterference {
        /// Pinion teeth.
        pinion: u32,
        /// Ring teeth.
        ring: u32,
        /// The clearance, radians on the ring (negative).
        clearance_rad: f64,
    },
    /// The pinion's tip circle reaches beyond the ring's tip circle all round, so its tips
    /// would foul the ring's teeth everywhere, not only in the mesh.
    TipCirclesOverlapAllRound {
        /// Pinion teeth.
        pinion: u32,
        /// Ring teeth.
        ring: u32,
    },
    /// The ring's teeth are too thin at the tip (or come to a point).
    RingPointedTip {
        /// Ring teeth.
        ring: u32,
        /// Tooth thickness at the tip circle, mm.
        thickness_mm: f64,
        /// The least wanted, mm.
        min_mm: f64,
    },
}

impl fmt::Display for InternalDefect {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        use InternalGear::{Pinion, Ring};
        match *self {
            InternalDefect::NotInternal { pinion, ring } => write!(
                f,
                "a ring gear must have more teeth than the pinion inside it: {} and {}",
                Ring(ring),
                Pinion(pinion)
            ),
            InternalDefect::ShiftDifferenceTooNegative { shift_difference, min } => write!(
                f,
                "a ring shift {shift_difference:.3} below the pinion's leaves no working pressure \
                 angle: the difference must be more than {min:.3}"
            ),
            InternalDefect::RingTipInsideBase { ring, tip_diameter_mm, base_diameter_mm } => write!(
                f,
                "the tip circle of {} ({tip_diameter_mm:.3} mm) would lie inside its base circle \
                 ({base_diameter_mm:.3} mm), leaving no involute flank to run on",
                Ring(ring)
            ),
            InternalDefect::InvoluteInterference { pinion, ring } => write!(
                f,
                "the tips of {} would dig into the flanks of {} below its base circle (involute \
                 interference)",
                Ring(ring),
                Pinion(pinion)
            ),
            InternalDefect::BelowFormCircle { pinion, active_diameter_mm, form_diameter_mm } => write!(
                f,
                "the ring's tips would meet {} on a {active_diameter_mm:.3} mm circle, below the \
                 {form_diameter_mm:.3} mm circle where its involute begins",
                Pinion(pinion)
            ),
            InternalDefect::TrochoidInterference { pinion, ring, clearance_rad } => write!(
                f,
                "leaving the mesh, the tips of {} would strike the tips of {} (trochoid \
                 interference, {:.3}° short)",
                Pinion(pinion),
                Ring(ring),
                -clearance_rad.to_degrees()
            ),
            InternalDefect::TipCirclesOverlapAllRound { pinion, ring } => write!(
                f,
                "the tip circle of {} would reach past the tip circle of {} all round",
                Pinion(pinion),
                Ring(ring)
            ),
            InternalDefect::RingPointedTip { ring, thickness_mm, min_mm } => {
                if thickness_mm <= 0.0 {
                    write!(
                        f,
                        "the teeth of {} would come to a point inside the tip circle: at least \
                         {min_mm:.3} mm of tip is wanted",
                        Ring(ring)
                    )
                } else {
                    write!(
                        f,
                        "the teeth of {} would be too thin at the tip: {thickness_mm:.3} mm, at \
                         least {min_mm:.3} mm is wanted",
                        Ring(ring)
                    )
                }
            }
        }
    }
}
