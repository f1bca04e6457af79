//! Closed forms of every shipped scenario: exact algebra (static state) and rendering as text and LaTeX.
//! Run with `cargo bench --bench closed_form`; never part of the test run.

use criterion::{criterion_group, criterion_main, Criterion};
use junctura::export::closed::LatexLayout;
use junctura::export::latex::closed as latex;
use junctura::export::text::closed as text;
use junctura::junction::closed::{closed_forms, ClosedState};
use junctura::scenario::Scenario;

fn shipped() -> Vec<Scenario> {
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/scenarios");
    let mut files: Vec<_> = std::fs::read_dir(dir)
        .unwrap()
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|e| e == "toml"))
        .collect();
    files.sort();
    files.iter().map(|p| Scenario::load(p).unwrap()).collect()
}

fn bench(c: &mut Criterion) {
    let all = shipped();
    c.bench_function("closed forms of all shipped scenarios (static, text + LaTeX)", |b| {
        b.iter(|| {
            let mut bytes = 0;
            for s in &all {
                let cf = closed_forms(s, ClosedState::Static).unwrap();
                bytes += text(&cf, &s.symbols, "").len();
                bytes += latex(&cf, &s.symbols, &LatexLayout::default(), "").len();
            }
            bytes
        })
    });
    c.bench_function("closed forms of all shipped scenarios (moving state)", |b| {
        b.iter(|| all.iter().map(|s| closed_forms(s, ClosedState::Moving).unwrap().quantities.len()).sum::<usize>())
    });
}

criterion_group! {
    name = benches;
    config = Criterion::default().sample_size(10);
    targets = bench
}
criterion_main!(benches);
