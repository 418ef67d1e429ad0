//! Span rules: the span near one pole pitch, and a note when it was defaulted.
//!
//! Part of the `checks` stage.

use super::{Finding, rules};
use crate::base::number::fmt_fixed;
use crate::design::{Design, SpanSource};
use crate::theory::words::span_shop;
use crate::winding::Winding;

/// Even poles and a span from 1 to S − 1 are the design stage's to refuse (with a located
/// error); what is left here is the span against the pole pitch.
pub(super) fn check(d: &Design, _w: &Winding, out: &mut Vec<Finding>) {
    let pole_pitch = f64::from(d.slots) / f64::from(d.poles);
    let off = f64::from(d.span) - pole_pitch;
    let within = off.abs() <= 1.0 + 1e-9;
    let how = if off.abs() < 1e-9 {
        "full pitch".to_string()
    } else if off < 0.0 {
        format!("short by {} slots", fmt_fixed(-off, 2))
    } else {
        format!("long by {} slots", fmt_fixed(off, 2))
    };
    out.push(Finding::of(&rules::SPAN_POLE_PITCH, within, format!(
            "span {} slots against a pole pitch S/P = {} slots ({how}); keep within 1 slot of the pole pitch",
            d.span,
            fmt_fixed(pole_pitch, 2)
        )));
    if d.span_source == SpanSource::Default {
        out.push(Finding::of(&rules::SPAN_DEFAULT, true, format!(
                "no span given: used floor(S/P) = floor({}/{}) = {} slots (\"{}\"); give `span` to match the old coils",
                d.slots,
                d.poles,
                d.span,
                span_shop(d.span)
            )));
    }
}
