//! Fitting a train into a reducer: which stage goes in which place of the housing, so that
//! each place gets its module and each stage reaches the housing's fixed centre distance by
//! profile shift. Owns the arrangement; the mesh arithmetic is [`crate::geometry`]'s.

use crate::geometry::{check_mesh, mesh_at_place, MeshGeometry, ToothSystem};
use crate::model::problem::MeshRules;
use crate::model::train::{Stage, Train};

/// What each place of the housing needs, input to output.
#[derive(Debug, Clone, PartialEq)]
pub struct Places {
    /// Module of each place, mm, or one for all.
    pub modules: Vec<f64>,
    /// Fixed working centre distance of each place, mm; empty when free.
    pub centre_distances_mm: Vec<f64>,
    /// Mesh rules (rack, limits, shift-sum range).
    pub rules: MeshRules,
}

fn same(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-9 * a.abs().max(b.abs())
}

impl Places {
    fn module_at(&self, place: usize) -> Option<f64> {
        match self.modules.len() {
            0 => None,
            1 => Some(self.modules[0]),
            _ => self.modules.get(place).copied(),
        }
    }

    /// The mesh of `stage` in `place`, if it runs there.
    fn mesh(&self, stage: &Stage, place: usize) -> Option<MeshGeometry> {
        if self.module_at(place).is_some_and(|m| !same(m, stage.module_mm)) {
            return None;
        }
        let fixed = self.centre_distances_mm.get(place).copied();
        if let (None, Some(m)) = (fixed, stage.mesh) {
            // Worked out and checked once per stage by the search.
            return Some(m);
        }
        let sys = ToothSystem::new(stage.module_mm, stage.pressure_angle_deg, self.rules.rack).ok()?;
        let teeth = [stage.driver.teeth, stage.driven.teeth];
        // Gears on hand keep their shift and tip: a fixed place is met by them as they are,
        // within the centre-distance tolerance, or not at all; only gears to cut are shifted.
        let made = [stage.driver.made, stage.driven.made];
        let range = self.rules.shift_sum.0..=self.rules.shift_sum.1;
        let mesh = mesh_at_place(&sys, teeth, made, fixed, &range, self.rules.centre_tolerance_mm).ok()?;
        check_mesh(&mesh, &self.rules.limits).is_empty().then_some(mesh)
    }

    /// Does `stage` mesh in one of the first `places` places? A stage that fits none can be in
    /// no train of that many stages.
    pub fn fits_some_place(&self, stage: &Stage, places: usize) -> bool {
        (0..places).any(|k| self.mesh(stage, k).is_some())
    }

    /// The first order of the train's stages (input to output) that fits every place, with
    /// each stage's mesh; `None` when no order fits. Orders are tried from the train's own
    /// (finer module first, then ascending stage ratio), so the result is deterministic.
    pub fn arrange(&self, t: &Train) -> Option<(Vec<usize>, Vec<MeshGeometry>)> {
        let n = t.stages.len();
        let mut order = Vec::with_capacity(n);
        let mut meshes = Vec::with_capacity(n);
        let mut used = vec![false; n];
        self.search(t, &mut used, &mut order, &mut meshes).then_some((order, meshes))
    }

    fn search(
        &self,
        t: &Train,
        used: &mut [bool],
        order: &mut Vec<usize>,
        meshes: &mut Vec<MeshGeometry>,
    ) -> bool {
        let place = order.len();
        if place == t.stages.len() {
            return true;
        }
        for k in 0..t.stages.len() {
            // Equal stages are interchangeable: try only the first unused one of each.
            if used[k] || (0..k).any(|j| !used[j] && t.stages[j] == t.stages[k]) {
                continue;
            }
            if let Some(m) = self.mesh(&t.stages[k], place) {
                used[k] = true;
                order.push(k);
                meshes.push(m);
                if self.search(t, used, order, meshes) {
                    return true;
                }
                used[k] = false;
                order.pop();
                meshes.pop();
            }
        }
        false
    }
}

/// The train with its stages in `order` and each stage's mesh set.
pub fn arranged(t: &Train, order: &[usize], meshes: &[MeshGeometry]) -> Train {
    let stages =
        order.iter().zip(meshes).map(|(&k, m)| Stage { mesh: Some(*m), ..t.stages[k].clone() }).collect();
    Train { stages, ..t.clone() }
}
