//! Structured mutations of design files for the fuzz driver: deterministic from a seed, aimed
//! at the values and shapes a hostile or careless design file can hold (edge numbers, wrong
//! types, control characters, missing, repeated and unknown keys and tables).

/// A small deterministic generator (xorshift64*); the same seed gives the same inputs.
#[derive(Clone, Debug)]
pub struct Rng(u64);

impl Rng {
    /// A generator from `seed` (0 is moved off the fixed point).
    pub fn new(seed: u64) -> Rng {
        Rng(seed.wrapping_mul(0x9E37_79B9_7F4A_7C15) | 1)
    }

    /// The next 64 random bits.
    pub fn next(&mut self) -> u64 {
        let mut x = self.0;
        x ^= x >> 12;
        x ^= x << 25;
        x ^= x >> 27;
        self.0 = x;
        x.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// A number below `n` (n > 0).
    pub fn below(&mut self, n: usize) -> usize {
        (self.next() % n as u64) as usize
    }

    /// One of `items`.
    pub fn pick<'a, T>(&mut self, items: &'a [T]) -> &'a T {
        &items[self.below(items.len())]
    }
}

const INTS: [&str; 22] = [
    "0",
    "-1",
    "1",
    "2",
    "3",
    "4",
    "5",
    "6",
    "7",
    "12",
    "95",
    "96",
    "97",
    "4000",
    "4001",
    "20000",
    "20001",
    "65536",
    "2147483647",
    "4294967296",
    "9223372036854775807",
    "-9223372036854775808",
];

const FLOATS: [&str; 16] = [
    "0.0",
    "-0.0",
    "0.5",
    "1.5",
    "-1.5",
    "0.3",
    "1.0",
    "1e-308",
    "5e-324",
    "1e308",
    "nan",
    "inf",
    "-inf",
    "1e-7",
    "123456.789",
    "0.0000001",
];

const STRINGS: [&str; 16] = [
    "\"\"",
    "\"lap\"",
    "\"wave\"",
    "\"cw\"",
    "\"ccw\"",
    "\"full\"",
    "\"none\"",
    "\"1-8\"",
    "\"8-1\"",
    "\"1-1\"",
    "\"1\u{2013}9\"",
    "\"\\u001b]0;x\\u0007\\u001b[2J\"",
    "\"x\\u001b[1A\\u001b[2Kfake line\"",
    "\"\\u202eevil\\u0000\\u009b\"",
    "\"=cmd|' /C calc'!A0\"",
    "\" \\n@SUM(1)\"",
];

const OTHER: [&str; 8] = [
    "true",
    "[1, 2]",
    "{ a = 1 }",
    "1979-05-27",
    "'''multi\nline'''",
    "[]",
    "\"\\\"\"",
    "0x10",
];

const KEYS: [&str; 16] = [
    "poles",
    "slots",
    "coils_per_slot",
    "segments",
    "span",
    "turns",
    "multiplicity",
    "lead_offset",
    "equalizers",
    "brush_width_segments",
    "brush_width_mm",
    "current",
    "voltage",
    "diameter_mm",
    "spann",
    "colour",
];

const TABLES: [&str; 11] = [
    "[job]",
    "[armature]",
    "[winding]",
    "[rating]",
    "[conductor]",
    "[core]",
    "[commutator]",
    "[limits]",
    "[extra]",
    "[[armature]]",
    "[winding.sub]",
];

fn value(rng: &mut Rng) -> String {
    match rng.below(10) {
        0..=3 => rng.pick(&INTS).to_string(),
        4..=5 => rng.pick(&FLOATS).to_string(),
        6..=7 => rng.pick(&STRINGS).to_string(),
        8 => rng.pick(&OTHER).to_string(),
        _ => format!("\"{}\"", "x".repeat(1 + rng.below(300))),
    }
}

/// A value mostly of the same kind as `old` (so the design still parses often enough to reach
/// the stages after the parser), sometimes of any kind.
fn like(old: &str, rng: &mut Rng) -> String {
    if rng.below(3) == 0 {
        return value(rng);
    }
    if old.starts_with('"') {
        rng.pick(&STRINGS).to_string()
    } else if old.contains('.') || old.contains('e') {
        rng.pick(&FLOATS).to_string()
    } else {
        rng.pick(&INTS).to_string()
    }
}

/// One to four structured mutations of `text`.
pub fn mutate(text: &str, rng: &mut Rng) -> String {
    let mut lines: Vec<String> = text.lines().map(str::to_string).collect();
    let count = match rng.below(20) {
        0..=11 => 1,
        12..=16 => 2,
        _ => 3 + rng.below(2),
    };
    for _ in 0..count {
        if lines.is_empty() {
            lines.push(rng.pick(&TABLES).to_string());
        }
        let i = rng.below(lines.len());
        match rng.below(12) {
            // Replace a value.
            0..=4 => {
                if let Some((k, old)) = lines[i].split_once('=') {
                    let v = like(old.trim(), rng);
                    lines[i] = format!("{}= {}", k, v);
                }
            }
            5 => {
                lines.remove(i);
            }
            6 => {
                let l = lines[i].clone();
                lines.insert(i, l);
            }
            7 => {
                let k = rng.pick(&KEYS);
                let v = value(rng);
                lines.insert(i, format!("{k} = {v}"));
            }
            8 => {
                let t = rng.pick(&TABLES).to_string();
                lines.insert(i, t);
            }
            9 => {
                let j = rng.below(lines.len());
                lines.swap(i, j);
            }
            10 => {
                // Cut a line short.
                let l = &lines[i];
                let cut = l.char_indices().nth(rng.below(l.chars().count() + 1));
                if let Some((at, _)) = cut {
                    lines[i] = l[..at].to_string();
                }
            }
            _ => {
                // A stray byte sequence the TOML reader must refuse cleanly.
                let junk = ["\u{0}", "\u{1b}[31m", "\"", "[", "=", "\u{feff}", "\r"];
                let j = rng.pick(&junk).to_string();
                lines[i].push_str(&j);
            }
        }
    }
    let mut out = lines.join("\n");
    out.push('\n');
    out
}
