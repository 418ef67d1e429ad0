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

/// A coil works only when its two sides lie under poles of opposite polarity: with the coil
/// centred on the interpolar axis, where it makes its EMF, each side must lie in the middle half
/// of a pole, within a quarter pole pitch of that pole's axis, so |y/2 − 1/2| ≤ 1/4 pole pitch:
/// the sides are half to one and a half pole pitches apart (90° to 270° electrical, a pitch
/// factor of at least sin 45°). Read off each element's first coil as traced: the angle
/// between its top and bottom slots [derived; docs/domain.md, "Coil span limits"].
fn opposite_poles(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    for e in &w.elements {
        let first = &w.connections[(e.first_coil - 1) as usize];
        let slots = (first.bottom.slot + d.slots - first.top.slot) % d.slots;
        let pole_pitches = f64::from(slots) * f64::from(d.poles) / f64::from(d.slots);
        // Electrical degrees between the sides, 0 to 360.
        let electrical = (pole_pitches * 180.0).rem_euclid(360.0);
        let works = (90.0 - 1e-9..=270.0 + 1e-9).contains(&electrical);
        let label = if w.is_multi_element() {
            format!("{} element: ", e.kind.as_str())
        } else {
            String::new()
        };
        out.push(Finding::of(
            &rules::SPAN_OPPOSITE_POLES,
            works,
            format!(
                "{label}coil {} spans slots {} to {}: {} pole pitches apart ({} electrical degrees, modulo 360); its sides must lie under poles of opposite polarity, half to one and a half pole pitches apart (90 to 270 degrees), or the coil makes little or no EMF",
                first.coil,
                first.top.slot,
                first.bottom.slot,
                fmt_fixed(pole_pitches, 2),
                fmt_fixed(electrical, 1),
            ),
        ));
    }
}
