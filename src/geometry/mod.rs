//! Mesh geometry of external involute spur gears: the ISO 21771 relations between module,
//! pressure angle, tooth counts, profile shift and centre distance, with the checks that tell
//! whether a pair would run (undercut, pointed tips, interference, contact ratio); and the
//! cycloidal wheel-and-pinion teeth of clocks with their own checks.
//!
//! Pure arithmetic: nothing here prints, parses or does I/O, and nothing depends on the rest of
//! the crate except that a [`MeshDefect`] converts into the crate's error. It does not choose
//! gears or trains; the search asks it about one pair at a time.
//!
//! - [`involute`]: `inv α = tan α − α` and its inverse, to full double precision.
//! - [`system`]: the [`ToothSystem`] (module, pressure angle, [`RackProfile`]) and one gear's
//!   circles, undercut limit and tooth thickness.
//! - [`pair`]: centre distance, working pressure angle, shift sum and its split between the
//!   gears, tip shortening, contact ratio, backlash.
//! - [`working`]: a whole [`MeshGeometry`] from a [`Mounting`], and [`shift_for_centre_distance`]
//!   for a search.
//! - [`made`]: pairs with gears already made (a gear on hand keeps its shift and tip; only a
//!   gear to cut is shifted), and the window of centre distances at which a pair runs.
//! - [`defect`]: the words for what can be wrong: [`MeshDefect`], [`GearRef`], [`Role`].
//! - [`check`]: [`MeshLimits`] and [`check_mesh`].
//! - [`cycloidal`]: cycloidal (horological) wheel-and-pinion teeth as clocks are cut: the
//!   proportions by leaf count, the arcs of action either side of the line of centres, and
//!   [`cycloidal::check_cycloidal`].
//! - [`internal`]: internal meshes (a pinion inside a ring gear): the ring's circles, working
//!   pressure angle and centre distance from the shift difference, contact ratio, and the
//!   interference checks of [`internal::check_internal_mesh`].
//! - [`allowance`]: tooth-thickness allowances for a backlash range over the centre-distance
//!   tolerance, and the backlash given allowances leave.
//! - [`measure`]: span over k teeth, dimension over balls (external and internal), chordal
//!   thickness and height, and the whole data block of one gear ([`measure::GearData`]).
//! - [`modules`]: DIN 780 module series and diametral pitch.
//! - [`layout`]: where the shafts of a compound train sit.
//! - [`outline`]: the true outline of a gear as its basic rack cuts it (involute, root fillet,
//!   undercut), as a polygon, and the rotation that makes two outlines mesh.
//!
//! Units: lengths in mm, angles in degrees at the interface (radians where the name says
//! `_rad`), profile shift, tip shortening and rack dimensions in modules. Gears are external
//! spur gears; the basic rack defaults to ISO 53 type A.

pub mod allowance;
pub mod check;
pub mod cycloidal;
pub mod defect;
pub mod form;
pub mod internal;
pub mod involute;
pub mod layout;
pub mod made;
pub mod measure;
pub mod modules;
pub mod outline;
pub mod pair;
pub mod system;
pub mod working;

pub use check::{check_mesh, MeshLimits};
pub use cycloidal::{check_cycloidal, cycloidal_mesh, cycloidal_outline, CycloidalLimits, CycloidalMesh};
pub use defect::{GearRef, MeshDefect, Role};
pub use form::ToothForm;
pub use involute::{inv, inv_inverse};
pub use made::{
    common_windows, mesh_as_made, mesh_at_place, on_hand_defects, running_window, AsMade, Making,
};
pub use modules::{
    is_standard_module, module_from_diametral_pitch, Series, MM_PER_INCH, MODULE_SERIES_I, MODULE_SERIES_II,
};
pub use system::{RackProfile, ToothSystem};
pub use working::{mesh_geometry, shift_for_centre_distance, MeshGeometry, Mounting};
