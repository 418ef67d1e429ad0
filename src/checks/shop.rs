//! Shop rules of thumb.
//!
//! Part of the `checks` stage.

use super::{Finding, rules};
use crate::design::{Design, WindingType};
use crate::winding::Winding;

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    let c = w.active_coils;
    let suggests = bar_rule(d.poles, c);
    if let Some(kind) = suggests {
        let matches = kind == d.winding_type;
        out.push(Finding::of(
            &rules::SHOP_BAR_COUNT,
            matches,
            format!(
                "{c} bars on {} poles suggests {}; the design is {}{}",
                d.poles,
                kind.as_str(),
                d.winding_type.as_str(),
                if matches {
                    ""
                } else {
                    ": look twice at the old winding before choosing"
                }
            ),
        ));
    }
}

/// The winding kind the shop's bar-count rule of thumb suggests for `c` bars on `poles` poles,
/// when the rule speaks for that pole count ([`BAR_RULE`](super::sources::BAR_RULE), common practice).
pub fn bar_rule(poles: u32, c: u32) -> Option<WindingType> {
    match poles {
        4 | 8 => Some(if c.is_multiple_of(2) {
            WindingType::Lap
        } else {
            WindingType::Wave
        }),
        6 => Some(if c.is_multiple_of(3) {
            WindingType::Lap
        } else {
            WindingType::Wave
        }),
        _ => None,
    }
}
