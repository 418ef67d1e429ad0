//! The archive's storage layer: one schema, one list of versioned migrations as SQL text, and
//! the few operations the commands need ([`Store`]), over a backend.
//!
//! The backend today is SQLite (through `rusqlite`, the library built in), opened in WAL mode
//! with a busy timeout. The schema keeps to SQL both SQLite and PostgreSQL take (`TEXT`,
//! `INTEGER`, a composite primary key, `ALTER TABLE … ADD COLUMN`, plain indexes), so a
//! PostgreSQL backend is a second variant of [`Store`] running the same [`MIGRATIONS`] and the
//! same statements (with `$n` placeholders); what is backend-specific (opening, the lock wait,
//! asking whether a table exists, the backup) is in the methods below, one arm per backend.
//!
//! Every statement is parameterised: no text from a design, a card or an option is spliced
//! into SQL. Part of the `cli` stage: the only stage that touches a file or a database.

use std::path::{Path, PathBuf};
use std::time::Duration;

use rusqlite::{Connection, ErrorCode, OpenFlags, OptionalExtension, TransactionBehavior, params};

use crate::features::archive::{JobFields, Query, Record, Summary};

/// How long a command waits for another one's lock before it gives up (exit 2).
pub const BUSY_WAIT: Duration = Duration::from_secs(5);

/// The migrations, in order: version n is `MIGRATIONS[n - 1]`. An archive records each
/// version applied in `archive_version`; one newer than [`LATEST`] is refused.
pub const MIGRATIONS: &[&str] = &[
    // 1: the jobs, one row a revision, with the checked summary's search fields.
    "CREATE TABLE archive_version (
        version INTEGER NOT NULL PRIMARY KEY,
        written_by TEXT NOT NULL
    );
    CREATE TABLE jobs (
        job TEXT NOT NULL,
        revision INTEGER NOT NULL,
        customer TEXT,
        title TEXT,
        job_date TEXT,
        design_name TEXT NOT NULL,
        design TEXT NOT NULL,
        card TEXT,
        readings TEXT,
        verdict TEXT,
        poles INTEGER NOT NULL,
        slots INTEGER NOT NULL,
        bars INTEGER NOT NULL,
        kind TEXT NOT NULL,
        multiplicity INTEGER NOT NULL,
        direction TEXT NOT NULL,
        coils_per_slot INTEGER NOT NULL,
        span INTEGER NOT NULL,
        span_shop TEXT NOT NULL,
        throw_end INTEGER NOT NULL,
        throw_shop TEXT NOT NULL,
        turns INTEGER NOT NULL,
        wire TEXT,
        strands INTEGER,
        lead_swing_half_bars INTEGER NOT NULL,
        lead_swing TEXT NOT NULL,
        brush_sets INTEGER NOT NULL,
        equalizers INTEGER NOT NULL,
        dummies INTEGER NOT NULL,
        rating TEXT,
        PRIMARY KEY (job, revision)
    );",
    // 2: the sign-off names and the sheet set's file hashes (JSON lists), and the search
    // index on the frame.
    "ALTER TABLE jobs ADD COLUMN signed_by TEXT NOT NULL DEFAULT '[]';
    ALTER TABLE jobs ADD COLUMN sheets TEXT NOT NULL DEFAULT '[]';
    CREATE INDEX jobs_frame ON jobs (poles, slots, bars);",
];

/// The archive version this armsheet writes.
pub const LATEST: u32 = MIGRATIONS.len() as u32;

/// The columns of `jobs`, in the order [`Store`] binds and reads them.
const COLUMNS: &str = "job, revision, customer, title, job_date, design_name, design, card, \
    readings, verdict, poles, slots, bars, kind, multiplicity, direction, coils_per_slot, span, \
    span_shop, throw_end, throw_shop, turns, wire, strands, lead_swing_half_bars, lead_swing, \
    brush_sets, equalizers, dummies, rating, signed_by, sheets";

/// Why the archive could not be used.
#[derive(Debug)]
pub enum StoreError {
    /// Another armsheet held the archive's lock for longer than [`BUSY_WAIT`].
    Busy,
    /// The archive was written by a newer armsheet.
    Newer {
        /// The archive's version.
        found: u32,
    },
    /// There is no archive at the path (commands that only read never create one).
    Missing,
    /// Anything else the database said.
    Database(String),
}

impl std::fmt::Display for StoreError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            StoreError::Busy => write!(
                f,
                "the archive is busy: another armsheet held its lock for more than {} s; nothing was written\n  = hint: try again when the other run has finished",
                BUSY_WAIT.as_secs()
            ),
            StoreError::Newer { found } => write!(
                f,
                "the archive was written by a newer armsheet (archive version {found}; this armsheet {} knows versions 1 to {LATEST}); it is left as it is\n  = hint: use that armsheet, or a newer one",
                env!("CARGO_PKG_VERSION")
            ),
            StoreError::Missing => write!(
                f,
                "there is no archive there yet\n  = hint: `armsheet archive add DESIGN` makes one"
            ),
            StoreError::Database(m) => write!(f, "{m}"),
        }
    }
}

impl From<rusqlite::Error> for StoreError {
    fn from(e: rusqlite::Error) -> Self {
        match e.sqlite_error_code() {
            Some(ErrorCode::DatabaseBusy | ErrorCode::DatabaseLocked) => StoreError::Busy,
            _ => StoreError::Database(e.to_string()),
        }
    }
}

/// An open archive.
pub enum Store {
    /// A SQLite file.
    Sqlite(Connection),
}

/// Whether a command may make a new archive.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Create {
    /// `add` and `import`: a missing archive is made.
    Yes,
    /// Every other command: a missing archive is [`StoreError::Missing`].
    No,
}

impl Store {
    /// Opens (or with [`Create::Yes`] makes) the archive at `path` and brings it to [`LATEST`],
    /// after a backup copy of an older one (`<path>.v<N>.bak`, kept if it is there already).
    pub fn open(path: &Path, create: Create) -> Result<Store, StoreError> {
        // Switching a new file to WAL and migrating it take the whole file for a moment;
        // SQLite may answer "busy" at once there (without waiting in its busy handler) when
        // several processes open a new archive together: try again until the busy wait is
        // spent.
        let deadline = std::time::Instant::now() + BUSY_WAIT;
        loop {
            match Store::open_once(path, create) {
                Err(StoreError::Busy) if std::time::Instant::now() < deadline => {
                    std::thread::sleep(Duration::from_millis(25));
                }
                other => return other,
            }
        }
    }

    /// One try of [`Store::open`].
    fn open_once(path: &Path, create: Create) -> Result<Store, StoreError> {
        let mut flags = OpenFlags::SQLITE_OPEN_READ_WRITE | OpenFlags::SQLITE_OPEN_NO_MUTEX;
        if create == Create::Yes {
            flags |= OpenFlags::SQLITE_OPEN_CREATE;
        } else if !path.exists() {
            return Err(StoreError::Missing);
        }
        let conn = Connection::open_with_flags(path, flags)?;
        conn.busy_timeout(BUSY_WAIT)?;
        let mode: String = conn.query_row("PRAGMA journal_mode = WAL", [], |r| r.get(0))?;
        if !mode.eq_ignore_ascii_case("wal") {
            return Err(StoreError::Database(format!(
                "the archive could not be put in WAL mode (it stays in {mode})"
            )));
        }
        let mut store = Store::Sqlite(conn);
        let found = store.version()?;
        if found > LATEST {
            return Err(StoreError::Newer { found });
        }
        if found > 0 && found < LATEST {
            let copy = backup_name(path, found);
            if !copy.exists() {
                store.backup(&copy)?;
            }
        }
        if found < LATEST {
            store.migrate()?;
        }
        Ok(store)
    }

    /// The archive's version: the newest applied, 0 for an empty file.
    pub fn version(&self) -> Result<u32, StoreError> {
        match self {
            Store::Sqlite(c) => {
                let has: Option<i64> = c
                    .query_row(
                        "SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'archive_version'",
                        [],
                        |r| r.get(0),
                    )
                    .optional()?;
                if has.is_none() {
                    return Ok(0);
                }
                let v: Option<u32> =
                    c.query_row("SELECT MAX(version) FROM archive_version", [], |r| r.get(0))?;
                Ok(v.unwrap_or(0))
            }
        }
    }

    /// Applies the missing migrations in one transaction (a second process that got there
    /// first leaves nothing to do).
    fn migrate(&mut self) -> Result<(), StoreError> {
        match self {
            Store::Sqlite(c) => {
                let tx = c.transaction_with_behavior(TransactionBehavior::Immediate)?;
                // Read again under the lock: another process may have migrated meanwhile.
                let has: Option<i64> = tx
                    .query_row(
                        "SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'archive_version'",
                        [],
                        |r| r.get(0),
                    )
                    .optional()?;
                let now: u32 = if has.is_some() {
                    tx.query_row("SELECT MAX(version) FROM archive_version", [], |r| {
                        r.get::<_, Option<u32>>(0)
                    })?
                    .unwrap_or(0)
                } else {
                    0
                };
                for (i, sql) in MIGRATIONS.iter().enumerate().skip(now as usize) {
                    tx.execute_batch(sql)?;
                    tx.execute(
                        "INSERT INTO archive_version (version, written_by) VALUES (?1, ?2)",
                        params![
                            i as u32 + 1,
                            concat!("armsheet ", env!("CARGO_PKG_VERSION"))
                        ],
                    )?;
                }
                tx.commit()?;
            }
        }
        Ok(())
    }

    /// Adds `records` in one transaction, each as its job's next revision; returns the
    /// revisions given. Either every record is there afterwards or none is.
    pub fn add(&mut self, records: &[Record]) -> Result<Vec<u32>, StoreError> {
        match self {
            Store::Sqlite(c) => {
                let tx = c.transaction_with_behavior(TransactionBehavior::Immediate)?;
                let mut given = Vec::with_capacity(records.len());
                {
                    let mut next = tx.prepare(
                        "SELECT COALESCE(MAX(revision), 0) + 1 FROM jobs WHERE job = ?1",
                    )?;
                    let mut insert = tx.prepare(&format!(
                        "INSERT INTO jobs ({COLUMNS}) VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, \
                         ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16, ?17, ?18, ?19, ?20, ?21, ?22, \
                         ?23, ?24, ?25, ?26, ?27, ?28, ?29, ?30, ?31, ?32)"
                    ))?;
                    for r in records {
                        let revision: u32 = next.query_row([&r.job.job], |row| row.get(0))?;
                        let s = &r.summary;
                        let json = |e: serde_json::Error| StoreError::Database(e.to_string());
                        let signed = serde_json::to_string(&r.signed_by).map_err(json)?;
                        let sheets = serde_json::to_string(&r.sheets).map_err(json)?;
                        insert.execute(params![
                            r.job.job,
                            revision,
                            r.job.customer,
                            r.job.title,
                            r.job.date,
                            r.design_name,
                            r.design,
                            r.card,
                            r.readings,
                            r.verdict,
                            s.poles,
                            s.slots,
                            s.bars,
                            s.kind,
                            s.multiplicity,
                            s.direction,
                            s.coils_per_slot,
                            s.span,
                            s.span_shop,
                            s.throw_end,
                            s.throw_shop,
                            s.turns,
                            s.wire,
                            s.strands,
                            s.lead_swing_half_bars,
                            s.lead_swing,
                            s.brush_sets,
                            s.equalizers,
                            s.dummies,
                            s.rating,
                            signed,
                            sheets,
                        ])?;
                        given.push(revision);
                    }
                }
                tx.commit()?;
                Ok(given)
            }
        }
    }

    /// Each job's latest revision whose frame may match `q`: the same poles and slots, bars
    /// within one (through the `jobs_frame` index).
    pub fn candidates(&self, q: &Query) -> Result<Vec<Record>, StoreError> {
        let (lo, hi) = q.bar_range();
        self.select(
            "WHERE poles = ?1 AND slots = ?2 AND bars BETWEEN ?3 AND ?4 \
             AND revision = (SELECT MAX(revision) FROM jobs AS later WHERE later.job = jobs.job) \
             ORDER BY job",
            &[&q.poles, &q.slots, &lo, &hi],
        )
    }

    /// Every revision of `job`, oldest first.
    pub fn history(&self, job: &str) -> Result<Vec<Record>, StoreError> {
        self.select("WHERE job = ?1 ORDER BY revision", &[&job])
    }

    /// Every revision of every job, by job and revision.
    pub fn all(&self) -> Result<Vec<Record>, StoreError> {
        self.select("ORDER BY job, revision", &[])
    }

    fn select(
        &self,
        rest: &str,
        values: &[&dyn rusqlite::ToSql],
    ) -> Result<Vec<Record>, StoreError> {
        match self {
            Store::Sqlite(c) => {
                let mut st = c.prepare(&format!("SELECT {COLUMNS} FROM jobs {rest}"))?;
                let rows = st.query_map(values, |r| {
                    let signed: String = r.get(30)?;
                    let sheets: String = r.get(31)?;
                    Ok(Record {
                        job: JobFields {
                            job: r.get(0)?,
                            customer: r.get(2)?,
                            title: r.get(3)?,
                            date: r.get(4)?,
                        },
                        revision: r.get(1)?,
                        design_name: r.get(5)?,
                        design: r.get(6)?,
                        card: r.get(7)?,
                        readings: r.get(8)?,
                        verdict: r.get(9)?,
                        signed_by: serde_json::from_str(&signed).unwrap_or_default(),
                        sheets: serde_json::from_str(&sheets).unwrap_or_default(),
                        summary: Summary {
                            poles: r.get(10)?,
                            slots: r.get(11)?,
                            bars: r.get(12)?,
                            kind: r.get(13)?,
                            multiplicity: r.get(14)?,
                            direction: r.get(15)?,
                            coils_per_slot: r.get(16)?,
                            span: r.get(17)?,
                            span_shop: r.get(18)?,
                            throw_end: r.get(19)?,
                            throw_shop: r.get(20)?,
                            turns: r.get(21)?,
                            wire: r.get(22)?,
                            strands: r.get(23)?,
                            lead_swing_half_bars: r.get(24)?,
                            lead_swing: r.get(25)?,
                            brush_sets: r.get(26)?,
                            equalizers: r.get(27)?,
                            dummies: r.get(28)?,
                            rating: r.get(29)?,
                        },
                    })
                })?;
                Ok(rows.collect::<Result<Vec<_>, _>>()?)
            }
        }
    }

    /// A consistent copy of the archive at `to` (SQLite's online backup: other processes may
    /// go on writing meanwhile).
    pub fn backup(&self, to: &Path) -> Result<(), StoreError> {
        match self {
            Store::Sqlite(c) => {
                c.backup(
                    rusqlite::MAIN_DB,
                    to,
                    None::<fn(rusqlite::backup::Progress)>,
                )?;
                Ok(())
            }
        }
    }

    /// `PRAGMA integrity_check`'s answer: `ok` for a sound file.
    pub fn integrity(&self) -> Result<String, StoreError> {
        match self {
            Store::Sqlite(c) => Ok(c.query_row("PRAGMA integrity_check", [], |r| r.get(0))?),
        }
    }
}

/// Where the copy of an archive at version `found` goes before it is migrated.
pub fn backup_name(path: &Path, found: u32) -> PathBuf {
    let mut name = path.as_os_str().to_owned();
    name.push(format!(".v{found}.bak"));
    PathBuf::from(name)
}
