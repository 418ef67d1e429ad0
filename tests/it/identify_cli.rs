//! `armsheet identify` from the command line: the worked examples of the published sources,
//! the broken cards in tests/broken_cards/ (each `NAME.toml` must exit 2, print nothing on
//! stdout, write nothing and print exactly `NAME.stderr`; ARMSHEET_BLESS=1 rewrites them), the
//! no-overwrite rule, `--pick`, `--json` and `new --card`.

use crate::support;

use std::path::Path;

use crate::support::{armsheet, armsheet_in, scratch, text};

fn card(dir: &Path, name: &str, observed: &str) -> String {
    let path = dir.join(name);
    std::fs::write(
        &path,
        format!("[job]\nid = \"T-1\"\n\n[observed]\n{observed}"),
    )
    .unwrap();
    path.display().to_string()
}

fn json(args: &[&str]) -> serde_json::Value {
    let out = armsheet(args);
    serde_json::from_slice(&out.stdout).unwrap_or_else(|e| panic!("{e}: {}", text(&out.stdout)))
}

/// Published worked example, from memory: 4 poles, 25 coils, simplex wave, y_c = 13 (a
/// textbook wave-winding example reproduced in several tutorials; docs/domain.md,
/// "Published worked examples"). The throw
/// 1-14 on 25 bars is therefore progressive simplex wave: p·y_c = 2·13 = 26 = C + 1.
#[test]
fn a_throw_of_1_14_on_4_poles_and_25_bars_is_progressive_simplex_wave() {
    let dir = scratch("wave25");
    let c = card(
        &dir,
        "c.toml",
        "poles = 4\nslots = 25\nbars = 25\ncoil_span = \"1-7\"\nlead_throw = \"1-14\"\nlead_swing = -3.5\nturns = 2\n",
    );
    let v = json(&["identify", &c, "--json"]);
    let list = v["candidates"].as_array().unwrap();
    assert_eq!(list.len(), 1, "{v}");
    let k = &list[0];
    assert_eq!(k["type"], "wave");
    assert_eq!(k["multiplicity"], 1);
    assert_eq!(k["direction"], "progressive");
    assert_eq!(k["commutator_pitch"], 13);
    assert_eq!(k["segments"], 25);
    assert_eq!(k["coils_per_slot"], 1);
    assert_eq!(k["dummy_coils"], 0);
    assert_eq!(k["span"], 6);
    assert!(k["explanation"].as_str().unwrap().contains("C + 1"));
}

/// 26 slots on 4 poles cannot take a simplex wave on 26 bars ((26 ± 1)/2 is not whole), so a
/// wave leaves one dummy coil on 25 bars [src: textbook treatment of dummy coils, e.g. Theraja,
/// *Electrical Technology* vol. 2 ch. 26, from memory; docs/domain.md, "Dummy coils"].
#[test]
fn twenty_six_slots_on_4_poles_is_a_wave_with_one_dummy() {
    let dir = scratch("dummy26");
    let c = card(
        &dir,
        "c.toml",
        "poles = 4\nslots = 26\nbars = 25\ncoil_span = \"1-7\"\nlead_throw = \"1-14\"\nlead_swing = -4\nturns = 2\n",
    );
    let v = json(&["identify", &c, "--json"]);
    let list = v["candidates"].as_array().unwrap();
    assert_eq!(list.len(), 1, "{v}");
    assert_eq!(list[0]["type"], "wave");
    assert_eq!(list[0]["dummy_coils"], 1);
    assert_eq!(list[0]["dummy_positions"], serde_json::json!([26]));
    // With the dead coil found elsewhere, the design places it there.
    let c2 = card(
        &dir,
        "c2.toml",
        "poles = 4\nslots = 26\nbars = 25\ncoil_span = \"1-7\"\nlead_throw = \"1-14\"\nlead_swing = -4\nturns = 2\ndead_coils = [13]\n",
    );
    let v = json(&["identify", &c2, "--json"]);
    assert_eq!(
        v["candidates"][0]["dummy_positions"],
        serde_json::json!([13]),
        "{v}"
    );
    let out = dir.join("d.toml");
    let o = armsheet(&["identify", &c2, "-o", out.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    let file = std::fs::read_to_string(&out).unwrap();
    assert!(file.contains("dummy_coils = [13]"), "{file}");
    assert!(file.contains("segments = 25"), "{file}");
}

/// Published worked example, from memory: 6 poles, 36 slots, simplex wave: C = 35 (one
/// dummy), y_c = 12 (a textbook dummy-coil example; docs/domain.md, "Published worked examples").
/// The throw is 1-13.
#[test]
fn six_poles_36_slots_on_35_bars_is_simplex_wave_with_one_dummy() {
    let dir = scratch("wave36");
    let c = card(
        &dir,
        "c.toml",
        "poles = 6\nslots = 36\nbars = 35\ncoil_span = \"1-7\"\nlead_throw = \"1-13\"\nlead_swing = -3.5\nturns = 2\ncoils_per_slot = 1\n",
    );
    let v = json(&["identify", &c, "--json"]);
    let list = v["candidates"].as_array().unwrap();
    assert_eq!(list.len(), 1, "{v}");
    // 3·12 = 36 = C + 1: progressive in this project's sign (+ lands one bar ahead).
    assert_eq!(list[0]["direction"], "progressive");
    assert_eq!(list[0]["commutator_pitch"], 12);
    assert_eq!(list[0]["dummy_coils"], 1);
}

#[test]
fn a_throw_that_fits_no_bar_count_names_the_nearest_readings() {
    let dir = scratch("conflict");
    let c = card(
        &dir,
        "c.toml",
        "poles = 4\nslots = 26\nbars = 26\ncoil_span = \"1-7\"\nlead_throw = \"1-14\"\nlead_swing = 0\nturns = 2\n",
    );
    let out = dir.join("d.toml");
    let o = armsheet(&["identify", &c, "-o", out.to_str().unwrap()]);
    let said = text(&o.stdout);
    assert_eq!(o.status.code(), Some(1), "{said}");
    assert!(
        said.contains(
            "a throw of 1-14 on 4 poles needs 25 or 27 bars (simplex wave); you counted 26"
        ),
        "{said}"
    );
    assert!(said.contains("(common practice)"), "{said}");
    assert!(!out.exists());
}

#[test]
fn the_written_design_is_checked_and_sheeted_as_is_and_never_overwritten() {
    let dir = scratch("write");
    let c = card(
        &dir,
        "c.toml",
        "poles = 4\nslots = 24\nbars = 48\ncoils_per_slot = 2\ncoil_span = \"1-7\"\nlead_throw = \"1-2\"\nlead_swing = 1.5\nturns = 2\nawg = 16\nstrands = 2\nequalizer_taps = [[1, 25], [5, 29]]\n",
    );
    let o = armsheet_in(&["identify", &c, "-o", "d.toml"], &dir);
    assert_eq!(
        o.status.code(),
        Some(0),
        "{}{}",
        text(&o.stdout),
        text(&o.stderr)
    );
    let file = std::fs::read_to_string(dir.join("d.toml")).unwrap();
    assert!(file.starts_with("# Identified by armsheet"), "{file}");
    assert!(file.contains("#   poles 4, slots 24, bars 48"), "{file}");
    assert!(file.contains("equalizers = 4"), "{file}");
    let chk = armsheet_in(&["check", "d.toml", "--json"], &dir);
    let v: serde_json::Value = serde_json::from_slice(&chk.stdout).unwrap();
    assert_eq!(v["lead_swing"]["swing_bars"], 1.5, "{v}");
    assert_eq!(v["parallel_paths"], 4);
    let sheet = armsheet_in(&["sheet", "d.toml", "-o", "sheets"], &dir);
    assert_eq!(sheet.status.code(), Some(0), "{}", text(&sheet.stderr));
    // Again: refused, the file kept; with --force, replaced.
    std::fs::write(dir.join("d.toml"), "keep").unwrap();
    let again = armsheet_in(&["identify", &c, "-o", "d.toml"], &dir);
    assert_eq!(again.status.code(), Some(2));
    assert!(text(&again.stderr).contains("does not overwrite"));
    assert_eq!(std::fs::read_to_string(dir.join("d.toml")).unwrap(), "keep");
    let forced = armsheet_in(&["identify", &c, "-o", "d.toml", "--force"], &dir);
    assert_eq!(forced.status.code(), Some(0));
    assert_eq!(std::fs::read_to_string(dir.join("d.toml")).unwrap(), file);
}

#[test]
fn a_pick_beyond_the_candidates_is_refused() {
    let dir = scratch("pick");
    let c = card(
        &dir,
        "c.toml",
        "poles = 4\nslots = 25\nbars = 25\ncoil_span = \"1-7\"\nlead_throw = \"1-14\"\nlead_swing = -3.5\nturns = 2\n",
    );
    let o = armsheet_in(&["identify", &c, "--pick", "2", "-o", "d.toml"], &dir);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        text(&o.stderr).contains("--pick 2: there is 1 candidate;"),
        "{}",
        text(&o.stderr)
    );
    assert!(!dir.join("d.toml").exists());
    let o = armsheet_in(&["identify", &c, "--pick", "1", "-o", "d.toml"], &dir);
    assert_eq!(o.status.code(), Some(0));
    assert!(text(&o.stdout).contains("picked candidate 1"));
}

#[test]
fn new_card_writes_a_starter_card_that_identifies() {
    let dir = scratch("starter");
    let o = armsheet_in(&["new", "--card"], &dir);
    assert_eq!(o.status.code(), Some(0));
    assert_eq!(text(&o.stdout), "wrote card.toml\n");
    let o = armsheet_in(&["identify", "card.toml"], &dir);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    assert!(text(&o.stdout).contains("one winding fits: progressive simplex wave"));
    let again = armsheet_in(&["new", "--card"], &dir);
    assert_eq!(again.status.code(), Some(2));
}

#[test]
fn every_broken_card_gets_its_expected_message() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/broken_cards");
    let bless = std::env::var_os("ARMSHEET_BLESS").is_some();
    let mut names: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    names.sort();
    assert!(names.len() >= 6, "the corpus has {} files", names.len());
    let out_dir = scratch("broken");
    let out = out_dir.join("never.toml");
    let mut failures = Vec::new();
    for path in names {
        let rel = format!(
            "tests/broken_cards/{}",
            path.file_name().unwrap().to_string_lossy()
        );
        let o = armsheet(&["identify", &rel, "-o", out.to_str().unwrap()]);
        let stderr = text(&o.stderr);
        let expected_path = path.with_extension("stderr");
        if bless {
            std::fs::write(&expected_path, &stderr).unwrap();
        }
        let expected = std::fs::read_to_string(&expected_path).unwrap_or_default();
        if o.status.code() != Some(2) {
            failures.push(format!("{rel}: exit {:?}, expected 2", o.status.code()));
        }
        if !o.stdout.is_empty() {
            failures.push(format!("{rel}: wrote to stdout"));
        }
        if out.exists() {
            failures.push(format!("{rel}: wrote a design"));
        }
        if stderr != expected {
            failures.push(format!(
                "{rel}: stderr differs\n--- expected\n{expected}--- got\n{stderr}"
            ));
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

/// The demo card yields the demo design, byte for byte, and that design checks as is.
#[test]
fn the_demo_card_yields_the_demo_design() {
    let dir = scratch("demo");
    let out = dir.join("d.toml");
    let o = armsheet(&[
        "identify",
        "designs/cards/sawmill-card.toml",
        "-o",
        out.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    assert_eq!(
        std::fs::read_to_string(&out).unwrap(),
        support::demo("sawmill-identified")
    );
    let chk = armsheet(&["check", "designs/sawmill-identified.toml", "--json"]);
    assert_eq!(chk.status.code(), Some(0));
    let v: serde_json::Value = serde_json::from_slice(&chk.stdout).unwrap();
    assert_eq!(v["lead_swing"]["swing_bars"], -6.5);
    assert_eq!(v["dummy_positions"], serde_json::json!([30]));
}

#[test]
fn a_card_that_cannot_be_read_says_so() {
    let o = armsheet(&["identify", "designs/cards/no-such-card.toml"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        text(&o.stderr).starts_with("error: cannot read data card designs/cards/no-such-card.toml"),
        "{}",
        text(&o.stderr)
    );
}

/// A rewind that changes the segment count drops the named dummy positions, and says so.
#[test]
fn a_rewind_to_lap_drops_the_named_dummies() {
    let dir = scratch("rewind");
    let mut design = support::demo("sawmill-identified");
    design.push_str("\n[rating]\nvoltage = 220\ncurrent = 10\nspeed_rpm = 1500\n");
    std::fs::write(dir.join("s.toml"), design).unwrap();
    let o = armsheet_in(
        &[
            "rewind",
            "s.toml",
            "--voltage",
            "110",
            "--type",
            "lap",
            "-o",
            "r.toml",
        ],
        &dir,
    );
    // A lap on the sawmill's odd bar count fails the symmetry rule: check refuses it, so the
    // rewind says so, writes nothing and exits 1; its notes are still printed.
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
    assert!(text(&o.stdout).contains("check refuses the new design"));
    assert!(!dir.join("r.toml").exists());
    assert!(
        text(&o.stdout).contains("dummy coils: the positions the old design names are dropped")
    );
}

/// One verdict: an unsymmetrical lap recorded from the armature (4 poles, 27 slots and bars)
/// is identified, but `check` refuses it, so identify says so, writes no design file even when
/// asked to, and exits 1. `--pick` on a card nothing fits keeps the conflicts and exits 1.
#[test]
fn a_winding_check_refuses_is_named_and_never_written() {
    let dir = scratch("refused");
    let path = card(
        &dir,
        "c27.toml",
        "poles = 4\nslots = 27\nbars = 27\ncoil_span = \"1-7\"\nlead_throw = \"1-2\"\nlead_swing = 3.5\nturns = 3\n",
    );
    let out = dir.join("out.toml");
    let o = armsheet(&["identify", &path, "-o", &out.display().to_string()]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
    let said = text(&o.stdout);
    assert!(
        said.contains("one winding fits: progressive simplex lap"),
        "{said}"
    );
    assert!(
        said.contains("check refuses the identified winding"),
        "{said}"
    );
    assert!(
        said.contains("[error] symmetry.coils-per-path-pair"),
        "{said}"
    );
    assert!(!out.exists());

    let none = card(
        &dir,
        "none.toml",
        "poles = 4\nslots = 27\nbars = 27\ncoil_span = \"1-7\"\nlead_throw = \"1-2\"\nlead_swing = -1\nturns = 3\n",
    );
    let o = armsheet(&["identify", &none, "--pick", "1"]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
    assert!(!text(&o.stderr).contains("pick 1 to 0"));
    assert!(text(&o.stdout).contains("no winding fits these observations"));
}

/// A card without `lead_swing`: symmetric leads are assumed (lead offset 0), the winding is
/// still identified, and the output says to set the brushes by a neutral test.
#[test]
fn a_card_without_a_lead_swing_assumes_symmetric_leads() {
    let dir = scratch("no-swing");
    let path = card(
        &dir,
        "c.toml",
        "poles = 4\nslots = 25\nbars = 25\ncoil_span = \"1-7\"\nlead_throw = \"1-14\"\nturns = 2\n",
    );
    let o = armsheet(&["identify", &path]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    let said = text(&o.stdout);
    assert!(said.contains("lead swing not recorded"), "{said}");
    assert!(said.contains("with lead offset 0"), "{said}");
    assert!(said.contains("set the brushes by a neutral test"), "{said}");
}

/// Runs identify with `-o` on a card in `dir`; returns the exit code, the text and whether a
/// design file was written.
fn identify_to(dir: &Path, name: &str, observed: &str, more: &[&str]) -> (i32, String, bool) {
    let path = card(dir, name, observed);
    let out = dir.join(format!("{name}.out.toml"));
    let out_s = out.display().to_string();
    let mut args = vec!["identify", path.as_str(), "-o", out_s.as_str()];
    args.extend_from_slice(more);
    let o = armsheet(&args);
    let code = o.status.code().unwrap_or(-1);
    (code, text(&o.stdout) + &text(&o.stderr), out.exists())
}

/// A 4-pole, 33-slot, 99-bar simplex wave (u 3, throw 1-51: p·y_c = 2·50 = C + 1) [derived]
/// recorded with the bars counted one short: 98 bars read as a duplex wave with a dummy coil,
/// which `check` refuses (33 slots on 2 pairs of paths is not whole). identify names the
/// refusal, writes nothing, exits 1, and says that 99 bars gives the simplex wave.
#[test]
fn ninety_eight_bars_for_ninety_nine_is_caught_as_a_miscount() {
    let dir = scratch("miscount-bars");
    let card =
        "poles = 4\nslots = 33\nbars = 98\ncoil_span = \"1-9\"\nlead_throw = \"1-51\"\nturns = 3\n";
    let (code, said, wrote) = identify_to(&dir, "c98.toml", card, &[]);
    assert_eq!(code, 1, "{said}");
    assert!(!wrote, "{said}");
    assert!(
        said.contains("one winding fits: progressive duplex wave"),
        "{said}"
    );
    assert!(
        said.contains("check refuses the identified winding"),
        "{said}"
    );
    assert!(
        said.contains("- 99 bars gives a progressive simplex wave with no dummy coil"),
        "{said}"
    );
    // The card as counted right: one simplex wave, written, exit 0, no recount.
    let right = card.replace("bars = 98", "bars = 99");
    let (code, said, wrote) = identify_to(&dir, "c99.toml", &right, &[]);
    assert_eq!((code, wrote), (0, true), "{said}");
    assert!(!said.contains("a reading one off"), "{said}");
}

/// The same armature with the throw read one bar long: "1-52" on 99 bars is a triplex wave
/// (2·51 = C + 3), which `check` passes but no rewinder expects. identify ranks it, says that
/// a throw of 1-51 gives the simplex wave, and holds the file back until `--pick 1` confirms.
#[test]
fn a_throw_one_long_is_held_back_until_confirmed() {
    let dir = scratch("miscount-throw");
    let card =
        "poles = 4\nslots = 33\nbars = 99\ncoil_span = \"1-9\"\nlead_throw = \"1-52\"\nturns = 3\n";
    let (code, said, wrote) = identify_to(&dir, "c.toml", card, &[]);
    assert_eq!((code, wrote), (0, false), "{said}");
    assert!(
        said.contains("one winding fits: progressive triplex wave"),
        "{said}"
    );
    assert!(
        said.contains("- a throw of 1-51 gives a progressive simplex wave with no dummy coil"),
        "{said}"
    );
    assert!(
        said.contains("a triplex winding is rare in repair work"),
        "{said}"
    );
    assert!(
        said.contains("confirm the triplex wave with --pick 1"),
        "{said}"
    );
    let (code, said, wrote) = identify_to(&dir, "c.toml", card, &["--pick", "1"]);
    assert_eq!((code, wrote), (0, true), "{said}");
    let v = json(&[
        "identify",
        &dir.join("c.toml").display().to_string(),
        "--json",
    ]);
    assert_eq!(v["doubtful"], true, "{v}");
    assert_eq!(
        v["recount"]["readings"][0],
        "a throw of 1-51 gives a progressive simplex wave with no dummy coil"
    );
}

/// "1-16 on 25 bars" on 4 poles is a 5-plex wave (2·15 = C + 5) that `check` refuses; no
/// reading one off gives a simplex winding, so identify names the simplex throws on 25 bars
/// (1-13 or 1-14 for the wave [derived: (25 ± 1)/2 + 1]).
#[test]
fn a_five_plex_reading_names_the_simplex_throws() {
    let dir = scratch("five-plex");
    let (code, said, wrote) = identify_to(
        &dir,
        "c.toml",
        "poles = 4\nslots = 25\nbars = 25\ncoil_span = \"1-7\"\nlead_throw = \"1-16\"\nturns = 3\n",
        &[],
    );
    assert_eq!((code, wrote), (1, false), "{said}");
    assert!(said.contains("5-plex wave"), "{said}");
    assert!(said.contains("a simplex wave 1-14 or 1-13"), "{said}");
    assert!(
        said.contains("check refuses the identified winding"),
        "{said}"
    );
}

/// A dead coil recorded on a lap card (24 slots, 24 bars, throw 1-2) is a conflict: a lap uses
/// every coil [textbook: dummy coils belong to wave windings; docs/domain.md, "Dummy coils"].
#[test]
fn a_dead_coil_on_a_lap_card_is_named() {
    let dir = scratch("lap-dead");
    let (code, said, wrote) = identify_to(
        &dir,
        "c.toml",
        "poles = 4\nslots = 24\nbars = 24\ncoil_span = \"1-7\"\nlead_throw = \"1-2\"\nturns = 3\ndead_coils = [3]\n",
        &[],
    );
    assert_eq!((code, wrote), (1, false), "{said}");
    assert!(said.contains("uses every coil, so none is dead"), "{said}");
    assert!(
        said.contains("dead coils are listed in slot(s) 3"),
        "{said}"
    );
}

/// A dead-coil count that conflicts is blamed on the dead coils, not on the bars and throw,
/// which fit (33 slots of 3 coils on 99 bars leave no dummy, yet one dead coil is listed).
#[test]
fn a_dead_coil_count_that_conflicts_is_blamed_on_the_dead_coils() {
    let dir = scratch("dead-count");
    let (code, said, _) = identify_to(
        &dir,
        "c.toml",
        "poles = 4\nslots = 33\nbars = 99\ncoil_span = \"1-9\"\nlead_throw = \"1-51\"\nturns = 3\ndead_coils = [3]\n",
        &[],
    );
    assert_eq!(code, 1, "{said}");
    assert!(
        said.contains("leaves 0 dummy coils, but 1 dead coil is listed"),
        "{said}"
    );
    assert!(
        !said.contains("count the bars and the throw again"),
        "{said}"
    );
}

/// An impossible span is blamed on the span: "1-19" on 36 slots and 4 poles is two pole
/// pitches (0 electrical degrees), so the sides lie under poles of the same polarity
/// [derived; docs/domain.md, "Coil span limits"]. On 24 slots "1-19" is three pole pitches,
/// possible but far off, and the swing conflict it makes names the span first.
#[test]
fn an_impossible_span_is_blamed_on_the_span() {
    let dir = scratch("span-19");
    let (code, said, _) = identify_to(
        &dir,
        "c36.toml",
        "poles = 4\nslots = 36\nbars = 36\ncoil_span = \"1-19\"\nlead_throw = \"1-2\"\nlead_swing = 3\nturns = 3\n",
        &[],
    );
    assert_eq!(code, 1, "{said}");
    assert!(
        said.contains("the coil span 1-19 is 18 slots, 2.00 pole pitches"),
        "{said}"
    );
    assert!(!said.contains("lead swing of +3 bars is"), "{said}");
    let (code, said, _) = identify_to(
        &dir,
        "c24.toml",
        "poles = 4\nslots = 24\nbars = 24\ncoil_span = \"1-19\"\nlead_throw = \"1-2\"\nlead_swing = 3\nturns = 3\n",
        &[],
    );
    assert_eq!(code, 1, "{said}");
    assert!(
        said.contains("the coil span 1-19 is 12.00 slots longer than the pole pitch"),
        "{said}"
    );
}
