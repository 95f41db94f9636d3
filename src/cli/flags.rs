//! Quantities back to flags. The library names a bad value by the [`Quantity`] it was meant to
//! be ("the target ratio"); the user typed a flag, so every error is printed with the flag that
//! carries each quantity ("--ratio"), here and nowhere else. Also the refusals that belong to
//! the command line alone (a flag that does not go with another).

use gearsieve::{Error, Quantity};

/// The flag that carries `quantity`. Every subcommand that takes a quantity takes it under this
/// one flag (so one table serves them all); a quantity a subcommand checks but has no flag for
/// (the tooth range of a clock's going train) is still shown as the flag that carries it
/// elsewhere.
pub fn flag_for(quantity: Quantity) -> &'static str {
    match quantity {
        Quantity::TargetRatio => "--ratio",
        Quantity::Tolerance => "--tol",
        Quantity::StageCount => "--stages",
        Quantity::ToothRange => "--teeth",
        Quantity::ToothLimits => "--min-teeth",
        Quantity::DriverTeeth => "--driver-teeth",
        Quantity::DrivenTeeth => "--driven-teeth",
        Quantity::WheelTeeth => "--wheels",
        Quantity::PinionLeaves => "--pinions",
        Quantity::StageRatio => "--stage-ratio",
        Quantity::MaxStageRatio => "--max-stage-ratio",
        Quantity::CentreDistance => "--centre-distance",
        Quantity::CentreTolerance => "--centre-tol",
        Quantity::StageCentreDistances => "--centre-distances",
        Quantity::ShiftSum => "--shift-sum",
        Quantity::ContactRatio => "--min-contact-ratio",
        Quantity::Coaxial => "--coaxial",
        Quantity::Direction => "--direction",
        Quantity::Module => "--module",
        Quantity::StageModules => "--modules",
        Quantity::DiametralPitch => "--diametral-pitch",
        Quantity::PressureAngle => "--pressure-angle",
        Quantity::RankKeys => "--rank",
        Quantity::Limit => "--limit",
        Quantity::CountMode => "--count",
        Quantity::InputSpeed => "--input-rpm",
        Quantity::OutputSpeed => "--output-rpm",
        Quantity::ThreadPitch => "--pitch",
        Quantity::Leadscrew => "--leadscrew",
        Quantity::StudRatio => "--stud-ratio",
        Quantity::Gearbox => "--gearbox",
        Quantity::Banjo => "--banjo",
        Quantity::StudToLeadscrew => "--stud-to-leadscrew",
        Quantity::IntermediateRange => "--intermediate-range",
        Quantity::ShaftDiameter => "--shaft-diameter",
        Quantity::Series => "--series",
        Quantity::ThreadList => "--list",
        Quantity::Lathe => "--lathe",
        Quantity::Feed => "--feed",
        Quantity::PendulumLength => "--pendulum",
        Quantity::PendulumPeriod => "--period",
        Quantity::BeatsPerHour => "--beats-per-hour",
        Quantity::Gravity => "--gravity",
        Quantity::EscapeTeeth => "--escape-teeth",
        Quantity::BeatsPerTooth => "--beats-per-tooth",
        Quantity::InputTurnsPerHour => "--from-turns-per-hour",
        Quantity::InputArborPeriod => "--from",
        Quantity::RunTime => "--run",
        Quantity::BarrelTurns => "--barrel-turns",
        Quantity::LineBarrelDiameter => "--line-barrel",
        Quantity::BeatsPerMinute => "--beats-per-minute",
        Quantity::StrikePins => "--pins",
        Quantity::WarningTurns => "--warning-turns",
        Quantity::FlyTurns => "--fly-turns",
        Quantity::RateTolerance => "--rate-tol",
        Quantity::Dial => "--dial",
        Quantity::AstronomicalPeriod => "--period",
        Quantity::Shard => "--shard",
        Quantity::SunTeeth => "--sun",
        Quantity::PlanetTeeth => "--planet",
        Quantity::PlanetRingTeeth => "--planet-ring",
        Quantity::PlanetRing2Teeth => "--planet-ring2",
        Quantity::RingTeeth => "--ring",
        Quantity::OutputRingTeeth => "--ring2",
        Quantity::PlanetCount => "--planets",
        Quantity::HeldMember => "--fixed",
        Quantity::DrivingMember => "--input",
        Quantity::CarrierOffset => "--carrier-offset",
        Quantity::PlanetClearance => "--tip-clearance",
        Quantity::Stock => "--stock",
        Quantity::HousingTolerance => "--housing-tol",
        Quantity::BallDiameter => "--balls",
        Quantity::ShaftMargin => "--shaft-margin",
        Quantity::MinStageRatio => "--min-stage-ratio",
        Quantity::BuyCount => "--buy",
        Quantity::BuyTeeth => "--buy-teeth",
        Quantity::BuyModule => "--buy-module",
    }
}

/// An error as the line printed after `gearsieve: `: a library error with each quantity named
/// by its flag, anything else as it reads.
pub fn message(e: &anyhow::Error) -> String {
    // Each link of the chain in turn, context first: "--output x.csv: cannot write the file:
    // Permission denied"; a library error among them names its flag.
    e.chain()
        .map(|link| match link.downcast_ref::<Error>() {
            Some(library) => library.render(flag_for),
            None => link.to_string(),
        })
        .collect::<Vec<_>>()
        .join(": ")
}

/// A value clap could not read, as one line like every other bad value: `--flag: "text" why`,
/// or for a value outside a fixed list `--flag: "text" is not one of a, b, c`. `None` for
/// clap's other errors (an unknown or missing flag), which clap prints itself with the usage.
pub fn bad_value(e: &clap::Error) -> Option<String> {
    use clap::error::{ContextKind, ContextValue, ErrorKind};
    let text = |kind| match e.get(kind) {
        Some(ContextValue::String(s)) => Some(s.clone()),
        _ => None,
    };
    // "--module <MM>" names the flag; the placeholder is not what the user typed.
    let arg = text(ContextKind::InvalidArg)?;
    let flag = arg.split_whitespace().next()?.to_string();
    let value = text(ContextKind::InvalidValue)?;
    match e.kind() {
        ErrorKind::ValueValidation => {
            let why = std::error::Error::source(e).map(|s| s.to_string())?;
            // Whole numbers are read by the standard parser, whose words are put in ours.
            let whole = "; wanted a whole number such as 10";
            let why = match why.as_str() {
                "invalid digit found in string" => format!("is not a whole number{whole}"),
                "cannot parse integer from empty string" => format!("is empty{whole}"),
                "number too large to fit in target type" => format!("is too large{whole}"),
                _ => why,
            };
            // Our own readers say "is …" or "has …" of the value; others say something else.
            if why.starts_with("is ") || why.starts_with("has ") {
                Some(format!("{flag}: \"{value}\" {why}"))
            } else {
                Some(format!("{flag}: \"{value}\" is not accepted: {why}"))
            }
        }
        ErrorKind::InvalidValue => match e.get(ContextKind::ValidValue) {
            Some(ContextValue::Strings(valid)) => {
                Some(format!("{flag}: \"{value}\" is not one of {}", valid.join(", ")))
            }
            _ => None,
        },
        _ => None,
    }
}

/// A value the command line refuses by itself: `--flag: message`.
pub fn refuse(flag: &str, message: impl std::fmt::Display) -> anyhow::Error {
    anyhow::anyhow!("{flag}: {message}")
}

#[cfg(test)]
mod tests {
    use super::*;
    use gearsieve::numbers::range::parse_int_range;
    use gearsieve::numbers::target::{parse_ratio, Target};
    use gearsieve::trades::thread::machine::parse_gearbox_list;

    fn printed(e: Error) -> String {
        message(&anyhow::Error::from(e))
    }

    #[test]
    fn library_errors_are_printed_with_the_flag() {
        let e = Target::parse("1e3x", "0").unwrap_err();
        assert!(e.to_string().starts_with("the target ratio: \"1e3x\" is not a number; wanted "), "{e}");
        assert_eq!(
            printed(e),
            "--ratio: \"1e3x\" is not a number; wanted a positive number such as 12, 1.0583, 2.5e-1, 127/120, 37.5:1 or pi"
        );
        let e = parse_ratio("0", Quantity::InputTurnsPerHour).unwrap_err();
        assert!(printed(e).starts_with("--from-turns-per-hour: \"0\" is zero"));
        let e = parse_int_range("50..20", Quantity::WheelTeeth, "teeth", 3, 1000).unwrap_err();
        assert!(printed(e).starts_with("--wheels: \"50..20\" is inverted (LO > HI); wanted teeth"));
    }

    #[test]
    fn quantities_named_inside_a_message_become_flags_too() {
        let e = Error::value(
            Quantity::StageModules,
            gearsieve::Message::from("give one per stage for ").quantity(Quantity::StageCount).text(" 3"),
        );
        assert_eq!(e.to_string(), "the module of each stage: give one per stage for the stage count 3");
        assert_eq!(printed(e), "--modules: give one per stage for --stages 3");
    }

    #[test]
    fn a_flag_is_named_once() {
        let e = parse_gearbox_list("A=1,A=2").unwrap_err();
        assert_eq!(printed(e), "--gearbox: position 2: position A is named twice");
    }

    #[test]
    fn other_errors_print_as_they_read() {
        let e = refuse("--explain", "give --check-meshes too");
        assert_eq!(message(&e), "--explain: give --check-meshes too");
        let catalogue = Error::CatalogueFile { path: "g.csv".into(), message: "is empty".into() };
        assert_eq!(printed(catalogue), "catalogue g.csv: is empty");
        // Context around a library error comes first, then the error with its flag.
        let wrapped = anyhow::Error::from(Target::parse("x", "0").unwrap_err()).context("reading the job");
        assert!(message(&wrapped).starts_with("reading the job: --ratio: "), "{}", message(&wrapped));
    }

    #[test]
    fn values_clap_cannot_read_get_one_line() {
        use clap::Parser;
        let line = |args: &[&str]| {
            let e = super::super::Cli::try_parse_from([&["gearsieve"][..], args].concat()).err().unwrap();
            bad_value(&e)
        };
        assert_eq!(
            line(&["search", "--ratio", "2", "--module", "2mm"]).as_deref(),
            Some("--module: \"2mm\" is not a number; wanted a number such as 1.5, 0.25 or 2.5e-1")
        );
        assert_eq!(
            line(&["search", "--ratio", "2", "--format", "xml"]).as_deref(),
            Some("--format: \"xml\" is not one of table, csv, json, markdown, svg, html")
        );
        assert_eq!(
            line(&["search", "--ratio", "2", "--threads", "0"]).as_deref(),
            Some("--threads: \"0\" is not accepted: 0 is not in 1..=1024")
        );
        assert_eq!(
            line(&["search", "--ratio", "2", "--limit", "x"]).as_deref(),
            Some("--limit: \"x\" is not a whole number; wanted a whole number such as 10")
        );
        // Unknown or missing flags are clap's to explain, with the usage.
        assert_eq!(line(&["search", "--ratio", "2", "--colour", "red"]), None);
        assert_eq!(line(&["search"]), None);
    }

    /// Every long option of `cmd` and its subcommands, with the dashes.
    fn long_options(cmd: &clap::Command, out: &mut Vec<String>) {
        out.extend(cmd.get_arguments().filter_map(|a| a.get_long()).map(|l| format!("--{l}")));
        cmd.get_subcommands().for_each(|c| long_options(c, out));
    }

    #[test]
    fn every_quantity_maps_to_a_flag_the_command_line_has() {
        use clap::CommandFactory;
        let mut options = Vec::new();
        long_options(&super::super::Cli::command(), &mut options);
        let all = [
            Quantity::TargetRatio,
            Quantity::Tolerance,
            Quantity::StageCount,
            Quantity::ToothRange,
            Quantity::ToothLimits,
            Quantity::DriverTeeth,
            Quantity::DrivenTeeth,
            Quantity::WheelTeeth,
            Quantity::PinionLeaves,
            Quantity::StageRatio,
            Quantity::MaxStageRatio,
            Quantity::CentreDistance,
            Quantity::CentreTolerance,
            Quantity::StageCentreDistances,
            Quantity::ShiftSum,
            Quantity::ContactRatio,
            Quantity::Coaxial,
            Quantity::Direction,
            Quantity::Module,
            Quantity::StageModules,
            Quantity::DiametralPitch,
            Quantity::PressureAngle,
            Quantity::RankKeys,
            Quantity::Limit,
            Quantity::CountMode,
            Quantity::InputSpeed,
            Quantity::OutputSpeed,
            Quantity::ThreadPitch,
            Quantity::Leadscrew,
            Quantity::StudRatio,
            Quantity::Gearbox,
            Quantity::Banjo,
            Quantity::StudToLeadscrew,
            Quantity::IntermediateRange,
            Quantity::ShaftDiameter,
            Quantity::Series,
            Quantity::ThreadList,
            Quantity::Lathe,
            Quantity::Feed,
            Quantity::PendulumLength,
            Quantity::PendulumPeriod,
            Quantity::BeatsPerHour,
            Quantity::Gravity,
            Quantity::EscapeTeeth,
            Quantity::BeatsPerTooth,
            Quantity::InputTurnsPerHour,
            Quantity::InputArborPeriod,
            Quantity::RunTime,
            Quantity::BarrelTurns,
            Quantity::LineBarrelDiameter,
            Quantity::BeatsPerMinute,
            Quantity::StrikePins,
            Quantity::WarningTurns,
            Quantity::FlyTurns,
            Quantity::RateTolerance,
            Quantity::Dial,
            Quantity::AstronomicalPeriod,
            Quantity::Shard,
            Quantity::SunTeeth,
            Quantity::PlanetTeeth,
            Quantity::PlanetRingTeeth,
            Quantity::PlanetRing2Teeth,
            Quantity::RingTeeth,
            Quantity::OutputRingTeeth,
            Quantity::PlanetCount,
            Quantity::HeldMember,
            Quantity::DrivingMember,
            Quantity::CarrierOffset,
            Quantity::PlanetClearance,
            Quantity::Stock,
            Quantity::HousingTolerance,
            Quantity::BallDiameter,
            Quantity::ShaftMargin,
            Quantity::MinStageRatio,
            Quantity::BuyCount,
            Quantity::BuyTeeth,
            Quantity::BuyModule,
        ];
        for q in all {
            assert!(options.iter().any(|o| o == flag_for(q)), "{q}: {} is no option", flag_for(q));
        }
    }
}
