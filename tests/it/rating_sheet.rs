//! The rating rows reach the winding sheet's data block.

use std::process::Command;

#[test]
fn pump_sheet_carries_the_rating_rows() {
    let dir = std::env::temp_dir().join(format!("armsheet-rating-sheet-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    let o = Command::new(env!("CARGO_BIN_EXE_armsheet"))
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .args([
            "sheet",
            "designs/pump-wave.toml",
            "-o",
            &dir.display().to_string(),
        ])
        .output()
        .unwrap();
    assert_eq!(
        o.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    // The rating rows are on the winding-data sheet, the last of the set.
    let last = (1..)
        .take_while(|n| dir.join(format!("pump-wave/sheet-{n}.svg")).is_file())
        .last()
        .unwrap();
    let svg = std::fs::read_to_string(dir.join(format!("pump-wave/sheet-{last}.svg"))).unwrap();
    for text in [
        ">R_a at 95 C<",
        // 0.1643 ohm at a 560 mm mean turn before the demo went to inches: 22 in (558.8 mm) gives
        // 0.1643 x 558.8/560 = 0.1640 [derived].
        ">0.1640 ohm<",
        ">test 1 min, new<",
        ">1500 V (IEC 60034-1)<",
        ">all within limits<",
    ] {
        assert!(svg.contains(text), "missing {text}");
    }
    let _ = std::fs::remove_dir_all(&dir);
}
