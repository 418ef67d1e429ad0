//! Span rules: the span near one pole pitch, and a note when it was defaulted.
//!
//! Part of the `checks` stage.

use super::{Finding, rules};
use crate::base::number::fmt_fixed;
use crate::design::{Design, SpanSource};
use crate::theory::pitch::SpanAngle;
use crate::theory::words::span_shop;
use crate::winding::Winding;

/// Even poles and a span from 1 to S − 1 are the design stage's to refuse (with a located
/// error); what is left here is the span against the pole pitch.
pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    opposite_poles(d, w, out);
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

/// Each element's first coil as traced, against the opposite-poles window of [`SpanAngle`]:
/// the angle between its top and bottom slots.
fn opposite_poles(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    for e in &w.elements {
        let first = &w.connections[(e.first_coil - 1) as usize];
        let slots = (first.bottom.slot + d.slots - first.top.slot) % d.slots;
        let angle = SpanAngle::new(slots, d.slots, d.poles);
        let label = if w.is_multi_element() {
            format!("{} element: ", e.kind.as_str())
        } else {
            String::new()
        };
        out.push(Finding::of(
            &rules::SPAN_OPPOSITE_POLES,
            angle.opposite_poles(),
            format!(
                "{label}coil {} spans slots {} to {}: {} pole pitches apart ({} electrical degrees, modulo 360); its sides must lie under poles of opposite polarity, half to one and a half pole pitches apart (90 to 270 degrees), or the coil makes little or no EMF",
                first.coil,
                first.top.slot,
                first.bottom.slot,
                fmt_fixed(angle.pole_pitches, 2),
                fmt_fixed(angle.electrical_deg, 1),
            ),
        ));
    }
}
