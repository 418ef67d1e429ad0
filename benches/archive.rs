//! `archive find` over an archive of 100,000 jobs (divan). The archive is generated here, in
//! the system's temporary folder, never kept in the repository: 100,000 jobs of the hoist
//! demo's design text on frames spread over 2 to 24 poles, 12 to 300 slots and bars one to
//! three times the slots, so a search's frame holds a handful of jobs among the many.
//!
//! `find_whole_process` runs the built binary (`armsheet archive find --card … --json`), the
//! time a shop waits; `find_in_process` opens the archive and searches it without starting a
//! process. Target: under 50 ms for the whole process.
//!
//! `find_whole_process_postgres` does the same on a PostgreSQL archive of the same 100,000
//! jobs, in a database `armsheet_bench` made afresh on the server `ARMSHEET_TEST_POSTGRES`
//! names (`source .ci/postgres.sh` starts one); without it, that bench says so and measures
//! nothing.
//!
//! Run: `cargo bench --bench archive`.

use std::path::{Path, PathBuf};
use std::process::Command;
use std::sync::OnceLock;

use armsheet::cli::archive::store::{Create, Location, Store};
use armsheet::design::parse_design;
use armsheet::features::archive::{Query, Record, job_fields, matches, summary};

fn main() {
    divan::main();
}

/// Jobs in the generated archive.
const JOBS: u32 = 100_000;

/// The generated SQLite archive (made once per bench run, removed with its folder at exit).
fn archive() -> &'static Path {
    static DB: OnceLock<(tempfile::TempDir, PathBuf)> = OnceLock::new();
    &DB.get_or_init(|| {
        let dir = tempfile::tempdir().unwrap();
        let db = dir.path().join("bench.sqlite");
        fill(&Location::File(db.clone()));
        (dir, db)
    })
    .1
}

/// The generated PostgreSQL archive, when `ARMSHEET_TEST_POSTGRES` names a server (made once
/// per bench run).
fn server() -> Option<&'static str> {
    static URL: OnceLock<Option<String>> = OnceLock::new();
    URL.get_or_init(|| {
        let admin = std::env::var("ARMSHEET_TEST_POSTGRES").ok()?;
        let mut c = postgres::Client::connect(&admin, postgres::NoTls).unwrap();
        c.batch_execute("DROP DATABASE IF EXISTS armsheet_bench WITH (FORCE)")
            .unwrap();
        c.batch_execute("CREATE DATABASE armsheet_bench").unwrap();
        let url = format!("{}/armsheet_bench", admin.rsplit_once('/').unwrap().0);
        fill(&Location::Server(url.clone()));
        Some(url)
    })
    .as_deref()
}

/// Writes the generated jobs into the archive at `at`.
fn fill(at: &Location) {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/designs/hoist-lap.toml"
    ))
    .unwrap();
    let checked = armsheet::check(parse_design(&text, "hoist-lap.toml").unwrap());
    let base = summary(&checked);
    let job = job_fields(&checked.design.job).unwrap();
    let mut store = Store::open(at, Create::Yes).unwrap();
    let mut batch = Vec::with_capacity(10_000);
    for i in 0..JOBS {
        let mut s = base.clone();
        s.poles = 2 * (1 + i % 12);
        s.slots = 12 + (i / 12) % 289;
        s.bars = s.slots * (1 + (i / 3468) % 3);
        batch.push(Record {
            job: armsheet::features::archive::JobFields {
                job: format!("GEN-{i:06}"),
                ..job.clone()
            },
            revision: 0,
            design_name: "hoist-lap.toml".into(),
            design: text.clone(),
            card: None,
            readings: None,
            verdict: None,
            signed_by: vec!["Bench".into()],
            sheets: Vec::new(),
            summary: s,
        });
        if batch.len() == 10_000 {
            store.add(&batch).unwrap();
            batch.clear();
        }
    }
    store.add(&batch).unwrap();
}

/// `armsheet archive find --card … --json --archive at`, the whole process.
fn find_process(bencher: divan::Bencher, at: &std::ffi::OsStr) {
    let card = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/designs/cards/sawmill-card.toml"
    );
    bencher.bench(|| {
        let o = Command::new(env!("CARGO_BIN_EXE_armsheet"))
            .args(["archive", "find", "--card", card, "--json", "--archive"])
            .arg(at)
            .output()
            .unwrap();
        assert!(o.status.success());
        o
    });
}

#[divan::bench(sample_count = 20)]
fn find_whole_process(bencher: divan::Bencher) {
    find_process(bencher, archive().as_os_str());
}

#[divan::bench(sample_count = 20)]
fn find_whole_process_postgres(bencher: divan::Bencher) {
    match server() {
        Some(url) => find_process(bencher, url.as_ref()),
        None => eprintln!("find_whole_process_postgres: ARMSHEET_TEST_POSTGRES is not set"),
    }
}

#[divan::bench(sample_count = 20)]
fn find_in_process(bencher: divan::Bencher) {
    let db = archive();
    let q = Query {
        poles: 4,
        slots: 29,
        bars: 57,
        throw_end: Some(29),
        ..Query::default()
    };
    bencher.bench(|| {
        let mut store = Store::open(&Location::File(db.to_path_buf()), Create::No).unwrap();
        matches(&q, &store.candidates(&q).unwrap())
    });
}
