//! The report renderers only format: they take the computed `Checked` (or parts of it) and
//! never call the engine, the rating or the checks, nor read the environment. A tidy test in
//! the manner of an architecture invariant: a rule kept in a test holds.

const RENDERERS: [&str; 6] = [
    "text.rs",
    "rating_text.rs",
    "json.rs",
    "rating_json.rs",
    "csv.rs",
    "rating_words.rs",
];

/// Calls that compute or reach outside: the engine, the rating, the checks, the environment.
const FORBIDDEN: [&str; 10] = [
    "trace_winding(",
    "rate(",
    "rate_with(",
    "run_checks(",
    "findings_of(",
    "check(",
    "is_symmetric(",
    "connect(",
    "env!(",
    "std::env",
];

#[test]
fn report_renderers_never_compute() {
    for file in RENDERERS {
        let path = format!("{}/src/render/{file}", env!("CARGO_MANIFEST_DIR"));
        let text = std::fs::read_to_string(&path).unwrap();
        // Unit tests may build their input through the pipeline.
        let code = text.split("#[cfg(test)]").next().unwrap_or_default();
        for (n, line) in code.lines().enumerate() {
            let line = line.split("//").next().unwrap_or_default();
            for bad in FORBIDDEN {
                let hit = line.match_indices(bad).any(|(i, _)| {
                    // `check(` only as a call of its own, not as the end of another name.
                    !line[..i].ends_with(|c: char| c.is_alphanumeric() || c == '_')
                });
                assert!(!hit, "src/render/{file}:{}: calls `{bad}`: {line}", n + 1);
            }
        }
    }
}
