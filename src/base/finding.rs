//! `Finding`: the outcome of one rule check, with its severity and the rule's source.
//!
//! Part of the `base` leaf: the `checks` and `rating` stages return findings, never print them.

/// How much a failed check matters.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Severity {
    /// The winding must not be wound as designed; `check` exits 1.
    Error,
    /// Wound as designed it will work, but a rule of the trade is bent.
    Warning,
    /// A fact worth knowing.
    Info,
}

impl Severity {
    /// Lower-case word used in reports and JSON.
    pub fn as_str(self) -> &'static str {
        match self {
            Severity::Error => "error",
            Severity::Warning => "warning",
            Severity::Info => "info",
        }
    }
}

/// One rule applied to the design.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Finding {
    /// Stable id, `family.rule` (e.g. `symmetry.slots-per-path-pair`).
    pub id: String,
    /// Severity when the rule fails (an info finding is informational whether or not it passed).
    pub severity: Severity,
    /// Whether the rule is met.
    pub passed: bool,
    /// What was found, with the numbers.
    pub message: String,
    /// Where the rule comes from: a standard, a text, `common practice` or `from memory`.
    pub source: String,
}

/// One rule's spec: a row of the rules table (`checks::rules::RULES`), which is the one place
/// a rule's id, severity and source are written.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct RuleSpec {
    /// Stable id, `family.rule`, stable once released (JSON consumers key on it).
    pub id: &'static str,
    /// Severity when the rule fails.
    pub severity: Severity,
    /// Where the rule comes from: a standard, a text, `common practice` or `from memory`.
    pub source: &'static str,
}

impl Finding {
    /// The finding of `rule`: its id, severity and source from the rule's row.
    pub fn of(rule: &RuleSpec, passed: bool, message: impl Into<String>) -> Finding {
        Finding {
            id: rule.id.to_string(),
            severity: rule.severity,
            passed,
            message: message.into(),
            source: rule.source.to_string(),
        }
    }

    /// The finding at a lower severity than its row's, where the rule itself says so (an
    /// error the exact test overrules, equalizers nobody asked for); never a higher one.
    pub fn lowered_to(mut self, severity: Severity) -> Finding {
        self.severity = self.severity.max(severity);
        self
    }

    /// True for a failed error-severity rule.
    pub fn is_failure(&self) -> bool {
        self.severity == Severity::Error && !self.passed
    }
}

/// True when any error-severity rule failed.
pub fn has_errors(findings: &[Finding]) -> bool {
    findings.iter().any(Finding::is_failure)
}
