//! Shop rules of thumb.
//!
//! Part of the `checks` stage.

use super::{Finding, rules};
use crate::design::Design;
use crate::theory::bar_rule;
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
