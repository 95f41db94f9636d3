//! The CSV format for planetary trains: a header row, then one row per design, best first, one
//! value per cell: the tooth counts gear by gear (`sun`, `planet` or `planet_sun` and
//! `planet_ring`, `ring`; `ring`, `planet_ring`, `planet_ring2`, `ring2` for the two-ring
//! train), the planets, the exact ratio, its value, error and direction, the carrier centre
//! distance, each gear's profile shift, the gap between neighbouring planets, the places and
//! whether the planets are equally spaced, each mesh's contact ratio and each planet's angle.
//! It computes nothing about gears.

use std::io::{self, Write};

use crate::report::fields::{degrees, figure, mm, ratio_value, shift, small};
use crate::trades::planetary::layout::gear_circles;

use super::{gears_of, mesh_figures, PlanetaryReport};

/// Write a planetary search as CSV.
pub fn write(r: &PlanetaryReport, w: &mut dyn Write) -> io::Result<()> {
    let s = r.problem.spec();
    let gears = gears_of(s.arrangement);
    let most_planets = s.planets.hi;
    let mut c = ::csv::Writer::from_writer(w);
    let mut head = vec!["rank".to_string()];
    head.extend(gears.iter().map(|g| g.key().to_string()));
    head.extend(
        ["planets", "ratio", "value", "error", "direction", "carrier_centre_distance_mm"].map(String::from),
    );
    head.extend(gears.iter().map(|g| format!("shift_{}", g.key())));
    head.extend(
        ["neighbour_gap_mm", "places", "equally_spaced", "mesh1_contact_ratio", "mesh2_contact_ratio"]
            .map(String::from),
    );
    head.extend((1..=most_planets).map(|k| format!("planet{k}_angle_deg")));
    head.push("on_hand_defects".into());
    c.write_record(&head)?;
    for (n, d) in r.outcome.designs.iter().enumerate() {
        let circles = gear_circles(r.problem.system(), d);
        let mut row = vec![(n + 1).to_string()];
        row.extend(circles.iter().map(|g| g.teeth.to_string()));
        row.extend([
            d.planets.to_string(),
            d.ratio.magnitude.to_string(),
            ratio_value(d.ratio.magnitude.to_f64()),
            small(d.error.to_f64()),
            d.ratio.direction.as_str().to_string(),
            mm(d.carrier.centre_distance_mm),
        ]);
        row.extend(circles.iter().map(|g| shift(g.shift)));
        row.extend([
            mm(d.neighbour_gap_mm),
            d.positions.places.to_string(),
            d.positions.equally_spaced().to_string(),
        ]);
        row.extend(mesh_figures(d).iter().map(|m| m.as_ref().map_or(String::new(), |(_, e)| figure(*e))));
        let angles = d.positions.angles_deg();
        row.extend((0..most_planets as usize).map(|k| angles.get(k).map_or(String::new(), |a| degrees(*a))));
        row.push(super::document::on_hand_cell(d));
        c.write_record(&row)?;
    }
    c.flush()
}
