//! Blocks that carry a thrust into the ground, and the sliding check.
//!
//! # Method
//! - **Bearing block** (a horizontal fitting, and the base of a block under a sag
//!   bend): bearing area A_b = SF·T/σ with σ the allowable soil bearing; the face
//!   is proportioned by a given height or width ÷ height ([`BlockDims`]).
//! - **Gravity block** under upward thrust (a crest): the block's effective weight
//!   must be SF times the upward component, W = γ_eff·V, with γ_eff = γ_c, reduced
//!   below groundwater by the water's unit weight (buoyancy).
//! - **Sliding**: friction μ·N under the base against SF_slide·T_h, N the normal
//!   force on the base ([`sliding_factor`]).
//!
//! # Assumptions
//! The block bears on undisturbed soil; the block's own weight is neglected on a
//! sag block's base (conservative for sliding); a gravity block has a square plan.
//! Sources: the thrust-restraint guides' bearing formula (AWWA M23, NFPA 24 annex;
//! from memory); concrete 23.6 kN/m³ is common practice.

use super::keyed_choice;
use crate::catalog::ChoiceOption;
use crate::units::STANDARD_GRAVITY;

keyed_choice! {
    /// How a bearing face is proportioned.
    pub enum BlockDims {
        Height => ("height", "Given face height"),
        Aspect => ("aspect", "Given width ÷ height"),
    }
}

/// The face-proportion options (derived from [`BlockDims`]).
pub const BLOCK_DIM_OPTIONS: &[ChoiceOption] = BlockDims::OPTIONS;

/// Whether a block is below groundwater.
pub const YES_NO: &[ChoiceOption] = &[
    ChoiceOption {
        key: "no",
        label: "No (above the water table)",
    },
    ChoiceOption {
        key: "yes",
        label: "Yes (below groundwater: buoyancy)",
    },
];

/// Unit weight of water for buoyancy, N/m³ (1000 kg/m³ × standard gravity).
pub const WATER_UNIT_WEIGHT: f64 = 1000.0 * STANDARD_GRAVITY;

/// A sized block.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Block {
    /// A bearing face `h` high and `w` wide, m.
    Bearing { h: f64, w: f64 },
    /// A gravity block of `volume` m³, square plan of `side` m, `height` m.
    Gravity { volume: f64, side: f64, height: f64 },
}

/// Bearing area SF·T/σ, m².
pub fn bearing_area(sf: f64, load: f64, sigma: f64) -> f64 {
    sf * load / sigma
}

/// Face height and width of a bearing area: from a given height, or from a given
/// width ÷ height ratio.
pub fn face(area: f64, dims: FaceGiven) -> (f64, f64) {
    match dims {
        FaceGiven::Height(h) => (h, area / h),
        FaceGiven::Aspect(r) => {
            let h = (area / r).sqrt();
            (h, r * h)
        }
    }
}

/// What fixes the proportions of a bearing face.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum FaceGiven {
    Height(f64),
    Aspect(f64),
}

/// A gravity block for an upward thrust: the effective weight needed (N), its
/// concrete volume (m³) and mass (kg).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct GravityBlock {
    pub weight: f64,
    pub volume: f64,
    pub mass: f64,
    /// Effective unit weight of the concrete, N/m³.
    pub gamma_eff: f64,
}

/// The effective unit weight of concrete, below groundwater reduced by the water's.
pub fn effective_unit_weight(gamma_c: f64, submerged: bool) -> f64 {
    if submerged {
        gamma_c - WATER_UNIT_WEIGHT
    } else {
        gamma_c
    }
}

/// The gravity block whose effective weight is SF times the upward thrust `t_up`
/// (none below zero). `None` when the concrete would float (γ_eff ≤ 0).
pub fn gravity_block(sf: f64, t_up: f64, gamma_c: f64, submerged: bool) -> Option<GravityBlock> {
    let gamma_eff = effective_unit_weight(gamma_c, submerged);
    if gamma_eff <= 0.0 {
        return None;
    }
    let weight = sf * t_up.max(0.0);
    let volume = weight / gamma_eff;
    Some(GravityBlock {
        weight,
        volume,
        mass: gamma_c * volume / STANDARD_GRAVITY,
        gamma_eff,
    })
}

/// The factor of safety against sliding, μ·N/T_h (N below zero counts as zero).
pub fn sliding_factor(friction: f64, normal: f64, t_h: f64) -> f64 {
    friction * normal.max(0.0) / t_h
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn a_face_keeps_its_area_either_way_it_is_proportioned() {
        let (h, w) = face(1.5, FaceGiven::Height(0.6));
        assert_relative_eq!(h * w, 1.5, max_relative = 1e-12);
        let (h, w) = face(1.5, FaceGiven::Aspect(1.5));
        assert_relative_eq!(h * w, 1.5, max_relative = 1e-12);
        assert_relative_eq!(w / h, 1.5, max_relative = 1e-12);
    }

    #[test]
    fn a_submerged_block_is_larger_by_the_ratio_of_unit_weights() {
        // Derived from the definition: V = SF·T/γ_eff.
        let dry = gravity_block(1.5, 10e3, 23.6e3, false).unwrap();
        let wet = gravity_block(1.5, 10e3, 23.6e3, true).unwrap();
        assert_relative_eq!(
            wet.volume / dry.volume,
            23.6e3 / (23.6e3 - WATER_UNIT_WEIGHT),
            max_relative = 1e-12
        );
        assert!(
            gravity_block(1.5, 10e3, 9e3, true).is_none(),
            "concrete lighter than water floats"
        );
    }
}
