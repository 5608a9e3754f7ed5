//! End-to-end tests of the `zsum` binary: run it as a user would and check
//! its output against values computed independently inside the test
//! (brute-force enumeration of quantum numbers, textbook level lists, exact
//! SI constants).
//!
//! Energies of a particle in a box with sides a_i * L are
//! E = sum_i n_i^2 / a_i^2 in units of h^2/(8 m L^2), n_i >= 1 (textbook
//! result, from memory). The brute force below enumerates exactly that.

use std::collections::BTreeMap;
use std::fs;
use std::path::Path;
use std::process::{Command, Output};

use serde_json::Value;

const BOX_UNIT: &str = "h^2/(8 m L^2)";

// ---------------------------------------------------------------------------
// Running the binary
// ---------------------------------------------------------------------------

fn run(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_zsum"))
        .args(args)
        .output()
        .expect("failed to start the zsum binary")
}

fn stdout_of(out: &Output) -> String {
    String::from_utf8(out.stdout.clone()).expect("stdout is not UTF-8")
}

fn stderr_of(out: &Output) -> String {
    String::from_utf8(out.stderr.clone()).expect("stderr is not UTF-8")
}

/// Runs a command that must succeed and returns its stdout.
fn ok(args: &[&str]) -> String {
    let out = run(args);
    assert!(
        out.status.success(),
        "zsum {args:?} failed with {:?}; stderr:\n{}",
        out.status,
        stderr_of(&out)
    );
    stdout_of(&out)
}

/// Runs a command that must succeed with JSON output and parses it.
fn ok_json(args: &[&str]) -> Value {
    let text = ok(args);
    serde_json::from_str(&text)
        .unwrap_or_else(|e| panic!("zsum {args:?} printed invalid JSON ({e}):\n{text}"))
}

/// Runs a command that must fail as a usage error: exit status 2, nothing on
/// stdout, a non-empty message on stderr. Returns stderr.
fn fails(args: &[&str]) -> String {
    let out = run(args);
    let err = stderr_of(&out);
    assert_eq!(
        out.status.code(),
        Some(2),
        "zsum {args:?} should exit with status 2; stderr:\n{err}"
    );
    assert!(
        out.stdout.is_empty(),
        "zsum {args:?} should print nothing on stdout, printed:\n{}",
        stdout_of(&out)
    );
    assert!(!err.trim().is_empty(), "zsum {args:?}: empty stderr");
    err
}

/// Like `fails`, and the message is one of zsum's own (prefix "zsum: error:",
/// as the CLI's contract states) and names `value` as a separate token.
fn fails_naming(args: &[&str], value: &str) -> String {
    let err = fails(args);
    assert!(
        err.starts_with("zsum: error:"),
        "zsum {args:?}: stderr should start with 'zsum: error:', got:\n{err}"
    );
    assert!(
        names(&err, value),
        "zsum {args:?}: stderr should name the offending value {value:?}, got:\n{err}"
    );
    err
}

/// True if `value` occurs in `text` not glued to other digits, letters or
/// dots (so "2" is not found inside "12" or "2.5").
fn names(text: &str, value: &str) -> bool {
    let glued = |c: char| c.is_ascii_alphanumeric() || c == '.';
    text.match_indices(value).any(|(i, _)| {
        let before = text[..i].chars().next_back();
        let after = text[i + value.len()..].chars().next();
        !before.is_some_and(glued) && !after.is_some_and(glued)
    })
}

fn s<'a>(v: &'a Value, key: &str) -> &'a str {
    v[key]
        .as_str()
        .unwrap_or_else(|| panic!("field {key:?} should be a string in {v}"))
}

fn levels_of(v: &Value) -> &Vec<Value> {
    v["levels"]
        .as_array()
        .expect("\"levels\" should be an array")
}

// ---------------------------------------------------------------------------
// Exact arithmetic helpers for the brute force
// ---------------------------------------------------------------------------

fn gcd(mut a: u128, mut b: u128) -> u128 {
    while b != 0 {
        (a, b) = (b, a % b);
    }
    a
}

fn lcm(a: u128, b: u128) -> u128 {
    a / gcd(a, b) * b
}

/// Floor of the square root, exact for every u128 (float guess, then fixed up).
fn isqrt(x: u128) -> u128 {
    let mut r = (x as f64).sqrt() as u128;
    while r * r > x {
        r -= 1;
    }
    while (r + 1) * (r + 1) <= x {
        r += 1;
    }
    r
}

/// The exact rational p/q as zsum is documented to print it: "p" when q = 1,
/// otherwise "p/q" in lowest terms.
fn rational_string(p: u128, q: u128) -> String {
    let g = gcd(p, q);
    let (p, q) = (p / g, q / g);
    if q == 1 {
        format!("{p}")
    } else {
        format!("{p}/{q}")
    }
}

/// Parses "p" or "p/q" (non-negative) into (p, q).
fn parse_rational(text: &str) -> (u128, u128) {
    match text.split_once('/') {
        Some((p, q)) => (p.parse().unwrap(), q.parse().unwrap()),
        None => (text.parse().unwrap(), 1),
    }
}

/// A box geometry for the brute force: energy = sum_i w_i n_i^2 / den, where
/// for side ratios a_i = p_i/q_i, 1/a_i^2 = q_i^2/p_i^2 = w_i/den.
struct Geometry {
    weights: Vec<u128>,
    den: u128,
}

impl Geometry {
    /// `sides` are the side ratios as fractions (p, q) = p/q.
    fn new(sides: &[(u128, u128)]) -> Self {
        let den = sides.iter().fold(1, |d, &(p, _)| lcm(d, p * p));
        let weights = sides
            .iter()
            .map(|&(p, q)| q * q * (den / (p * p)))
            .collect();
        Geometry { weights, den }
    }

    fn cube(dims: usize) -> Self {
        Geometry::new(&vec![(1, 1); dims])
    }

    /// Every state with energy <= cutoff (= cut_p/cut_q), grouped by the
    /// scaled energy key = sum w_i n_i^2 (energy = key/den), in order.
    fn levels(&self, cut_p: u128, cut_q: u128) -> BTreeMap<u128, Vec<Vec<u128>>> {
        // key/den <= cut_p/cut_q  <=>  key * cut_q <= cut_p * den
        let limit = cut_p * self.den;
        let mut out: BTreeMap<u128, Vec<Vec<u128>>> = BTreeMap::new();
        let mut current = Vec::new();
        self.enumerate(0, 0, limit, cut_q, &mut current, &mut out);
        out
    }

    fn enumerate(
        &self,
        axis: usize,
        key: u128,
        limit: u128,
        cut_q: u128,
        current: &mut Vec<u128>,
        out: &mut BTreeMap<u128, Vec<Vec<u128>>>,
    ) {
        if axis == self.weights.len() {
            out.entry(key).or_default().push(current.clone());
            return;
        }
        let mut n = 1;
        loop {
            let k = key + self.weights[axis] * n * n;
            // The remaining axes add at least their weight each (n = 1).
            let rest: u128 = self.weights[axis + 1..].iter().sum();
            if (k + rest) * cut_q > limit {
                break;
            }
            current.push(n);
            self.enumerate(axis + 1, k, limit, cut_q, current, out);
            current.pop();
            n += 1;
        }
    }

    /// Number of states with energy <= cut_p/cut_q, counted with loops over
    /// all axes but the last, whose range is found with an exact isqrt.
    /// The count does not depend on the order of the axes, so the axis with
    /// the smallest weight (the most values of n) goes last.
    fn count(&self, cut_p: u128, cut_q: u128) -> u128 {
        let mut weights = self.weights.clone();
        weights.sort_unstable_by(|a, b| b.cmp(a));
        let sorted = Geometry {
            weights,
            den: self.den,
        };
        let limit = cut_p * self.den; // need sum(w_i n_i^2) * cut_q <= limit
        sorted.count_from(0, 0, limit, cut_q)
    }

    fn count_from(&self, axis: usize, key: u128, limit: u128, cut_q: u128) -> u128 {
        let w = self.weights[axis];
        if axis + 1 == self.weights.len() {
            // largest n with (key + w n^2) * cut_q <= limit
            let room = limit / cut_q;
            if room < key {
                return 0;
            }
            return isqrt((room - key) / w);
        }
        let rest: u128 = self.weights[axis + 1..].iter().sum();
        let mut total = 0;
        let mut n = 1;
        loop {
            let k = key + w * n * n;
            if (k + rest) * cut_q > limit {
                break;
            }
            total += self.count_from(axis + 1, k, limit, cut_q);
            n += 1;
        }
        total
    }

    /// Number of families of a level: states related by permuting axes of
    /// equal side length count as one family. Sorting (weight, n) pairs maps
    /// every member of a family to the same canonical form.
    fn families(&self, states: &[Vec<u128>]) -> usize {
        let mut forms: Vec<Vec<(u128, u128)>> = states
            .iter()
            .map(|st| {
                let mut f: Vec<(u128, u128)> = self
                    .weights
                    .iter()
                    .copied()
                    .zip(st.iter().copied())
                    .collect();
                f.sort();
                f
            })
            .collect();
        forms.sort();
        forms.dedup();
        forms.len()
    }
}

fn states_of(level: &Value) -> Vec<Vec<u128>> {
    let mut states: Vec<Vec<u128>> = level["states"]
        .as_array()
        .unwrap_or_else(|| panic!("level has no \"states\" array: {level}"))
        .iter()
        .map(|st| {
            st.as_array()
                .expect("a state should be an array of quantum numbers")
                .iter()
                .map(|n| n.as_u64().expect("quantum numbers are integers") as u128)
                .collect()
        })
        .collect();
    states.sort();
    states
}

/// Checks a `levels ... --format json` listing level by level against the
/// brute force: energy string, degeneracy, families, origin, and (if listed)
/// the exact set of states; also level_count and total_states.
fn check_levels_json(v: &Value, geo: &Geometry, cut_p: u128, cut_q: u128, with_states: bool) {
    let expected = geo.levels(cut_p, cut_q);
    let got = levels_of(v);
    assert_eq!(
        got.len(),
        expected.len(),
        "number of levels differs from brute force"
    );
    assert_eq!(v["level_count"].as_u64(), Some(expected.len() as u64));
    let mut total = 0u128;
    for (level, (key, states)) in got.iter().zip(&expected) {
        let energy = rational_string(*key, geo.den);
        assert_eq!(s(level, "energy"), energy, "level {level}");
        assert_eq!(
            s(level, "degeneracy"),
            states.len().to_string(),
            "degeneracy of level {energy}"
        );
        let families = geo.families(states);
        assert_eq!(
            level["families"].as_u64(),
            Some(families as u64),
            "families of level {energy}"
        );
        // The documented meaning of "origin".
        let origin = if states.len() == 1 {
            "single"
        } else if families == 1 {
            "symmetry"
        } else {
            "coincidence"
        };
        assert_eq!(s(level, "origin"), origin, "origin of level {energy}");
        if with_states {
            let mut want = states.clone();
            want.sort();
            assert_eq!(states_of(level), want, "states of level {energy}");
        } else {
            assert!(
                level.get("states").is_none(),
                "\"states\" must be absent without --states"
            );
        }
        assert!(
            level.get("energy_physical").is_none(),
            "\"energy_physical\" must be absent without --mass/--side"
        );
        total += states.len() as u128;
    }
    assert_eq!(s(v, "total_states"), total.to_string());
}

// ---------------------------------------------------------------------------
// 1. The cubic box up to 30, with states
// ---------------------------------------------------------------------------

#[test]
fn cube_levels_up_to_30_textbook_values() {
    let v = ok_json(&[
        "levels", "box", "--dims", "3", "--up-to", "30", "--states", "--format", "json",
    ]);
    assert_eq!(s(&v, "model"), "box");
    assert_eq!(s(&v, "unit"), BOX_UNIT);

    // Textbook cubic-box levels E = n1^2+n2^2+n3^2 with degeneracies (from
    // memory; also re-derived by the brute force below).
    let textbook: [(&str, &str); 16] = [
        ("3", "1"),
        ("6", "3"),
        ("9", "3"),
        ("11", "3"),
        ("12", "1"),
        ("14", "6"),
        ("17", "3"),
        ("18", "3"),
        ("19", "3"),
        ("21", "6"),
        ("22", "3"),
        ("24", "3"),
        ("26", "6"),
        ("27", "4"),
        ("29", "6"),
        ("30", "6"),
    ];
    let levels = levels_of(&v);
    let got: Vec<(&str, &str)> = levels
        .iter()
        .map(|l| (s(l, "energy"), s(l, "degeneracy")))
        .collect();
    assert_eq!(got, textbook);

    // 27 = 3^2+3^2+3^2 = 1^2+1^2+5^2: two families, an accidental coincidence.
    let l27 = levels.iter().find(|l| s(l, "energy") == "27").unwrap();
    assert_eq!(s(l27, "origin"), "coincidence");
    assert_eq!(l27["families"].as_u64(), Some(2));
    assert_eq!(
        states_of(l27),
        vec![vec![1, 1, 5], vec![1, 5, 1], vec![3, 3, 3], vec![5, 1, 1]]
    );

    // 6: exactly the three permutations of (1,1,2); one family.
    let l6 = levels.iter().find(|l| s(l, "energy") == "6").unwrap();
    assert_eq!(s(l6, "origin"), "symmetry");
    assert_eq!(l6["families"].as_u64(), Some(1));
    assert_eq!(
        states_of(l6),
        vec![vec![1, 1, 2], vec![1, 2, 1], vec![2, 1, 1]]
    );
    // 3 and 12 are the single states (1,1,1) and (2,2,2).
    for (e, st) in [("3", vec![1, 1, 1]), ("12", vec![2, 2, 2])] {
        let level = levels.iter().find(|l| s(l, "energy") == e).unwrap();
        assert_eq!(s(level, "origin"), "single");
        assert_eq!(states_of(level), vec![st]);
    }

    // Every listed state really has the energy of its level.
    for level in levels {
        let e: u128 = s(level, "energy").parse().unwrap();
        let states = states_of(level);
        assert_eq!(states.len().to_string(), s(level, "degeneracy"));
        for st in &states {
            assert!(st.iter().all(|&n| n >= 1), "quantum numbers start at 1");
            assert_eq!(st.iter().map(|n| n * n).sum::<u128>(), e, "state {st:?}");
        }
    }

    // total_states = sum of degeneracies = brute-force count.
    let sum: u128 = levels
        .iter()
        .map(|l| s(l, "degeneracy").parse::<u128>().unwrap())
        .sum();
    let mut brute = 0;
    for a in 1..=6u32 {
        for b in 1..=6u32 {
            for c in 1..=6u32 {
                if a * a + b * b + c * c <= 30 {
                    brute += 1;
                }
            }
        }
    }
    assert_eq!(sum, brute);
    assert_eq!(s(&v, "total_states"), brute.to_string());
    assert_eq!(v["level_count"].as_u64(), Some(16));

    // And the full structural comparison with the brute force.
    check_levels_json(&v, &Geometry::cube(3), 30, 1, true);
}

#[test]
fn cube_is_the_default_geometry_and_larger_cutoff_matches_brute_force() {
    // No --dims and no --sides: a cube in 3D (documented default).
    let v = ok_json(&["levels", "box", "--up-to", "200", "--format", "json"]);
    check_levels_json(&v, &Geometry::cube(3), 200, 1, false);
    let v = ok_json(&[
        "levels", "box", "--up-to", "120", "--states", "--format", "json",
    ]);
    check_levels_json(&v, &Geometry::cube(3), 120, 1, true);
}

#[test]
fn one_and_two_dimensional_levels_match_brute_force() {
    let v = ok_json(&[
        "levels", "box", "--dims", "1", "--up-to", "400", "--states", "--format", "json",
    ]);
    check_levels_json(&v, &Geometry::cube(1), 400, 1, true);
    // In 1D every level is a single state n^2: 1, 4, ..., 400 -> 20 levels.
    assert_eq!(v["level_count"].as_u64(), Some(20));

    let v = ok_json(&[
        "levels", "box", "--dims", "2", "--up-to", "300", "--states", "--format", "json",
    ]);
    check_levels_json(&v, &Geometry::cube(2), 300, 1, true);
    // 2D: 50 = 1^2+7^2 = 5^2+5^2 is a coincidence of two families (from memory).
    let l50 = levels_of(&v)
        .iter()
        .find(|l| s(l, "energy") == "50")
        .unwrap();
    assert_eq!(s(l50, "origin"), "coincidence");
    assert_eq!(s(l50, "degeneracy"), "3");
}

#[test]
fn cutoff_is_inclusive_and_read_exactly() {
    // 27 is a level: --up-to 27 includes it, --up-to 26.999 does not.
    let with = ok_json(&["levels", "box", "--up-to", "27", "--format", "json"]);
    assert_eq!(s(levels_of(&with).last().unwrap(), "energy"), "27");
    let without = ok_json(&["levels", "box", "--up-to", "26.999", "--format", "json"]);
    assert_eq!(s(levels_of(&without).last().unwrap(), "energy"), "26");

    // Fractions and exponents: 27/4 = 6.75 keeps levels 3 and 6; 3.0e1 = 30.
    let v = ok_json(&["levels", "box", "--up-to", "27/4", "--format", "json"]);
    check_levels_json(&v, &Geometry::cube(3), 27, 4, false);
    let v = ok_json(&["levels", "box", "--up-to", "3.0e1", "--format", "json"]);
    check_levels_json(&v, &Geometry::cube(3), 30, 1, false);

    // Exactly the ground level is allowed.
    let v = ok_json(&["levels", "box", "--up-to", "3", "--format", "json"]);
    assert_eq!(s(&v, "total_states"), "1");

    // A cutoff a hair below 3 is below the ground level; a program that
    // rounded it to a double (which gives exactly 3.0) would accept it.
    fails_naming(
        &["levels", "box", "--up-to", "2.99999999999999999999"],
        "299999999999999999999/100000000000000000000",
    );
}

// ---------------------------------------------------------------------------
// 2. Rectangular boxes
// ---------------------------------------------------------------------------

#[test]
fn rectangular_box_1_1_2_matches_brute_force() {
    // E = n1^2 + n2^2 + n3^2/4
    let geo = Geometry::new(&[(1, 1), (1, 1), (2, 1)]);
    let v = ok_json(&[
        "levels", "box", "--sides", "1,1,2", "--up-to", "60", "--states", "--format", "json",
    ]);
    check_levels_json(&v, &geo, 60, 1, true);
    // The ground level (1,1,1) is 1 + 1 + 1/4 = 9/4, printed as a fraction.
    let first = &levels_of(&v)[0];
    assert_eq!(s(first, "energy"), "9/4");
    assert_eq!(states_of(first), vec![vec![1, 1, 1]]);
    // Fractional energies use the "p/q" form, never decimals.
    assert!(levels_of(&v).iter().any(|l| s(l, "energy").contains('/')));
    assert!(levels_of(&v).iter().all(|l| !s(l, "energy").contains('.')));
    // Every listed state has exactly its level's energy.
    for level in levels_of(&v) {
        let (p, q) = parse_rational(s(level, "energy"));
        for st in states_of(level) {
            let four_e = 4 * st[0] * st[0] + 4 * st[1] * st[1] + st[2] * st[2];
            assert_eq!(four_e * q, 4 * p, "state {st:?} in level {level}");
        }
    }
    // --dims given explicitly and consistent: same result.
    let v2 = ok_json(&[
        "levels", "box", "--dims", "3", "--sides", "1,1,2", "--up-to", "60", "--states",
        "--format", "json",
    ]);
    assert_eq!(v2["levels"], v["levels"]);
}

#[test]
fn rectangular_box_2_3_5_with_colons_matches_brute_force() {
    // E = n1^2/4 + n2^2/9 + n3^2/25
    let geo = Geometry::new(&[(2, 1), (3, 1), (5, 1)]);
    let v = ok_json(&[
        "levels", "box", "--sides", "2:3:5", "--up-to", "3", "--states", "--format", "json",
    ]);
    check_levels_json(&v, &geo, 3, 1, true);
    // Ground level 1/4 + 1/9 + 1/25 = 361/900.
    assert_eq!(s(&levels_of(&v)[0], "energy"), "361/900");
    // The same box written with commas gives the same listing.
    let v2 = ok_json(&[
        "levels", "box", "--sides", "2,3,5", "--up-to", "3", "--states", "--format", "json",
    ]);
    assert_eq!(v2["levels"], v["levels"]);
}

#[test]
fn fractional_and_decimal_side_ratios_match_brute_force() {
    // 2D, sides 1 and 1/2: E = n1^2 + 4 n2^2
    let v = ok_json(&[
        "levels", "box", "--sides", "1,1/2", "--up-to", "150", "--states", "--format", "json",
    ]);
    check_levels_json(&v, &Geometry::new(&[(1, 1), (1, 2)]), 150, 1, true);
    // 2D, sides 1 and 1.5 = 3/2: E = n1^2 + 4 n2^2 / 9
    let v = ok_json(&[
        "levels", "box", "--sides", "1,1.5", "--up-to", "40", "--states", "--format", "json",
    ]);
    check_levels_json(&v, &Geometry::new(&[(1, 1), (3, 2)]), 40, 1, true);
    // Sides equal in value but written differently still form a cube.
    let cube = ok_json(&["levels", "box", "--up-to", "40", "--format", "json"]);
    let same = ok_json(&[
        "levels",
        "box",
        "--sides",
        "1,2/2,1.0",
        "--up-to",
        "40",
        "--format",
        "json",
    ]);
    assert_eq!(same["levels"], cube["levels"]);
    // Scaling every side by 2 divides every energy by 4.
    let v = ok_json(&[
        "levels", "box", "--sides", "2,2,2", "--up-to", "10", "--format", "json",
    ]);
    check_levels_json(&v, &Geometry::new(&[(2, 1), (2, 1), (2, 1)]), 10, 1, false);
    assert_eq!(s(&levels_of(&v)[0], "energy"), "3/4");
}

// ---------------------------------------------------------------------------
// 3. Counting
// ---------------------------------------------------------------------------

fn count_json(extra: &[&str]) -> Value {
    let mut args = vec!["count", "box"];
    args.extend_from_slice(extra);
    args.extend_from_slice(&["--format", "json"]);
    ok_json(&args)
}

#[test]
fn cube_count_matches_brute_force() {
    let v = count_json(&["--dims", "3", "--up-to", "1000"]);
    assert_eq!(s(&v, "model"), "box");
    // Simple triple loop, independent of the Geometry helper.
    let mut brute = 0u64;
    for a in 1..=32u64 {
        for b in 1..=32u64 {
            for c in 1..=32u64 {
                if a * a + b * b + c * c <= 1000 {
                    brute += 1;
                }
            }
        }
    }
    assert_eq!(s(&v, "states"), brute.to_string());
    assert_eq!(Geometry::cube(3).count(1000, 1), brute as u128);

    for cut in [3u128, 27, 12345, 1_000_000] {
        let v = count_json(&["--up-to", &cut.to_string()]);
        assert_eq!(
            s(&v, "states"),
            Geometry::cube(3).count(cut, 1).to_string(),
            "cube, cutoff {cut}"
        );
    }
}

#[test]
fn one_and_two_dimensional_counts_match_brute_force() {
    // 1D: states n^2 <= E, i.e. floor(sqrt(E)) of them.
    for cut in [1u128, 99, 100, 101, 123_456_789] {
        let v = count_json(&["--dims", "1", "--up-to", &cut.to_string()]);
        assert_eq!(s(&v, "states"), isqrt(cut).to_string(), "1D, cutoff {cut}");
    }
    // 2D by brute force.
    for cut in [2u128, 1000, 65, 100_000_000] {
        let v = count_json(&["--dims", "2", "--up-to", &cut.to_string()]);
        assert_eq!(
            s(&v, "states"),
            Geometry::cube(2).count(cut, 1).to_string(),
            "2D, cutoff {cut}"
        );
    }
    let mut brute = 0;
    for a in 1..=32u64 {
        for b in 1..=32u64 {
            if a * a + b * b <= 1000 {
                brute += 1;
            }
        }
    }
    let v = count_json(&["--dims", "2", "--up-to", "1000"]);
    assert_eq!(s(&v, "states"), brute.to_string());
}

#[test]
fn counts_are_exact_for_huge_and_fractional_cutoffs() {
    // Near 2^62 a double-precision square root is off by one; the exact
    // answers come from an integer isqrt. k = 2^31 - 1.
    let k: u128 = 2_147_483_647;
    for (cut, want) in [(k * k, k), (k * k - 1, k - 1)] {
        let v = count_json(&["--dims", "1", "--up-to", &cut.to_string()]);
        assert_eq!(s(&v, "states"), want.to_string(), "1D, cutoff {cut}");
    }
    // 10^18 - 1 is not representable as a double (it rounds to 10^18).
    let v = count_json(&["--dims", "1", "--up-to", "999999999999999999"]);
    assert_eq!(s(&v, "states"), "999999999");
    // (10^20 - 1)/100 sits just below 10^18.
    let v = count_json(&["--dims", "1", "--up-to", "99999999999999999999/100"]);
    assert_eq!(s(&v, "states"), "999999999");

    // A very flat 2D box (sides 1 and 1/1000, E = n1^2 + 10^6 n2^2) at a
    // cutoff near 2^62: cheap to count, but the sums are large.
    let geo = Geometry::new(&[(1, 1), (1, 1000)]);
    let cut: u128 = 4_600_000_000_000_000_000;
    let v = count_json(&["--sides", "1,1/1000", "--up-to", "4.6e18"]);
    assert_eq!(s(&v, "states"), geo.count(cut, 1).to_string());
}

#[test]
fn rectangular_counts_match_brute_force_and_level_totals() {
    // (--sides argument, the same ratios as fractions, cutoff p, cutoff q)
    type Case = (&'static str, Vec<(u128, u128)>, u128, u128);
    let cases: [Case; 4] = [
        ("1,1,2", vec![(1, 1), (1, 1), (2, 1)], 500, 1),
        ("2:3:5", vec![(2, 1), (3, 1), (5, 1)], 40, 1),
        ("1,1/2", vec![(1, 1), (1, 2)], 1000, 1),
        ("1,1.5,2/3", vec![(1, 1), (3, 2), (2, 3)], 401, 2),
    ];
    for (sides, ratios, p, q) in cases {
        let geo = Geometry::new(&ratios);
        let cut = rational_string(p, q);
        let want = geo.count(p, q).to_string();
        let v = count_json(&["--sides", sides, "--up-to", &cut]);
        assert_eq!(s(&v, "states"), want, "count, sides {sides}, cutoff {cut}");
        // Cross-check the enumeration-based brute force against the
        // isqrt-based one, and the listing's total against both.
        let listed: usize = geo.levels(p, q).values().map(Vec::len).sum();
        assert_eq!(listed.to_string(), want);
        let l = ok_json(&[
            "levels", "box", "--sides", sides, "--up-to", &cut, "--format", "json",
        ]);
        assert_eq!(s(&l, "total_states"), want, "levels total, sides {sides}");
    }
}

#[test]
fn counts_below_the_ground_level_are_zero() {
    // No state lies at or below an energy under the ground level 3.
    for cut in ["2", "0", "-5"] {
        let v = count_json(&["--up-to", cut]);
        assert_eq!(s(&v, "states"), "0", "cutoff {cut}");
    }
}

#[test]
fn weyl_estimate_is_close_to_the_exact_count() {
    // Weyl's law for the Dirichlet cube, two terms (from memory):
    // N(E) ~ (pi/6) E^(3/2) - (3 pi/8) E; the next term is O(sqrt E).
    let e: f64 = 1e6;
    let two_term = std::f64::consts::PI / 6.0 * e.powf(1.5) - 3.0 * std::f64::consts::PI / 8.0 * e;
    let v = count_json(&["--up-to", "1e6"]);
    let weyl: f64 = match &v["weyl_estimate"] {
        Value::String(t) => t.parse().expect("weyl_estimate should be a number"),
        Value::Number(n) => n.as_f64().unwrap(),
        other => panic!("weyl_estimate missing or odd: {other}"),
    };
    // Relative tolerance 1e-5: the O(sqrt E) term is ~1.4e-6 of N here.
    assert!(
        (weyl - two_term).abs() / two_term < 1e-5,
        "weyl_estimate {weyl} vs two-term Weyl law {two_term}"
    );
    let exact: f64 = s(&v, "states").parse().unwrap();
    assert!((exact - weyl).abs() / exact < 1e-5);
}

// ---------------------------------------------------------------------------
// 4. CSV and table output
// ---------------------------------------------------------------------------

#[test]
fn csv_has_a_header_and_one_row_per_level() {
    let text = ok(&["levels", "box", "--up-to", "30", "--format", "csv"]);
    let mut reader = csv::Reader::from_reader(text.as_bytes());
    let header = reader.headers().expect("CSV header").clone();
    assert!(
        header.iter().any(|h| h.contains("degeneracy")),
        "header {header:?}"
    );
    let rows: Vec<csv::StringRecord> = reader.records().map(|r| r.expect("CSV row")).collect();
    let expected = Geometry::cube(3).levels(30, 1);
    assert_eq!(rows.len(), expected.len());
    assert_eq!(rows.len(), 16);
    let deg_col = header.iter().position(|h| h == "degeneracy").unwrap();
    for (row, (key, states)) in rows.iter().zip(&expected) {
        assert_eq!(row.len(), header.len());
        assert_eq!(&row[0], key.to_string());
        assert_eq!(&row[deg_col], states.len().to_string());
    }

    // With --states the state lists are quoted and the row count is unchanged.
    let text = ok(&[
        "levels", "box", "--sides", "1,1,2", "--up-to", "20", "--states", "--format", "csv",
    ]);
    let geo = Geometry::new(&[(1, 1), (1, 1), (2, 1)]);
    let expected = geo.levels(20, 1);
    let mut reader = csv::Reader::from_reader(text.as_bytes());
    let width = reader.headers().unwrap().len();
    let rows: Vec<csv::StringRecord> = reader.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), expected.len());
    for (row, key) in rows.iter().zip(expected.keys()) {
        assert_eq!(row.len(), width);
        assert_eq!(&row[0], rational_string(*key, geo.den));
    }

    // count's CSV: header plus exactly one row.
    let text = ok(&["count", "box", "--up-to", "1000", "--format", "csv"]);
    let mut reader = csv::Reader::from_reader(text.as_bytes());
    let header = reader.headers().unwrap().clone();
    let col = header
        .iter()
        .position(|h| h == "states")
        .expect("states column");
    let rows: Vec<csv::StringRecord> = reader.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), 1);
    assert_eq!(&rows[0][col], Geometry::cube(3).count(1000, 1).to_string());
}

#[test]
fn table_names_the_unit_and_lists_every_level() {
    let text = ok(&["levels", "box", "--up-to", "30"]);
    assert!(
        text.contains(BOX_UNIT),
        "table should name the unit:\n{text}"
    );
    // Every level energy leads a line, in increasing order.
    let firsts: Vec<&str> = text
        .lines()
        .filter(|l| !l.trim_start().starts_with('#'))
        .filter_map(|l| l.split_whitespace().next())
        .filter(|w| w.chars().all(|c| c.is_ascii_digit() || c == '/'))
        .collect();
    let expected: Vec<String> = Geometry::cube(3)
        .levels(30, 1)
        .keys()
        .map(|k| k.to_string())
        .collect();
    assert_eq!(firsts, expected);

    let text = ok(&["count", "box", "--up-to", "1000"]);
    assert!(text.contains(BOX_UNIT), "count table should name the unit");
    assert!(names(&text, &Geometry::cube(3).count(1000, 1).to_string()));
}

// ---------------------------------------------------------------------------
// 5. Physical units
// ---------------------------------------------------------------------------

// Exact SI constants (SI 2019 redefinition, as listed in CODATA 2018) and the
// CODATA 2018 atomic mass constant.
const H: f64 = 6.626_070_15e-34; // J s
const K_B: f64 = 1.380_649e-23; // J/K
const C: f64 = 299_792_458.0; // m/s
const E_CHARGE: f64 = 1.602_176_634e-19; // C
const N_A: f64 = 6.022_140_76e23; // 1/mol
const M_U: f64 = 1.660_539_066_60e-27; // kg

/// h^2/(8 m L^2) in joules.
fn box_unit_joules(mass_kg: f64, side_m: f64) -> f64 {
    H * H / (8.0 * mass_kg * side_m * side_m)
}

fn physical(args: &[&str]) -> Vec<(String, f64)> {
    let v = ok_json(args);
    levels_of(&v)
        .iter()
        .map(|l| {
            let text = s(l, "energy_physical");
            (
                s(l, "energy").to_string(),
                text.parse::<f64>()
                    .unwrap_or_else(|_| panic!("energy_physical {text:?} is not a number")),
            )
        })
        .collect()
}

/// Relative tolerance 1e-9: zsum prints 10 significant digits by default
/// (rounding error <= 5e-10 relative), and f64 arithmetic here adds ~1e-15.
fn assert_close(got: f64, want: f64, what: &str) {
    let rel = ((got - want) / want).abs();
    assert!(
        rel < 1e-9,
        "{what}: got {got}, want {want} (rel. err. {rel:e})"
    );
}

#[test]
fn helium_in_a_10nm_box_in_kelvin() {
    let levels = physical(&[
        "levels", "box", "--mass", "4.0026u", "--side", "10nm", "--also", "K", "--up-to", "6",
        "--format", "json",
    ]);
    let unit_k = box_unit_joules(4.0026 * M_U, 10e-9) / K_B;
    assert_eq!(levels.len(), 2);
    assert_eq!(levels[0].0, "3");
    assert_close(levels[0].1, 3.0 * unit_k, "E(3) in K");
    assert_eq!(levels[1].0, "6");
    assert_close(levels[1].1, 6.0 * unit_k, "E(6) in K");
}

#[test]
fn physical_energies_in_every_unit() {
    let unit_j = box_unit_joules(4.0026 * M_U, 10e-9);
    let cases: [(&str, f64); 6] = [
        ("K", unit_j / K_B),
        ("cm-1", unit_j / (H * C * 100.0)),
        ("meV", unit_j / E_CHARGE * 1e3),
        ("eV", unit_j / E_CHARGE),
        ("J", unit_j),
        ("kJ/mol", unit_j * N_A / 1e3),
    ];
    for (unit, per_box_unit) in cases {
        let levels = physical(&[
            "levels", "box", "--mass", "4.0026u", "--side", "10nm", "--also", unit, "--up-to",
            "14", "--format", "json",
        ]);
        assert_eq!(levels.len(), 6, "unit {unit}");
        for (energy, value) in &levels {
            let e: f64 = energy.parse().unwrap();
            assert_close(*value, e * per_box_unit, &format!("E({energy}) in {unit}"));
        }
    }
}

#[test]
fn mass_and_length_units_are_converted() {
    let reference = physical(&[
        "levels", "box", "--mass", "4.0026u", "--side", "10nm", "--up-to", "3", "--format", "json",
    ]);
    let want = 3.0 * box_unit_joules(4.0026 * M_U, 10e-9) / K_B;
    assert_close(reference[0].1, want, "4.0026u, 10nm");
    // The same length and mass in other units (1 Da = 1 u; 10 nm = 100 A =
    // 0.01 um = 1e-8 m = 1e-6 cm).
    for (mass, side) in [
        ("4.0026Da", "10nm"),
        ("4.0026u", "100A"),
        ("4.0026u", "0.01um"),
        ("4.0026u", "1e-8m"),
        ("4.0026u", "1e-6cm"),
        ("4.0026u", "10000pm"),
    ] {
        let got = physical(&[
            "levels", "box", "--mass", mass, "--side", side, "--up-to", "3", "--format", "json",
        ]);
        assert_close(got[0].1, want, &format!("{mass}, {side}"));
    }
    // Mass in kg and g.
    let kg = 6.6465e-27;
    let want = 3.0 * box_unit_joules(kg, 10e-9) / K_B;
    for mass in ["6.6465e-27kg", "6.6465e-24g"] {
        let got = physical(&[
            "levels", "box", "--mass", mass, "--side", "10nm", "--up-to", "3", "--format", "json",
        ]);
        assert_close(got[0].1, want, mass);
    }
    // A rectangular box: the physical energy is still E * h^2/(8 m L^2).
    let got = physical(&[
        "levels", "box", "--sides", "1,1,2", "--mass", "4.0026u", "--side", "10nm", "--up-to", "3",
        "--format", "json",
    ]);
    assert_eq!(got[0].0, "9/4");
    let want = 2.25 * box_unit_joules(4.0026 * M_U, 10e-9) / K_B;
    assert_close(got[0].1, want, "9/4 in a 1,1,2 box");
}

#[test]
fn digits_sets_significant_digits_correctly_rounded() {
    let v = ok_json(&[
        "levels", "box", "--mass", "4.0026u", "--side", "10nm", "--also", "cm-1", "--digits", "5",
        "--up-to", "3", "--format", "json",
    ]);
    let text = s(&levels_of(&v)[0], "energy_physical");
    // Significant digits: all digits after leading zeros, before any exponent.
    let mantissa = text.split(['e', 'E']).next().unwrap();
    let digits: String = mantissa.chars().filter(char::is_ascii_digit).collect();
    let significant = digits.trim_start_matches('0');
    assert_eq!(
        significant.len(),
        5,
        "{text} should have 5 significant digits"
    );
    let want = 3.0 * box_unit_joules(4.0026 * M_U, 10e-9) / (H * C * 100.0);
    let got: f64 = text.parse().unwrap();
    // Correct rounding to 5 digits: error at most half a unit in the 5th digit.
    let half_unit = 0.5 * 10f64.powi(want.log10().floor() as i32 - 4);
    assert!(
        (got - want).abs() <= half_unit * (1.0 + 1e-9),
        "{got} is not {want} rounded to 5 digits"
    );
}

// ---------------------------------------------------------------------------
// 6. Bad input
// ---------------------------------------------------------------------------

#[test]
fn bad_dimensions_and_sides_are_refused() {
    for cmd in ["levels", "count"] {
        fails_naming(&[cmd, "box", "--dims", "4", "--up-to", "10"], "4");
        fails_naming(&[cmd, "box", "--dims", "0", "--up-to", "10"], "0");
        fails_naming(&[cmd, "box", "--sides", "1,0,1", "--up-to", "10"], "0");
        fails_naming(&[cmd, "box", "--sides", "1,-2,1", "--up-to", "10"], "-2");
        fails_naming(&[cmd, "box", "--sides", "1,abc,1", "--up-to", "10"], "abc");
        fails_naming(
            &[
                cmd, "box", "--dims", "2", "--sides", "1,1,1", "--up-to", "10",
            ],
            "1,1,1",
        );
        fails_naming(
            &[cmd, "box", "--dims", "3", "--sides", "1,1", "--up-to", "10"],
            "1,1",
        );
        fails_naming(&[cmd, "box", "--sides", "1/0,1,1", "--up-to", "10"], "1/0");
    }
}

#[test]
fn bad_cutoffs_are_refused() {
    fails_naming(&["levels", "box", "--up-to", "2"], "2");
    fails_naming(&["levels", "box", "--up-to", "-3"], "-3");
    // In a 1,1,2 box the ground level is 9/4, so 2 is below it but 9/4 is fine.
    fails_naming(&["levels", "box", "--sides", "1,1,2", "--up-to", "2"], "2");
    ok(&["levels", "box", "--sides", "1,1,2", "--up-to", "9/4"]);
    for cmd in ["levels", "count"] {
        fails_naming(&[cmd, "box", "--up-to", "banana"], "banana");
        fails_naming(&[cmd, "box", "--up-to", "1e999999"], "1e999999");
        fails_naming(&[cmd, "box", "--up-to", "1/0"], "1/0");
        fails_naming(&[cmd, "box", "--up-to", "nan"], "nan");
    }
}

#[test]
fn bad_physical_parameters_are_refused() {
    let base = ["levels", "box", "--up-to", "10"];
    let with = |extra: &[&'static str]| {
        let mut a: Vec<&str> = base.to_vec();
        a.extend_from_slice(extra);
        a
    };
    fails_naming(
        &with(&["--mass", "4.0026u", "--side", "10nm", "--also", "furlong"]),
        "furlong",
    );
    fails_naming(&with(&["--mass", "4.0026", "--side", "10nm"]), "4.0026");
    fails_naming(&with(&["--mass", "4.0026u", "--side", "-3nm"]), "-3nm");
    fails_naming(&with(&["--mass", "4.0026u", "--side", "10"]), "10");
    fails_naming(
        &with(&["--mass", "4.0026u", "--side", "3furlong"]),
        "3furlong",
    );
    fails_naming(&with(&["--mass", "0u", "--side", "10nm"]), "0u");
    fails_naming(
        &with(&["--mass", "4u", "--side", "1nm", "--digits", "0"]),
        "0",
    );
    // --mass without --side (or the reverse) cannot give physical energies.
    fails(&with(&["--mass", "4.0026u"]));
    fails(&with(&["--side", "10nm"]));
}

#[test]
fn memory_budget_is_parsed_and_enforced() {
    fails_naming(
        &[
            "levels",
            "box",
            "--up-to",
            "10",
            "--memory-budget",
            "nonsense",
        ],
        "nonsense",
    );
    // Listing every state up to 1e9 in a cube means ~(pi/6) 1e13.5 ~ 1.7e13
    // states: far beyond the default 2 GiB, however they are stored.
    fails_naming(
        &["levels", "box", "--dims", "3", "--up-to", "1e9", "--states"],
        "count",
    );
    // Up to 1e6 most integers are sums of three positive squares, so there
    // are several 1e5 levels: no per-level record fits that in 1 MiB.
    fails_naming(
        &["levels", "box", "--memory-budget", "1MiB", "--up-to", "1e6"],
        "count",
    );
    // A generous budget written as a plain number is accepted.
    let v = ok_json(&[
        "levels",
        "box",
        "--memory-budget",
        "1e9",
        "--up-to",
        "30",
        "--format",
        "json",
    ]);
    assert_eq!(v["level_count"].as_u64(), Some(16));
}

#[test]
fn out_of_range_counts_are_refused_promptly() {
    // 1e30 is far beyond any exact enumeration; the program must say so
    // (the message names the cutoff, in either notation).
    let err = fails(&["count", "box", "--up-to", "1e30"]);
    assert!(err.starts_with("zsum: error:"), "{err}");
    assert!(
        names(&err, "1e30") || names(&err, "1000000000000000000000000000000"),
        "message should name the cutoff:\n{err}"
    );
    // 1e15 in a 3D cube would take ~1e15 loop steps.
    let err = fails(&["count", "box", "--up-to", "1e15"]);
    assert!(
        names(&err, "1e15") || names(&err, "1000000000000000"),
        "message should name the cutoff:\n{err}"
    );
}

#[test]
fn usage_errors_have_the_zsum_prefix() {
    for args in [
        &["levels", "box", "--up-to", "3", "--format", "xml"][..],
        &["levels", "box", "--dims", "abc", "--up-to", "3"][..],
        &["levels", "box"][..],
        &["levels", "box", "--up-to", "3", "--bogus"][..],
    ] {
        let err = fails(args);
        assert!(err.starts_with("zsum: error:"), "zsum {args:?}:\n{err}");
    }
}

#[test]
fn usage_errors_exit_2_and_name_the_problem() {
    let err = fails(&["levels", "box", "--up-to", "3", "--format", "xml"]);
    assert!(names(&err, "xml"), "{err}");
    let err = fails(&["levels", "box", "--dims", "abc", "--up-to", "3"]);
    assert!(names(&err, "abc"), "{err}");
    let err = fails(&["levels", "box"]);
    assert!(err.contains("--up-to"), "{err}");
    let err = fails(&["levels", "box", "--up-to", "3", "--bogus"]);
    assert!(err.contains("--bogus"), "{err}");
}

// ---------------------------------------------------------------------------
// Output files (-o)
// ---------------------------------------------------------------------------

fn dir_entries(dir: &Path) -> Vec<String> {
    let mut names: Vec<String> = fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    names.sort();
    names
}

#[test]
fn failed_runs_leave_no_file_behind() {
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("out.json");
    let t = target.to_str().unwrap();
    // Errors found while reading arguments, while estimating the work, and
    // while checking the range.
    let bad: [&[&str]; 5] = [
        &[
            "levels", "box", "--up-to", "banana", "--format", "json", "-o", t,
        ],
        &["levels", "box", "--dims", "4", "--up-to", "10", "-o", t],
        &[
            "levels",
            "box",
            "--memory-budget",
            "1MiB",
            "--up-to",
            "1e6",
            "-o",
            t,
        ],
        &["levels", "box", "--up-to", "1e9", "--states", "-o", t],
        &[
            "count", "box", "--up-to", "1e30", "--format", "json", "-o", t,
        ],
    ];
    for args in bad {
        fails(args);
        assert_eq!(
            dir_entries(dir.path()),
            Vec::<String>::new(),
            "zsum {args:?} left files behind"
        );
    }
}

#[test]
fn failed_run_does_not_touch_an_existing_file() {
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("out.json");
    fs::write(&target, "previous contents").unwrap();
    fails(&[
        "levels",
        "box",
        "--memory-budget",
        "1MiB",
        "--up-to",
        "1e6",
        "-o",
        target.to_str().unwrap(),
    ]);
    assert_eq!(fs::read_to_string(&target).unwrap(), "previous contents");
    assert_eq!(dir_entries(dir.path()), vec!["out.json".to_string()]);
}

#[test]
fn output_file_is_complete_and_stdout_empty() {
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("out.json");
    let t = target.to_str().unwrap();
    let args = [
        "levels", "box", "--up-to", "30", "--states", "--format", "json", "-o", t,
    ];
    let out = run(&args);
    assert!(out.status.success(), "{}", stderr_of(&out));
    assert!(out.stdout.is_empty(), "stdout should be empty with -o");
    assert_eq!(dir_entries(dir.path()), vec!["out.json".to_string()]);
    let text = fs::read_to_string(&target).unwrap();
    let v: Value = serde_json::from_str(&text).expect("the file should be complete JSON");
    check_levels_json(&v, &Geometry::cube(3), 30, 1, true);
    // Same bytes as the stdout of the same command without -o.
    let direct = ok(&args[..args.len() - 2]);
    assert_eq!(text, direct);

    // Overwriting an existing file replaces it entirely.
    fs::write(&target, "x".repeat(100_000)).unwrap();
    let out = run(&[
        "count", "box", "--up-to", "1000", "--format", "json", "-o", t,
    ]);
    assert!(out.status.success(), "{}", stderr_of(&out));
    assert!(out.stdout.is_empty());
    let v: Value = serde_json::from_str(&fs::read_to_string(&target).unwrap()).unwrap();
    assert_eq!(
        s(&v, "states"),
        Geometry::cube(3).count(1000, 1).to_string()
    );
    assert_eq!(dir_entries(dir.path()), vec!["out.json".to_string()]);
}

#[test]
fn unwritable_output_path_is_an_error() {
    let err = fails(&[
        "levels",
        "box",
        "--up-to",
        "30",
        "-o",
        "/nonexistent-dir/x.json",
    ]);
    assert!(err.starts_with("zsum: error:"), "{err}");
    assert!(err.contains("/nonexistent-dir/x.json"), "{err}");
    assert!(!Path::new("/nonexistent-dir").exists());

    // A directory is not a file to write to.
    let dir = tempfile::tempdir().unwrap();
    fails(&[
        "levels",
        "box",
        "--up-to",
        "30",
        "-o",
        dir.path().to_str().unwrap(),
    ]);
    assert_eq!(dir_entries(dir.path()), Vec::<String>::new());
}

// ---------------------------------------------------------------------------
// 7. Help
// ---------------------------------------------------------------------------

#[test]
fn help_mentions_the_cutoff_option() {
    for args in [
        &["levels", "box", "--help"][..],
        &["count", "box", "--help"][..],
    ] {
        let out = run(args);
        assert_eq!(out.status.code(), Some(0), "zsum {args:?}");
        let text = stdout_of(&out);
        assert!(text.contains("--up-to"), "zsum {args:?}:\n{text}");
    }
    // The top-level help exits 0 and lists both subcommands.
    let out = run(&["--help"]);
    assert_eq!(out.status.code(), Some(0));
    let text = stdout_of(&out);
    assert!(text.contains("levels") && text.contains("count"), "{text}");
}
