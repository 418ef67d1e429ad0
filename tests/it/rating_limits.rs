//! Every `[limits]` key can be overridden, and the override changes the verdict; a failed
//! limit comes with advice that has numbers in it.

use armsheet::design::{LIMIT_KEYS, LIMITS, parse_design};
use armsheet::rating::{Advice, Bound, RatingReport, rate, rules};
use armsheet::winding::trace_winding;

const BASE: &str = r#"
[armature]
poles = 4
slots = 36

[winding]
type = "lap"
span = 8
turns = 4

[rating]
voltage = 110
current = 85
speed_rpm = 1150
thermal_class = "F"

[conductor]
diameter_mm = 1.6
strands = 2
mean_turn_mm = 650

[core]
diameter_mm = 190
length_mm = 160
slot_depth_mm = 14
slot_width_mm = 5.5

[commutator]
diameter_mm = 150
brush_width_mm = 20
"#;

fn rated(toml: &str) -> RatingReport {
    let d = parse_design(toml, "t.toml").unwrap_or_else(|e| panic!("{e}"));
    let w = trace_winding(&d);
    rate(&d, &w).unwrap()
}

#[test]
fn every_limit_key_has_a_rule_and_every_rule_runs_on_the_base() {
    for (i, spec) in LIMITS.iter().enumerate() {
        assert_eq!(spec.limit as usize, i, "{} out of order", spec.key);
        assert!(spec.id.starts_with("rating."), "{}", spec.id);
        assert!(spec.default > 0.0, "{}", spec.key);
        for other in &LIMITS[i + 1..] {
            assert!(
                spec.key != other.key && spec.id != other.id,
                "{} twice",
                spec.key
            );
        }
    }
    let base = rated(BASE);
    // One check per [limits] key, in the table's order.
    let ids: Vec<&str> = base.checks.iter().map(|c| c.rule.id).collect();
    let spec_ids: Vec<&str> = LIMITS.iter().map(|s| s.id).collect();
    assert_eq!(ids, spec_ids);
    for c in &base.checks {
        assert!(c.passed, "{}", c.message());
        assert!(!c.overridden);
        assert!(c.message().contains("default limit"), "{}", c.message());
    }
}

#[test]
fn each_override_flips_its_own_verdict_only() {
    let base = rated(BASE);
    for rule in rules::ALL {
        let value = base.check(rule.id).unwrap().value;
        let limit = match rule.bound {
            Bound::AtMost => value * 0.9,
            Bound::AtLeast => value * 1.1,
        };
        let text = format!("{BASE}\n[limits]\n{} = {limit}\n", rule.key);
        let r = rated(&text);
        let c = r.check(rule.id).unwrap();
        assert!(
            !c.passed,
            "{}: override {limit} did not fail: {}",
            rule.id,
            c.message()
        );
        assert!(
            c.overridden && c.message().contains("shop limit"),
            "{}",
            c.message()
        );
        assert!((c.limit - limit).abs() < 1e-9);
        assert!(!c.advice.is_empty(), "{} failed without advice", rule.id);
        assert!(
            c.advice
                .iter()
                .any(|a| a.chars().any(|ch| ch.is_ascii_digit())),
            "{:?}",
            c.advice
        );
        for other in r.checks.iter().filter(|o| o.rule.id != rule.id) {
            assert!(other.passed, "{} flipped {} too", rule.key, other.rule.id);
        }
        // And back: a generous limit passes again.
        let generous = match rule.bound {
            Bound::AtMost => value * 1.1,
            Bound::AtLeast => value * 0.9,
        };
        let r = rated(&format!("{BASE}\n[limits]\n{} = {generous}\n", rule.key));
        assert!(r.check(rule.id).unwrap().passed, "{}", rule.id);
    }
}

#[test]
fn a_shop_limit_can_pass_what_the_default_fails() {
    // 36 segments at 230 V: E = 230 - 2.93 - 2 = 225.07 V, E*P/C = 25.0 V, above the default
    // 15 V; C_min = ceil(225.07*4/15) = 61.
    let hot = BASE.replace("voltage = 110", "voltage = 230");
    let r = rated(&hot);
    let c = r.check("rating.segment-volts-average").unwrap();
    assert!(!c.passed);
    assert!(
        c.advice
            .iter()
            .any(|a| a.starts_with("more segments: at least 61")),
        "{:?}",
        c.advice
    );
    assert!(
        matches!(
            r.advice_for("rating.segment-volts-average"),
            Some(Advice::MoreSegments {
                c_min: Some(61),
                now: 36,
                slots: 36,
                ..
            })
        ),
        "{:?}",
        r.advice
    );
    let r = rated(&format!("{hot}\n[limits]\nsegment_volts_avg_max = 30\n"));
    assert!(r.check("rating.segment-volts-average").unwrap().passed);
}

#[test]
fn findings_carry_id_severity_value_limit_units_and_source() {
    let hot = BASE.replace("voltage = 110", "voltage = 230");
    let f = armsheet::check(parse_design(&hot, "t.toml").unwrap()).findings;
    let seg = f
        .iter()
        .find(|f| f.id == "rating.segment-volts-average")
        .expect("merged into the checks");
    assert!(!seg.passed);
    assert_eq!(seg.severity, armsheet::base::Severity::Error);
    assert!(
        seg.message.contains(" V: above the limit of at most 15 V"),
        "{}",
        seg.message
    );
    assert!(seg.source.contains("[common practice]"));
    let all_rating: Vec<_> = f.iter().filter(|f| f.id.starts_with("rating.")).collect();
    assert_eq!(all_rating.len(), LIMITS.len());
    for x in all_rating {
        assert!(
            x.source.contains("common practice")
                || x.source.contains("standard")
                || x.source.contains("from memory"),
            "{}: {}",
            x.id,
            x.source
        );
    }
}

#[test]
fn advice_for_too_much_current_per_path_gives_lap_and_multiplicity_options() {
    // A 4-pole simplex wave (a = 2) carrying 600 A: 300 A per path.
    let r = rated(
        "[armature]\npoles = 4\nslots = 29\ncoils_per_slot = 3\nsegments = 87\n[winding]\ntype = \"wave\"\n\
         span = 7\nturns = 2\n[rating]\nvoltage = 230\ncurrent = 600\n[conductor]\ndiameter_mm = 2\n",
    );
    let c = r.check("rating.path-current").unwrap();
    assert!(!c.passed);
    let text = c.advice.join("\n");
    // Lap instead of wave: a = 4, 150 A per path, turns ×2 for the same EMF (87 coils → 87 bars).
    assert!(
        text.contains(
            "lap instead of wave, simplex lap (a = 4, C = 87): 150.0 A per path, 4 turns"
        ),
        "{text}"
    );
    // Duplex wave: a = 4 as well.
    assert!(
        text.contains("a higher multiplicity, duplex wave (a = 4"),
        "{text}"
    );
}

#[test]
fn advice_for_too_high_density_names_standard_sizes() {
    let r = rated(&BASE.replace("current = 85", "current = 140"));
    let c = r.check("rating.current-density-max").unwrap();
    assert!(!c.passed);
    // Need 35 A / 7 A/mm² = 5 mm²: 1 × AWG 9 (2.906 mm, 6.63 mm²) … and metric 2 × 1.8 mm (5.09 mm²).
    let text = c.advice.join("\n");
    assert!(text.contains("at least 5.000 mm2"), "{text}");
    assert!(text.contains("2 x 1.800 mm (5.089 mm2)"), "{text}");
}

#[test]
fn a_misspelt_limit_key_is_refused_with_the_nearest_key_or_the_list() {
    let e = parse_design(
        &format!("{BASE}\n[limits]\nsegment_volts_avg = 20\n"),
        "t.toml",
    )
    .unwrap_err();
    let e = e.first();
    assert_eq!(e.key, "limits.segment_volts_avg");
    assert_eq!(
        e.hint.as_deref(),
        Some("did you mean `segment_volts_avg_max`?")
    );
    let e = parse_design(&format!("{BASE}\n[limits]\nvoltage = 20\n"), "t.toml").unwrap_err();
    let e = e.first();
    assert_eq!(
        e.hint,
        Some(format!("known keys in [limits]: {}", LIMIT_KEYS.join(", ")))
    );
    // Each key sets its own limit and no other.
    for spec in &LIMITS {
        let value = spec.default * 7.5;
        let d = parse_design(
            &format!("{BASE}\n[limits]\n{} = {value}\n", spec.key),
            "t.toml",
        )
        .unwrap();
        for other in &LIMITS {
            let want = if other.key == spec.key {
                value
            } else {
                other.default
            };
            assert_eq!(
                d.limits.get(other.limit),
                want,
                "{} set {}",
                spec.key,
                other.key
            );
        }
    }
}

/// The number written after `prefix` in `text` (up to `)` or a space; thousands commas dropped).
fn number_after(text: &str, prefix: &str) -> Option<f64> {
    let rest = &text[text.find(prefix)? + prefix.len()..];
    let word: String = rest
        .chars()
        .take_while(|c| c.is_ascii_digit() || *c == '.' || *c == ',')
        .filter(|c| *c != ',')
        .collect();
    word.parse().ok()
}

#[test]
fn the_readme_and_the_starter_name_every_limit_key_with_its_default() {
    let readme = include_str!("../../README.md");
    let row = readme
        .lines()
        .find(|l| l.starts_with("| `[limits]` |"))
        .expect("the README's [limits] row");
    for spec in &LIMITS {
        assert_eq!(
            number_after(row, &format!("`{}` (", spec.key)),
            Some(spec.default),
            "README [limits] row: `{}` with its default {}",
            spec.key,
            spec.default
        );
        assert_eq!(
            number_after(armsheet::cli::STARTER, &format!("\n# {} = ", spec.key)),
            Some(spec.default),
            "starter.toml: `# {} = {}`",
            spec.key,
            spec.default
        );
    }
    // And neither names a limit the table does not hold.
    let known = |k: &str| LIMITS.iter().any(|s| s.key == k);
    let after_header = armsheet::cli::STARTER
        .split("# [limits]")
        .nth(1)
        .expect("a [limits] block");
    for line in after_header.lines().skip(1) {
        let key = line.trim_start_matches("# ").split(" =").next().unwrap();
        assert!(known(key), "starter.toml names an unknown limit `{key}`");
    }
    let in_row = row.matches("` (").count();
    assert_eq!(in_row, LIMITS.len(), "README [limits] row: {row}");
}
