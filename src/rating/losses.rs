//! Armature copper loss and brush contact loss.
//!
//! Part of the `rating` stage: pure arithmetic.

/// Losses at the rated current.
#[derive(Clone, Debug, PartialEq)]
pub struct Losses {
    /// I²·R_a at the reference temperature, W (needs the resistance).
    pub copper_w: Option<f64>,
    /// The temperature the copper loss is taken at, °C.
    pub copper_at_c: f64,
    /// V_b·I, W (conventional drop, see [`super::emf::brush_drop_v`]).
    pub brush_w: f64,
}

/// Copper loss I²·R and brush contact loss V_b·I.
pub fn losses(
    current_a: f64,
    r_hot_ohm: Option<f64>,
    reference_c: f64,
    brush_drop_v: f64,
) -> Losses {
    Losses {
        copper_w: r_hot_ohm.map(|r| current_a * current_a * r),
        copper_at_c: reference_c,
        brush_w: brush_drop_v * current_a,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn loss_values() {
        let l = losses(10.0, Some(0.5), 95.0, 2.0);
        assert_eq!((l.copper_w, l.brush_w), (Some(50.0), 20.0));
    }
}
