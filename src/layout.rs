//! Layout of the coil on the bobbin: traverse, turns per layer, layers, build, mean turn, fill.
//!
//! Windings are listed innermost first (DESIGN.md):
//! - traverse L = h − 2·flange − 2·margin (flange = bobbin wall);
//! - turns per layer = floor(L / (n · d · pitch)), d the overall diameter; strip foils in hand lie on
//!   each other, so a strip turn takes its width and a layer n foils of thickness;
//! - layers = ceil(N / turns per layer); build = layers·d + (layers − 1)·interlayer;
//! - total build = wall + Σ builds + between-windings gaps + outer wrap; it fits when
//!   total ≤ w − clearance (`ui`: each leg has w/2 of the window);
//! - a split bobbin (DESIGN.md v2): the traverse less the divider is shared, section 1 taking
//!   `split_at` of it and section 2 the rest; each section's windings are layered from the tube out
//!   on their own share, with their own mean turns, and each section's build must fit;
//! - mean turn MLT = 2(a + s) + 8·wall + 2π·x, x from the tube's outer face to the middle of the
//!   winding's build (a rectangular tube with rounded corners of radius x);
//! - copper fill = Σ N·n·area / Aw.
//!   For `ui`, each leg carries ceil(N/2) turns of every winding (the first leg, the fuller one).

use crate::geometry::{CoreDims, Shape};
use serde::Serialize;
use std::f64::consts::PI;

/// Insulation and bobbin settings, all in mm except the pitch factor.
#[derive(Debug, Clone, PartialEq)]
pub struct LayoutSettings {
    /// Bobbin wall (tube and flanges), mm.
    pub bobbin_wall_mm: f64,
    /// Extra margin at each end of the traverse, mm.
    pub margin_mm: f64,
    /// Winding pitch factor (1.05 for hand winding).
    pub pitch: f64,
    /// Insulation between layers, mm.
    pub interlayer_mm: f64,
    /// Insulation between windings, mm.
    pub between_windings_mm: f64,
    /// Outer wrap, mm.
    pub outer_mm: f64,
    /// Clearance left between the coil and the outer leg, mm.
    pub clearance_mm: f64,
    /// A split bobbin: two sections side by side along the traverse.
    pub split: Option<Split>,
}

/// A split bobbin: the traverse less a divider, shared between two sections side by side.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Split {
    /// The divider's thickness, mm.
    pub divider_mm: f64,
    /// Section 1's fraction of the traverse (after the divider).
    pub split_at: f64,
}

impl Default for LayoutSettings {
    fn default() -> Self {
        LayoutSettings {
            bobbin_wall_mm: 1.5,
            margin_mm: 0.0,
            pitch: 1.05,
            interlayer_mm: 0.05,
            between_windings_mm: 0.25,
            outer_mm: 0.2,
            clearance_mm: 1.0,
            split: None,
        }
    }
}

/// What a winding brings to the layout.
#[derive(Debug, Clone, PartialEq)]
pub struct CoilInput {
    /// Turns of the whole winding.
    pub turns: u32,
    /// Strands in hand.
    pub strands: u32,
    /// Size of one strand along the traverse (overall diameter or strip width), mm.
    pub traverse_mm: f64,
    /// Size of one strand in the build direction, mm.
    pub build_mm: f64,
    /// Copper area of one strand, mm².
    pub area_mm2: f64,
    /// A measured build that replaces the computed one (a kept winding), mm.
    pub measured_build_mm: Option<f64>,
    /// Strands stacked in the build direction (foils of strip) rather than side by side.
    pub stacked: bool,
    /// Its section of a split bobbin (1 or 2; 1 on a single bobbin).
    pub section: u32,
}

/// One winding's place on the bobbin.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CoilLayout {
    /// Turns on this coil (the first leg's half for `ui`).
    pub coil_turns: u32,
    /// Turns per layer (0 when not even one turn fits).
    pub turns_per_layer: u32,
    /// Layers.
    pub layers: u32,
    /// Radial build of the winding, mm.
    pub build_mm: f64,
    /// Distance from the tube's outer face to the winding's inner face, mm.
    pub start_mm: f64,
    /// Radial thickness of one layer (one diameter, or every foil in hand), mm.
    pub layer_mm: f64,
    /// Insulation between its layers, mm.
    pub interlayer_mm: f64,
    /// Its section of a split bobbin (1 on a single bobbin).
    pub section: u32,
    /// The traverse it winds on (its section's share on a split bobbin), mm.
    pub traverse_mm: f64,
    /// Where that traverse starts, from the first flange's inner face (after the margin), mm.
    pub offset_mm: f64,
    /// Distance from the tube's outer face to the middle of the winding, mm.
    pub mid_mm: f64,
    /// Mean length of turn, mm.
    pub mean_turn_mm: f64,
    /// Running turn count at the end of each layer (for this coil).
    pub checkpoints: Vec<u32>,
}

/// The whole coil.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Layout {
    /// Traverse available for turns, mm.
    pub traverse_mm: f64,
    /// Each winding, innermost first.
    pub coils: Vec<CoilLayout>,
    /// Total build from the tube's inner face, mm.
    pub build_mm: f64,
    /// Build available, mm.
    pub available_mm: f64,
    /// Whether every winding gets at least one turn per layer and the build fits.
    pub fits: bool,
    /// Copper area over window area.
    pub copper_fill: f64,
}

impl CoilLayout {
    /// Where each layer after the first begins, from the tube's outer face, mm: the middle of the
    /// insulation between two layers (what a drawing of the coil marks). Only those inside the
    /// winding's build (a kept winding's measured build may be thinner than its layers).
    pub fn layer_boundaries_mm(&self) -> Vec<f64> {
        if self.layers < 2 || self.turns_per_layer == 0 {
            return Vec::new();
        }
        let pitch = self.layer_mm + self.interlayer_mm;
        (1..self.layers)
            .map(|l| self.start_mm + l as f64 * pitch - self.interlayer_mm / 2.0)
            .take_while(|&x| x < self.start_mm + self.build_mm)
            .collect()
    }

    /// Fills the running turn count at the end of each layer (left empty while a plan iterates).
    pub fn fill_checkpoints(&mut self) {
        let (n, tpl) = (self.coil_turns, self.turns_per_layer);
        // A coil of more layers than anyone winds (a plan refused as bad input) keeps none.
        self.checkpoints = if tpl == 0 || self.layers > 100_000 {
            Vec::new()
        } else {
            (1..=self.layers).map(|l| (l * tpl).min(n)).collect()
        };
    }
}

/// Turns on the first (fuller) coil of a winding.
pub fn coil_turns(shape: Shape, turns: u32) -> u32 {
    match shape {
        Shape::Ei => turns,
        Shape::Ui => turns.div_ceil(2),
    }
}

/// A section's share of the traverse: (its length, where it starts from the first flange), mm.
/// A single bobbin has one section, the whole traverse.
pub fn section_traverse(traverse: f64, split: Option<Split>, section: u32) -> (f64, f64) {
    match split {
        None => (traverse, 0.0),
        Some(sp) => {
            let shared = (traverse - sp.divider_mm).max(0.0);
            let first = shared * sp.split_at;
            if section == 2 {
                (shared - first, first + sp.divider_mm)
            } else {
                (first, 0.0)
            }
        }
    }
}

/// Turns per layer, layers and build of one coil on a traverse of `traverse` mm.
fn stack_layers(w: &CoilInput, n: u32, traverse: f64, s: &LayoutSettings) -> (u32, u32, f64, f64) {
    // Round strands lie side by side along the traverse; strip foils in hand lie on each other.
    let (per_turn, layer_build) = if w.stacked {
        (w.traverse_mm * s.pitch, w.strands as f64 * w.build_mm)
    } else {
        (w.strands as f64 * w.traverse_mm * s.pitch, w.build_mm)
    };
    let tpl_real = if per_turn > 0.0 {
        traverse / per_turn
    } else {
        0.0
    };
    let tpl = if tpl_real.is_finite() && tpl_real >= 1.0 {
        tpl_real.floor().min(1e6) as u32
    } else {
        0
    };
    let (layers, build) = if tpl == 0 {
        let layers = n.max(1);
        (layers, layers as f64 * layer_build)
    } else {
        let layers = n.div_ceil(tpl).max(1);
        (
            layers,
            layers as f64 * layer_build + (layers - 1) as f64 * s.interlayer_mm,
        )
    };
    (
        tpl,
        layers,
        w.measured_build_mm.unwrap_or(build),
        layer_build,
    )
}

/// Lays out the windings on the core: each section of a split bobbin is layered on its own, from
/// the tube out, on its share of the traverse.
pub fn layout(core: &CoreDims, s: &LayoutSettings, windings: &[CoilInput]) -> Layout {
    let traverse = core.window_height_mm - 2.0 * s.bobbin_wall_mm - 2.0 * s.margin_mm;
    let mut coils = Vec::with_capacity(windings.len());
    // From the tube's outer face, per bobbin section; whether a section has a winding yet.
    let mut position = [0.0f64; 2];
    let mut used = [false; 2];
    let mut all_fit_layer = true;
    let mut copper = 0.0;
    for w in windings {
        let sec = if s.split.is_some() && w.section == 2 {
            2
        } else {
            1
        };
        let slot = (sec - 1) as usize;
        if used[slot] {
            position[slot] += s.between_windings_mm;
        }
        used[slot] = true;
        let (tl, offset) = section_traverse(traverse, s.split, sec);
        let n = coil_turns(core.shape, w.turns);
        let (tpl, layers, build, layer_build) = stack_layers(w, n, tl, s);
        all_fit_layer &= tpl > 0;
        let start = position[slot];
        let mid = start + build / 2.0;
        position[slot] += build;
        let mlt = 2.0 * (core.tongue_mm + core.stack_mm) + 8.0 * s.bobbin_wall_mm + 2.0 * PI * mid;
        copper += w.turns as f64 * w.strands as f64 * w.area_mm2;
        coils.push(CoilLayout {
            coil_turns: n,
            turns_per_layer: tpl,
            layers,
            build_mm: build,
            start_mm: start,
            layer_mm: layer_build,
            interlayer_mm: s.interlayer_mm,
            section: sec,
            traverse_mm: tl,
            offset_mm: offset,
            mid_mm: mid,
            mean_turn_mm: mlt,
            checkpoints: Vec::new(),
        });
    }
    let total = s.bobbin_wall_mm + position[0].max(position[1]) + s.outer_mm;
    let available = match core.shape {
        Shape::Ei => core.window_width_mm - s.clearance_mm,
        Shape::Ui => core.window_width_mm / 2.0 - s.clearance_mm,
    };
    let traverses_ok = (1..=if s.split.is_some() { 2 } else { 1 })
        .all(|sec| section_traverse(traverse, s.split, sec).0 > 0.0);
    Layout {
        traverse_mm: traverse,
        coils,
        build_mm: total,
        available_mm: available,
        fits: all_fit_layer && traverse > 0.0 && traverses_ok && total <= available + 1e-9,
        copper_fill: copper / (core.window_width_mm * core.window_height_mm),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::{CoreDims, Shape};
    use approx::assert_relative_eq;

    /// Arithmetic of the layout rules is exact.
    const EXACT: f64 = 1e-9;

    fn coil(turns: u32, d: f64) -> CoilInput {
        CoilInput {
            turns,
            strands: 1,
            traverse_mm: d,
            build_mm: d,
            area_mm2: crate::wire::round_area_mm2(d * 0.95),
            measured_build_mm: None,
            stacked: false,
            section: 1,
        }
    }

    #[test]
    fn worked_by_hand() {
        // h 48, wall 1.5 → traverse 45; d 1.0, pitch 1.05 → 42 turns per layer; 100 turns → 3 layers;
        // build 3·1.0 + 2·0.05 = 3.1; MLT = 2(32 + 40) + 12 + 2π·1.55.
        let core = CoreDims::new(Shape::Ei, 32.0, 40.0, (16.0, 48.0), 0.95);
        let l = layout(&core, &LayoutSettings::default(), &[coil(100, 1.0)]);
        let mut c = l.coils[0].clone();
        c.fill_checkpoints();
        assert_eq!((c.turns_per_layer, c.layers), (42, 3));
        assert_eq!(c.checkpoints, vec![42, 84, 100]);
        assert_relative_eq!(c.build_mm, 3.1, max_relative = EXACT);
        assert_relative_eq!(
            c.mean_turn_mm,
            156.0 + 2.0 * PI * 1.55,
            max_relative = EXACT
        );
        assert_relative_eq!(l.build_mm, 1.5 + 3.1 + 0.2, max_relative = EXACT);
        assert!(l.fits);
    }

    #[test]
    fn second_winding_sits_outside_the_first() {
        let core = CoreDims::new(Shape::Ei, 32.0, 40.0, (16.0, 48.0), 0.95);
        let l = layout(
            &core,
            &LayoutSettings::default(),
            &[coil(100, 1.0), coil(10, 2.0)],
        );
        assert_relative_eq!(l.coils[1].mid_mm, 3.1 + 0.25 + 1.0, max_relative = EXACT);
        assert!(l.coils[1].mean_turn_mm > l.coils[0].mean_turn_mm);
    }

    #[test]
    fn foils_in_hand_make_thick_layers() {
        // Three 0.4 mm foils (0.5 mm insulated) in hand, 22 mm wide on a 45 mm traverse: one turn per
        // layer (22.1·1.05 > 45/2), so 6 turns are 6 layers, each 1.5 mm thick (by hand).
        let core = CoreDims::new(Shape::Ei, 32.0, 40.0, (16.0, 48.0), 0.95);
        let strip = CoilInput {
            turns: 6,
            strands: 3,
            traverse_mm: 22.1,
            build_mm: 0.5,
            area_mm2: 8.8,
            measured_build_mm: None,
            stacked: true,
            section: 1,
        };
        let l = layout(&core, &LayoutSettings::default(), &[coil(100, 1.0), strip]);
        let c = &l.coils[1];
        assert_eq!((c.turns_per_layer, c.layers), (1, 6));
        assert_relative_eq!(c.layer_mm, 1.5, max_relative = EXACT);
        assert_relative_eq!(c.start_mm, 3.1 + 0.25, max_relative = EXACT);
        let b = c.layer_boundaries_mm();
        assert_eq!(b.len(), 5);
        // Evenly spaced across the whole build, 1.55 mm apart, the last one layer from the outside.
        assert_relative_eq!(b[0], 3.35 + 1.5 + 0.025, max_relative = EXACT);
        assert_relative_eq!(b[4] - b[0], 4.0 * 1.55, max_relative = EXACT);
        assert_relative_eq!(
            c.start_mm + c.build_mm - b[4],
            1.5 + 0.025,
            max_relative = EXACT
        );
    }

    #[test]
    fn too_thick_for_one_turn_does_not_fit() {
        let core = CoreDims::new(Shape::Ei, 10.0, 10.0, (5.0, 4.0), 0.95);
        let l = layout(&core, &LayoutSettings::default(), &[coil(10, 2.0)]);
        assert_eq!(l.coils[0].turns_per_layer, 0);
        assert!(!l.fits);
    }

    #[test]
    fn ui_splits_each_winding_over_two_legs() {
        let core = CoreDims::new(Shape::Ui, 20.0, 30.0, (20.0, 60.0), 0.95);
        let l = layout(&core, &LayoutSettings::default(), &[coil(101, 0.5)]);
        assert_eq!(l.coils[0].coil_turns, 51);
        assert_relative_eq!(l.available_mm, 9.0, max_relative = EXACT);
    }
}
