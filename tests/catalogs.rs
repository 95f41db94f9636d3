//! Every catalogue shipped in catalogs/ loads and can mesh.

use gearsieve::model::catalog::{load, CatalogueDefaults};
use gearsieve::model::pool::Pool;

#[test]
fn every_shipped_catalogue_loads() {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("catalogs");
    let mut n = 0;
    for entry in std::fs::read_dir(&dir).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().is_some_and(|e| e == "csv") {
            let gears = load(&path, CatalogueDefaults::default()).unwrap_or_else(|e| panic!("{e}"));
            assert!(!gears.is_empty());
            Pool::from_stock(&gears, &path.display().to_string()).unwrap_or_else(|e| panic!("{e}"));
            n += 1;
        }
    }
    assert!(n >= 3, "at least three demo catalogues ship, found {n}");
}
