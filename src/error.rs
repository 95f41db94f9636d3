//! The library's error type. A bad value is named by the [`Quantity`] it was meant to be ("the
//! target ratio"), a bad catalogue by its file, row and column; every message says what was
//! found and what is wanted, so a caller can print it as one line.
//!
//! The library knows no command line. A message may name quantities inside it ("give one per
//! stage for the stage count 3"); [`Error::render`] writes each quantity as the caller calls it,
//! which is how the command line turns "the stage count" back into the flag the user typed.

use std::fmt;
use std::path::PathBuf;

/// Everything that can go wrong while building or running a search.
#[derive(Debug, thiserror::Error, Clone, PartialEq)]
pub enum Error {
    /// A value the library cannot use: `quantity` says what it was meant to be, `message` what
    /// was wrong with it (quoting it) and what is wanted.
    #[error("{}", self.render(Quantity::name))]
    Value {
        /// What the value was meant to be.
        quantity: Quantity,
        /// What was wrong and what is wanted.
        message: Message,
    },
    /// A catalogue file could not be opened or read at all.
    #[error("{}", self.render(Quantity::name))]
    CatalogueFile {
        /// The file as given.
        path: PathBuf,
        /// What went wrong.
        message: Message,
    },
    /// One field of one row of a catalogue is unusable. `row` counts lines of the file from 1,
    /// the header being row 1.
    #[error("{}", self.render(Quantity::name))]
    CatalogueField {
        /// The file as given.
        path: PathBuf,
        /// Line number in the file, header = 1.
        row: u64,
        /// Column name from the header.
        column: String,
        /// What was found and what is wanted.
        message: Message,
    },
    /// The problem as a whole cannot be searched (for example no two gears can mesh).
    #[error("{}", self.render(Quantity::name))]
    Problem(Message),
}

impl Error {
    /// Shorthand for an [`Error::Value`].
    pub fn value(quantity: Quantity, message: impl Into<Message>) -> Self {
        Error::Value { quantity, message: message.into() }
    }

    /// Shorthand for an [`Error::Problem`].
    pub fn problem(message: impl Into<Message>) -> Self {
        Error::Problem(message.into())
    }

    /// The error as one line, each quantity written as `name` calls it. `Display` uses
    /// [`Quantity::name`]; the command line passes the flag that carries each quantity.
    pub fn render(&self, name: fn(Quantity) -> &'static str) -> String {
        self.to_message().render(name)
    }

    /// What was wrong, without the quantity a value error names at its head: for quoting inside
    /// another error about the same quantity, which names it once itself ("the banjo: banjo
    /// file b, line 3: …", not "the banjo: … the banjo: …"). Other errors as [`Error::to_message`].
    pub fn detail(&self) -> Message {
        match self {
            Error::Value { message, .. } => message.clone(),
            other => other.to_message(),
        }
    }

    /// The whole error as a message, its quantities still named only when rendered, so that it
    /// can be quoted inside another error.
    pub fn to_message(&self) -> Message {
        match self {
            Error::Value { quantity, message } => Message::from(*quantity).text(": ").then(message.clone()),
            Error::CatalogueFile { path, message } => {
                Message::from(format!("catalogue {}: ", path.display())).then(message.clone())
            }
            Error::CatalogueField { path, row, column, message } => {
                Message::from(format!("catalogue {}, row {row}, column {column}: ", path.display()))
                    .then(message.clone())
            }
            Error::Problem(message) => message.clone(),
        }
    }
}

/// Result with the library's [`Error`].
pub type Result<T> = std::result::Result<T, Error>;

/// What was wrong and what is wanted, as words that may name quantities. Each quantity is kept
/// as itself until the message is rendered, so one message reads in the library's words ("the
/// stage count") or in the command line's (its flag).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Message {
    parts: Vec<Part>,
}

/// One piece of a [`Message`].
#[derive(Debug, Clone, PartialEq)]
enum Part {
    Text(String),
    Quantity(Quantity),
}

impl Message {
    /// The message followed by `words`.
    pub fn text(mut self, words: impl Into<String>) -> Message {
        let words = words.into();
        match self.parts.last_mut() {
            Some(Part::Text(last)) => last.push_str(&words),
            _ => self.parts.push(Part::Text(words)),
        }
        self
    }

    /// The message followed by the name of `quantity`.
    pub fn quantity(mut self, quantity: Quantity) -> Message {
        self.parts.push(Part::Quantity(quantity));
        self
    }

    /// The message followed by another.
    pub fn then(self, other: Message) -> Message {
        other.parts.into_iter().fold(self, |m, part| match part {
            Part::Text(words) => m.text(words),
            Part::Quantity(q) => m.quantity(q),
        })
    }

    /// The words, each quantity written as `name` calls it.
    pub fn render(&self, name: fn(Quantity) -> &'static str) -> String {
        self.parts
            .iter()
            .map(|part| match part {
                Part::Text(words) => words.as_str(),
                Part::Quantity(q) => name(*q),
            })
            .collect()
    }
}

impl From<String> for Message {
    fn from(words: String) -> Message {
        Message::default().text(words)
    }
}

impl From<&str> for Message {
    fn from(words: &str) -> Message {
        Message::default().text(words)
    }
}

impl From<Quantity> for Message {
    fn from(quantity: Quantity) -> Message {
        Message::default().quantity(quantity)
    }
}

impl fmt::Display for Message {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.render(Quantity::name))
    }
}

/// A quantity the library checks: what a value given to it was meant to be. Errors name the
/// quantity, never where the value came from; a caller that took the value from somewhere with
/// a name of its own (a flag) renames it with [`Error::render`].
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Quantity {
    /// The ratio a train must make, input turns per output turn.
    TargetRatio,
    /// The relative tolerance around the target ratio (or a thread's pitch).
    Tolerance,
    /// How many stages a train may have, `N` or `LO..HI`.
    StageCount,
    /// The tooth counts of gears to be cut.
    ToothRange,
    /// A reducer's least and most teeth of a gear.
    ToothLimits,
    /// The tooth counts a stage's driver may have.
    DriverTeeth,
    /// The tooth counts a stage's driven gear may have.
    DrivenTeeth,
    /// A clock train's wheel teeth.
    WheelTeeth,
    /// A clock train's pinion leaves.
    PinionLeaves,
    /// The ratio each stage may have, driven / driver.
    StageRatio,
    /// A reducer's largest ratio of one stage.
    MaxStageRatio,
    /// The centre distance of each stage, mm: a range, or one working distance.
    CentreDistance,
    /// How close a standard centre distance must be to a fixed one to need no shift, mm.
    CentreTolerance,
    /// A reducer's fixed centre distance of each stage, mm.
    StageCentreDistances,
    /// The profile shift sum `x1 + x2` a stage may have, in modules.
    ShiftSum,
    /// The least transverse contact ratio of a mesh.
    ContactRatio,
    /// Input and output on one axis (a reverted train).
    Coaxial,
    /// The way the output turns relative to the input.
    Direction,
    /// The module of gears to be cut, mm.
    Module,
    /// A reducer's module of each stage, mm.
    StageModules,
    /// The diametral pitch of gears to be cut, teeth per inch of pitch diameter.
    DiametralPitch,
    /// The pressure angle of gears to be cut, degrees.
    PressureAngle,
    /// The keys trains are ranked by.
    RankKeys,
    /// How many results to list.
    Limit,
    /// How a search counts its trains: all of them, or only those met on the way to the best.
    CountMode,
    /// A reducer's input speed, rpm.
    InputSpeed,
    /// A reducer's output speed, rpm.
    OutputSpeed,
    /// The pitch of the thread to cut.
    ThreadPitch,
    /// The pitch of a lathe's leadscrew.
    Leadscrew,
    /// A lathe's fixed ratio from spindle to stud.
    StudRatio,
    /// A lathe's gearbox positions between the change gears and the leadscrew.
    Gearbox,
    /// A lathe's banjo, as a file.
    Banjo,
    /// The distance between the banjo's stud and leadscrew axes, mm.
    StudToLeadscrew,
    /// The distances from the leadscrew the banjo's intermediate stud can take, mm.
    IntermediateRange,
    /// The diameter of shafts, mm: a banjo's shafts and spacers, a reducer's shafts.
    ShaftDiameter,
    /// A built-in series of threads, by name.
    Series,
    /// A file listing the threads of a chart.
    ThreadList,
    /// A lathe described in a file: leadscrew, gearbox, banjo, gears on hand.
    Lathe,
    /// A turning feed, length per spindle turn.
    Feed,
    /// The length of a clock's simple pendulum, m.
    PendulumLength,
    /// The full period of a clock's pendulum, s.
    PendulumPeriod,
    /// A clock's beats per hour.
    BeatsPerHour,
    /// The acceleration of gravity, m/s².
    Gravity,
    /// The teeth of a clock's escape wheel.
    EscapeTeeth,
    /// The beats each escape wheel tooth lets through.
    BeatsPerTooth,
    /// The turns per hour of the arbor a going train starts from.
    InputTurnsPerHour,
    /// The time one turn of the arbor a clock train starts from takes.
    InputArborPeriod,
    /// How long a clock must run at a winding.
    RunTime,
    /// The turns of a clock's barrel (or great wheel) at a winding.
    BarrelTurns,
    /// The diameter a weight's line winds on, mm.
    LineBarrelDiameter,
    /// A clock's beats per minute.
    BeatsPerMinute,
    /// The pins of a striking train's pin wheel.
    StrikePins,
    /// The turns of a striking train's warning wheel per blow.
    WarningTurns,
    /// The turns of a striking train's fly per turn of the warning wheel.
    FlyTurns,
    /// How far a clock may gain or lose, seconds per day.
    RateTolerance,
    /// The dial a motion work drives.
    Dial,
    /// The period an astronomical train shows, days.
    AstronomicalPeriod,
    /// Which part of a split search, `I/N`.
    Shard,
    /// The teeth a planetary train's sun may have.
    SunTeeth,
    /// The teeth a planet gear may have (unless a range of its own is given for it).
    PlanetTeeth,
    /// The teeth a planet gear meshing the ring may have: a stepped planet's second gear, a
    /// two-ring planet's gear meshing the held ring.
    PlanetRingTeeth,
    /// The teeth a two-ring planet's gear meshing the output ring may have.
    PlanetRing2Teeth,
    /// The teeth a ring gear may have (the held ring of a two-ring train).
    RingTeeth,
    /// The teeth the output ring of a two-ring train may have.
    OutputRingTeeth,
    /// How many planets a carrier may hold.
    PlanetCount,
    /// The member of a planetary train held still.
    HeldMember,
    /// The member of a planetary train that drives.
    DrivingMember,
    /// How far the planet carrier's centre distance is set beyond midway, in modules.
    CarrierOffset,
    /// The least gap between the tip circles of neighbouring planets, mm.
    PlanetClearance,
    /// The gears on hand (stock catalogues) taken as a whole.
    Stock,
    /// How far a housing's centre distance may stray either way, mm.
    HousingTolerance,
    /// The diameter of the balls or pins a gear is measured over, mm.
    BallDiameter,
    /// The least gap between a gear's tip circle and a shaft it does not sit on, mm.
    ShaftMargin,
    /// A reducer's smallest ratio of one stage.
    MinStageRatio,
    /// How many gears not on hand a train may use (gears to buy).
    BuyCount,
    /// The tooth counts of gears that may be bought.
    BuyTeeth,
    /// The module of gears that may be bought, mm.
    BuyModule,
}

impl Quantity {
    /// The quantity in words, as the library's messages name it: "the target ratio".
    pub fn name(self) -> &'static str {
        match self {
            Quantity::TargetRatio => "the target ratio",
            Quantity::Tolerance => "the tolerance",
            Quantity::StageCount => "the stage count",
            Quantity::ToothRange => "the tooth range",
            Quantity::ToothLimits => "the least and most teeth",
            Quantity::DriverTeeth => "the driver teeth",
            Quantity::DrivenTeeth => "the driven teeth",
            Quantity::WheelTeeth => "the wheel teeth",
            Quantity::PinionLeaves => "the pinion leaves",
            Quantity::StageRatio => "the stage ratio",
            Quantity::MaxStageRatio => "the largest stage ratio",
            Quantity::CentreDistance => "the centre distance",
            Quantity::CentreTolerance => "the centre distance tolerance",
            Quantity::StageCentreDistances => "the centre distance of each stage",
            Quantity::ShiftSum => "the profile shift sum",
            Quantity::ContactRatio => "the least contact ratio",
            Quantity::Coaxial => "the coaxial arrangement",
            Quantity::Direction => "the output direction",
            Quantity::Module => "the module",
            Quantity::StageModules => "the module of each stage",
            Quantity::DiametralPitch => "the diametral pitch",
            Quantity::PressureAngle => "the pressure angle",
            Quantity::RankKeys => "the ranking keys",
            Quantity::Limit => "the number of results to list",
            Quantity::CountMode => "the way trains are counted",
            Quantity::InputSpeed => "the input speed",
            Quantity::OutputSpeed => "the output speed",
            Quantity::ThreadPitch => "the thread pitch",
            Quantity::Leadscrew => "the leadscrew pitch",
            Quantity::StudRatio => "the stud ratio",
            Quantity::Gearbox => "the gearbox",
            Quantity::Banjo => "the banjo",
            Quantity::StudToLeadscrew => "the stud-to-leadscrew distance",
            Quantity::IntermediateRange => "the intermediate stud's range",
            Quantity::ShaftDiameter => "the shaft diameter",
            Quantity::Series => "the thread series",
            Quantity::ThreadList => "the thread list",
            Quantity::Lathe => "the lathe",
            Quantity::Feed => "the feed",
            Quantity::PendulumLength => "the pendulum length",
            Quantity::PendulumPeriod => "the pendulum period",
            Quantity::BeatsPerHour => "the beats per hour",
            Quantity::Gravity => "the gravity",
            Quantity::EscapeTeeth => "the escape wheel teeth",
            Quantity::BeatsPerTooth => "the beats per tooth",
            Quantity::InputTurnsPerHour => "the input arbor's turns per hour",
            Quantity::InputArborPeriod => "the time per turn of the input arbor",
            Quantity::RunTime => "the run time",
            Quantity::BarrelTurns => "the barrel's turns",
            Quantity::LineBarrelDiameter => "the line barrel's diameter",
            Quantity::BeatsPerMinute => "the beats per minute",
            Quantity::StrikePins => "the pin wheel's pins",
            Quantity::WarningTurns => "the warning wheel's turns per blow",
            Quantity::FlyTurns => "the fly's turns per warning-wheel turn",
            Quantity::RateTolerance => "the rate tolerance",
            Quantity::Dial => "the dial",
            Quantity::AstronomicalPeriod => "the astronomical period",
            Quantity::Shard => "the shard",
            Quantity::SunTeeth => "the sun teeth",
            Quantity::PlanetTeeth => "the planet teeth",
            Quantity::PlanetRingTeeth => "the teeth of the planet gear meshing the ring",
            Quantity::PlanetRing2Teeth => "the teeth of the planet gear meshing the output ring",
            Quantity::RingTeeth => "the ring teeth",
            Quantity::OutputRingTeeth => "the output ring teeth",
            Quantity::PlanetCount => "the planet count",
            Quantity::HeldMember => "the held member",
            Quantity::DrivingMember => "the driving member",
            Quantity::CarrierOffset => "the carrier's offset from midway",
            Quantity::PlanetClearance => "the clearance between neighbouring planets",
            Quantity::Stock => "the gears on hand",
            Quantity::HousingTolerance => "the housing's centre-distance tolerance",
            Quantity::BallDiameter => "the ball diameter",
            Quantity::ShaftMargin => "the margin between a gear and another shaft",
            Quantity::MinStageRatio => "the smallest stage ratio",
            Quantity::BuyCount => "the number of gears to buy",
            Quantity::BuyTeeth => "the teeth of gears to buy",
            Quantity::BuyModule => "the module of the gears to buy",
        }
    }
}

impl fmt::Display for Quantity {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn short(q: Quantity) -> &'static str {
        match q {
            Quantity::StageCount => "STAGES",
            _ => "OTHER",
        }
    }

    #[test]
    fn a_value_error_names_its_quantity_and_renders_with_other_names() {
        let e = Error::value(
            Quantity::StageModules,
            Message::from("give one for ").quantity(Quantity::StageCount).text(" 3"),
        );
        assert_eq!(e.to_string(), "the module of each stage: give one for the stage count 3");
        assert_eq!(e.render(short), "OTHER: give one for STAGES 3");
    }

    #[test]
    fn a_quoted_error_keeps_its_quantities() {
        let inner = Error::value(Quantity::StageCount, "empty range");
        let outer = Error::value(Quantity::Banjo, Message::from("line 3: ").then(inner.to_message()));
        assert_eq!(outer.to_string(), "the banjo: line 3: the stage count: empty range");
        assert_eq!(outer.render(short), "OTHER: line 3: STAGES: empty range");
    }

    #[test]
    fn a_detail_quoted_under_its_own_quantity_names_it_once() {
        let inner = Error::value(Quantity::Banjo, "\"9..3\" is inverted");
        let outer =
            Error::value(Quantity::Banjo, Message::from("banjo file b, line 3: ").then(inner.detail()));
        assert_eq!(outer.to_string(), "the banjo: banjo file b, line 3: \"9..3\" is inverted");
        assert_eq!(Error::problem("no mesh").detail(), Message::from("no mesh"));
    }

    #[test]
    fn catalogue_and_problem_errors_read_as_before() {
        let field = Error::CatalogueField {
            path: PathBuf::from("gears.csv"),
            row: 7,
            column: "teeth".into(),
            message: "teeth must be a whole number".into(),
        };
        assert_eq!(
            field.to_string(),
            "catalogue gears.csv, row 7, column teeth: teeth must be a whole number"
        );
        assert_eq!(field.render(short), field.to_string());
        let file = Error::CatalogueFile { path: PathBuf::from("g.csv"), message: "is empty".into() };
        assert_eq!(file.to_string(), "catalogue g.csv: is empty");
        assert_eq!(Error::problem("nothing can mesh").to_string(), "nothing can mesh");
    }

    #[test]
    fn texts_run_together() {
        let m = Message::from("a").text("b").then(Message::from("c").quantity(Quantity::Dial));
        assert_eq!(m.parts, vec![Part::Text("abc".into()), Part::Quantity(Quantity::Dial)]);
    }
}
