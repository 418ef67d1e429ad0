//! The shop's winding archive, its pure part: what one archived job holds ([`Record`]), the
//! search fields taken from a checked design ([`Summary`]), what a search asks ([`Query`]) and
//! the rules that say whether an archived job is the same winding or a near one ([`compare`]).
//!
//! The database itself (the schema, the migrations, the connection) is I/O and lives in
//! `cli::archive`; nothing here touches a file.

use crate::Checked;
use crate::base::Units;
use crate::base::number::fmt_trimmed;
use crate::design::Card;
use crate::rating::conductor::{size_words, strands};
use crate::theory::words::{half_bars_words, span_shop, throw_end_bar, throw_shop};
use crate::winding::EqualizerPlan;

/// The fields of a checked winding a search needs, in the shop's terms.
#[derive(Clone, Debug, PartialEq, Eq, serde::Serialize)]
pub struct Summary {
    /// Poles P.
    pub poles: u32,
    /// Slots S.
    pub slots: u32,
    /// Commutator bars C.
    pub bars: u32,
    /// `lap`, `wave` or `frog-leg`.
    pub kind: String,
    /// Multiplicity m.
    pub multiplicity: u32,
    /// `progressive` or `retrogressive`.
    pub direction: String,
    /// Coils per slot u.
    pub coils_per_slot: u32,
    /// The (lap element's) span, slots.
    pub span: u32,
    /// The span in shop form, "1-8".
    pub span_shop: String,
    /// The bar coil 1's end lead goes to, its start lead on bar 1 (the lap element's throw).
    pub throw_end: u32,
    /// The throw in shop form, "1-29".
    pub throw_shop: String,
    /// Turns per coil.
    pub turns: u32,
    /// The wire's size, when the design gives it.
    pub wire: Option<String>,
    /// Strands in hand, when the design gives the wire.
    pub strands: Option<u32>,
    /// The lead swing from slot 1's centre line to bar 1, in half bars (+ towards rising bars).
    pub lead_swing_half_bars: i64,
    /// The lead swing in words, "-3.5 bars".
    pub lead_swing: String,
    /// Brush sets fitted.
    pub brush_sets: u32,
    /// Equalizers fitted.
    pub equalizers: u32,
    /// Dummy coils.
    pub dummies: u32,
    /// The rating, when the design gives one: "230 V, 40 A, 1750 rpm".
    pub rating: Option<String>,
}

/// The search fields of a checked design.
pub fn summary(c: &Checked) -> Summary {
    let d = &c.design;
    let w = &c.winding;
    let bars = w.active_coils;
    let pitch = w
        .elements
        .first()
        .map_or(w.pitches.commutator, |e| e.pitches.commutator);
    let wire = d
        .conductor
        .as_ref()
        // In mm whatever the design's units, so that one archive compares like with like.
        .map(|k| (size_words(&k.shape, Units::Millimetres), strands(&k.shape)));
    let swing = w.lead_swing.swing_half_bars(bars);
    let rating = d.rating.as_ref().and_then(|r| {
        let parts: Vec<String> = [
            r.voltage.map(|v| format!("{} V", fmt_trimmed(v, 1))),
            r.current.map(|a| format!("{} A", fmt_trimmed(a, 1))),
            d.speed_rpm.map(|n| format!("{} rpm", fmt_trimmed(n, 0))),
        ]
        .into_iter()
        .flatten()
        .collect();
        (!parts.is_empty()).then(|| parts.join(", "))
    });
    Summary {
        poles: d.poles,
        slots: d.slots,
        bars,
        kind: d.winding_type.as_str().to_string(),
        multiplicity: d.multiplicity,
        direction: d.direction.as_str().to_string(),
        coils_per_slot: d.coils_per_slot,
        span: w.pitches.span,
        span_shop: span_shop(w.pitches.span),
        throw_end: throw_end_bar(pitch, bars),
        throw_shop: throw_shop(pitch, bars),
        turns: d.turns,
        wire: wire.as_ref().map(|(s, _)| s.clone()),
        strands: wire.map(|(_, n)| n),
        lead_swing_half_bars: swing,
        lead_swing: half_bars_words(swing),
        brush_sets: w.brush_sets(),
        equalizers: match &w.equalizers {
            EqualizerPlan::Possible(e) => u32::try_from(e.groups.len()).unwrap_or(u32::MAX),
            _ => 0,
        },
        dummies: u32::try_from(w.dummy_coils.len()).unwrap_or(u32::MAX),
        rating,
    }
}

/// One armature's `[job]` as the user gave it: the archive never makes up a date.
#[derive(Clone, Debug, Default, PartialEq, Eq, serde::Serialize)]
pub struct JobFields {
    /// The shop's job id, the key of the archive.
    pub job: String,
    /// The customer.
    pub customer: Option<String>,
    /// The title.
    pub title: Option<String>,
    /// The date, as written.
    pub date: Option<String>,
}

/// One file of the sheet set the job was wound from, by its SHA-256.
#[derive(Clone, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
pub struct SheetFile {
    /// The file's name in the set.
    pub file: String,
    /// Its SHA-256, lowercase hex.
    pub sha256: String,
}

/// One archived revision of a job: everything `archive add` records.
#[derive(Clone, Debug, PartialEq, Eq, serde::Serialize)]
pub struct Record {
    /// The job.
    pub job: JobFields,
    /// The revision: 1 for the first add of the job, one more for each add after.
    pub revision: u32,
    /// The design file's name as given.
    pub design_name: String,
    /// The design file's text.
    pub design: String,
    /// The data card's text, when there was one.
    pub card: Option<String>,
    /// The measured readings file's text, when there was one.
    pub readings: Option<String>,
    /// The verdict on the readings: `healthy` or `not healthy` with the likeliest fault.
    pub verdict: Option<String>,
    /// Who signed the job off, in the order given.
    pub signed_by: Vec<String>,
    /// The sheet set's files with their hashes, by name; empty when none was given.
    pub sheets: Vec<SheetFile>,
    /// The checked summary.
    pub summary: Summary,
}

/// The job id a design files under: its `[job] id`, or why it has none.
pub fn job_fields(job: &crate::design::Job) -> Result<JobFields, &'static str> {
    let id = job.id.as_deref().map(str::trim).unwrap_or_default();
    if id.is_empty() {
        return Err("the design has no [job] id; the archive files every job under its id");
    }
    Ok(JobFields {
        job: id.to_string(),
        customer: job.customer.clone(),
        title: job.title.clone(),
        date: job.date.clone(),
    })
}

/// What "have we wound this before?" asks: the frame (poles, slots, bars), and what else is
/// known of the winding.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Query {
    /// Poles.
    pub poles: u32,
    /// Slots.
    pub slots: u32,
    /// Bars.
    pub bars: u32,
    /// The throw's end bar (start lead on bar 1), when known.
    pub throw_end: Option<u32>,
    /// The span, slots, when known.
    pub span: Option<u32>,
    /// Turns per coil, when known.
    pub turns: Option<u32>,
    /// Coils per slot, when known.
    pub coils_per_slot: Option<u32>,
    /// The winding kind, when known.
    pub kind: Option<String>,
}

impl Query {
    /// Everything a checked summary says.
    pub fn of_summary(s: &Summary) -> Query {
        Query {
            poles: s.poles,
            slots: s.slots,
            bars: s.bars,
            throw_end: Some(s.throw_end),
            span: Some(s.span),
            turns: Some(s.turns),
            coils_per_slot: Some(s.coils_per_slot),
            kind: Some(s.kind.clone()),
        }
    }

    /// What a data card observed.
    pub fn of_card(c: &Card) -> Query {
        Query {
            poles: c.poles,
            slots: c.slots,
            bars: c.bars,
            throw_end: Some(c.throw_end),
            span: Some(c.coil_span),
            turns: Some(c.turns),
            coils_per_slot: c.coils_per_slot,
            kind: None,
        }
    }

    /// The bars an archived job may have and still be a near match: one either side.
    pub fn bar_range(&self) -> (u32, u32) {
        (self.bars.saturating_sub(1), self.bars.saturating_add(1))
    }
}

/// How an archived job compares with a query: `None` when it is neither the same winding nor
/// a near one (another frame, or bars more than one off); else the differences, each in words,
/// empty for an exact match.
///
/// Near: the same poles, slots and bars with another throw (or span, turns, coils per slot,
/// kind), or one bar off.
pub fn compare(q: &Query, s: &Summary) -> Option<Vec<String>> {
    if q.poles != s.poles || q.slots != s.slots || q.bars.abs_diff(s.bars) > 1 {
        return None;
    }
    let mut d = Vec::new();
    if q.bars != s.bars {
        d.push(format!(
            "bars {} (one {} the {} asked)",
            s.bars,
            if s.bars > q.bars {
                "more than"
            } else {
                "fewer than"
            },
            q.bars
        ));
    }
    if let Some(t) = q.throw_end.filter(|&t| t != s.throw_end) {
        d.push(format!("throw {} (asked 1-{t})", s.throw_shop));
    }
    if let Some(y) = q.span.filter(|&y| y != s.span) {
        d.push(format!("span {} (asked {})", s.span_shop, span_shop(y)));
    }
    if let Some(n) = q.turns.filter(|&n| n != s.turns) {
        d.push(format!("turns {} (asked {n})", s.turns));
    }
    if let Some(u) = q.coils_per_slot.filter(|&u| u != s.coils_per_slot) {
        d.push(format!("coils per slot {} (asked {u})", s.coils_per_slot));
    }
    if let Some(k) = q.kind.as_deref().filter(|&k| k != s.kind) {
        d.push(format!("kind {} (asked {k})", s.kind));
    }
    Some(d)
}

/// Where a data card disagrees with the design it is archived with, in words (empty when it
/// agrees): another job id on the card, or other poles, slots or bars than the design has. A
/// card records the armature before it was stripped; the rewind keeps its frame.
pub fn card_disagreements(card: &Card, job: &str, s: &Summary) -> Vec<String> {
    let mut d = Vec::new();
    if let Some(id) = card.job.id.as_deref().filter(|&id| id != job) {
        d.push(format!("the card is of job {id}, the design of job {job}"));
    }
    for (what, on_card, in_design) in [
        ("poles", card.poles, s.poles),
        ("slots", card.slots, s.slots),
        ("bars", card.bars, s.bars),
    ] {
        if on_card != in_design {
            d.push(format!(
                "the card has {on_card} {what}, the design {in_design}"
            ));
        }
    }
    d
}

/// One job found by a search.
#[derive(Clone, Debug, PartialEq, Eq, serde::Serialize)]
pub struct Match {
    /// The job id.
    pub job: String,
    /// The revision that matches best (exact before near, then the fewest differences, then
    /// the newest).
    pub revision: u32,
    /// The job's newest revision, which may be a later rewind on another frame (filled in
    /// from the archive; the matched revision until then).
    pub latest_revision: u32,
    /// The customer, as archived.
    pub customer: Option<String>,
    /// The date, as archived.
    pub date: Option<String>,
    /// True when nothing the query knows differs.
    pub exact: bool,
    /// How a near match differs, in words.
    pub differences: Vec<String>,
    /// The archived winding.
    pub summary: Summary,
}

/// The matches among `records` (any revisions of any jobs): for each job its best revision
/// (exact before near, then the fewest differences, then the newest), and the jobs exact ones
/// first, then near ones by fewest differences, each group by job id.
///
/// Every revision counts: a job rewound later on another frame was still wound on this one
/// once.
pub fn matches(q: &Query, records: &[Record]) -> Vec<Match> {
    let rank = |m: &Match| (!m.exact, m.differences.len(), std::cmp::Reverse(m.revision));
    let mut best: std::collections::BTreeMap<&str, Match> = std::collections::BTreeMap::new();
    for r in records {
        let Some(differences) = compare(q, &r.summary) else {
            continue;
        };
        let m = Match {
            job: r.job.job.clone(),
            revision: r.revision,
            latest_revision: r.revision,
            customer: r.job.customer.clone(),
            date: r.job.date.clone(),
            exact: differences.is_empty(),
            differences,
            summary: r.summary.clone(),
        };
        match best.get(r.job.job.as_str()) {
            Some(b) if rank(b) <= rank(&m) => {}
            _ => {
                best.insert(&r.job.job, m);
            }
        }
    }
    let mut found: Vec<Match> = best.into_values().collect();
    found.sort_by(|a, b| {
        (!a.exact, a.differences.len(), &a.job).cmp(&(!b.exact, b.differences.len(), &b.job))
    });
    found
}

/// A throw as typed: the shop form "1-29" or the end bar alone, "29".
pub fn parse_throw(s: &str) -> Result<u32, String> {
    let t = s.trim();
    let end = match t.split_once('-') {
        Some((a, b)) if a.trim() == "1" => b.trim(),
        Some(_) => {
            return Err(format!(
                "expected a throw like \"1-29\", found \"{}\"",
                clip(t)
            ));
        }
        None => t,
    };
    end.parse::<u32>()
        .ok()
        .filter(|&n| n >= 1)
        .ok_or_else(|| format!("expected a throw like \"1-29\", found \"{}\"", clip(t)))
}

/// A span as typed: the shop form "1-8" or the slots, "7".
pub fn parse_span(s: &str) -> Result<u32, String> {
    let t = s.trim();
    let bad = || format!("expected a span like \"1-8\", found \"{}\"", clip(t));
    match t.split_once('-') {
        Some((a, b)) if a.trim() == "1" => b
            .trim()
            .parse::<u32>()
            .ok()
            .filter(|&n| n >= 2)
            .map(|n| n - 1)
            .ok_or_else(bad),
        Some(_) => Err(bad()),
        None => t.parse::<u32>().ok().filter(|&n| n >= 1).ok_or_else(bad),
    }
}

fn clip(s: &str) -> String {
    crate::base::visible::visible(&crate::base::visible::clip(s, 24)).into_owned()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn throws_and_spans_read_in_shop_form() {
        assert_eq!(parse_throw("1-29"), Ok(29));
        assert_eq!(parse_throw("29"), Ok(29));
        assert!(parse_throw("2-29").is_err());
        assert_eq!(parse_span("1-8"), Ok(7));
        assert_eq!(parse_span("7"), Ok(7));
        assert!(parse_span("1-1").is_err());
    }
}
