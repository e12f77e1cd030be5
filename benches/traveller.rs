//! Traveller benchmarks: a 300-feature job with 20 readings per feature is read from disk,
//! parsed and validated (goal under 30 ms), and saved with fsync, backup included (goal under
//! 20 ms). The figures are in docs/performance.md.

use criterion::{Criterion, black_box};
use std::path::Path;
use tiltbook::store::{self, Store};
use tiltbook::traveller::{FeatureState, Traveller, parse, validate};
use tiltbook::units::Length;

const FEATURES: usize = 300;
const READINGS: usize = 20;

/// The finished sample's job, fixtures and sets, with its first feature (a spaced sweep, judged)
/// repeated 300 times, each with its own id and 20 readings over the same travel.
fn big_job() -> Traveller {
    let p = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-finished.yaml");
    let text = std::fs::read_to_string(&p).expect("the finished sample");
    let base = parse(&text).expect("the finished sample reads").traveller;
    let template = base.features[0].clone();
    let mut t = base;
    t.signoffs.clear();
    t.events.clear();
    t.notes.clear();
    t.handovers.clear();
    t.returns.clear();
    t.features = (1..=FEATURES)
        .map(|i| {
            let mut f = template.clone();
            f.id = format!("F{i}");
            f.name = format!("flank {i}");
            f.state = FeatureState::Judged;
            for a in &mut f.attempts {
                if let Some(s) = &mut a.sweep {
                    s.points = Some(READINGS as u32);
                    s.readings = (0..READINGS)
                        .map(|k| Length::inches(((k * 2 + i % 3) / 10) as f64 * 0.0001))
                        .collect();
                }
            }
            f
        })
        .collect();
    t
}

fn bench(c: &mut Criterion) {
    let job = big_job();
    let dir = tempfile::tempdir().expect("a temporary folder");
    let path = dir.path().join("big.yaml");
    let mut store = Store::create(&path, &job, "KM").expect("saved");
    let size = std::fs::metadata(&path).map_or(0, |m| m.len());
    let loaded = store::load(&path).expect("reads back");
    let readings: usize = loaded
        .traveller
        .features
        .iter()
        .flat_map(|f| &f.attempts)
        .filter_map(|a| a.sweep.as_ref())
        .map(|s| s.readings.len())
        .sum();
    println!(
        "traveller: {} features, {readings} readings, {size} bytes, {} problems found",
        loaded.traveller.features.len(),
        validate(&loaded.traveller, &loaded.locator).len()
    );

    let mut g = c.benchmark_group("traveller");
    g.bench_function("load_300_features", |b| {
        b.iter(|| store::load(black_box(&path)).expect("reads"))
    });
    g.bench_function("load_and_validate_300_features", |b| {
        b.iter(|| {
            let l = store::load(black_box(&path)).expect("reads");
            validate(&l.traveller, &l.locator)
        })
    });
    g.bench_function("save_fsync_300_features", |b| {
        b.iter(|| store.save_confirmed(black_box(&job)).expect("saves"))
    });
    g.finish();
}

fn main() {
    let mut c = Criterion::default().configure_from_args();
    bench(&mut c);
    c.final_summary();
}
