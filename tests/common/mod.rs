//! Helpers shared by the integration tests that sample random points of the shipped scenarios.

#![allow(dead_code)] // each test file uses a part

use junctura::scenario::Scenario;

/// A small deterministic generator (xorshift64*), so failures reproduce.
pub struct Rng(pub u64);

impl Rng {
    /// A uniform number in [lo, hi).
    pub fn uniform(&mut self, lo: f64, hi: f64) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        let u = (self.0.wrapping_mul(0x2545_f491_4f6c_dd1d) >> 11) as f64 / (1u64 << 53) as f64;
        lo + (hi - lo) * u
    }
}

/// Every file in scenarios/, loaded, with its path, sorted by path.
pub fn shipped_scenarios() -> Vec<(String, Scenario)> {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("scenarios");
    let mut out: Vec<(String, Scenario)> = std::fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .map(|p| (p.display().to_string(), Scenario::load(&p).unwrap()))
        .collect();
    assert!(out.len() >= 5, "the shipped scenarios were not found");
    out.sort_by(|a, b| a.0.cmp(&b.0));
    out
}

/// The largest |parameter| of a scenario, at least 1: the length scale random radii are drawn on.
pub fn length_scale(s: &Scenario) -> f64 {
    s.params.values().iter().fold(1.0f64, |m, p| m.max(p.abs()))
}
