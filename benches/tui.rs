//! Screen benchmarks: one frame of a 300-feature job at 200×60 on ratatui's TestBackend, and
//! launch to the first frame (read the file, parse, validate, build the app, land, draw).
//!
//! Goals: one frame under 2 ms; launch to first frame under 50 ms. The 300-feature job is the
//! seven features of sample-jobs/ds-204-plan.yaml repeated in order with new ids (F1…F300):
//! 42 full copies and F1–F6 once more.
//! Figures in docs/performance.md ("Screens: one frame and launch").

use criterion::{Criterion, black_box};
use ratatui::Terminal;
use ratatui::backend::TestBackend;
use std::path::Path;
use tiltbook::shop::Shop;
use tiltbook::store;
use tiltbook::traveller::{self, Traveller};
use tiltbook::tui::app::{App, Msg, Options};
use tiltbook::tui::keymap::{Action, Input};
use tiltbook::tui::shop_view::ShopView;
use tiltbook::tui::{Runner, update, view};

const W: u16 = 200;
const H: u16 = 60;

/// The plan's features repeated in order, with new ids, until there are exactly `n`.
fn big_job(n: usize) -> Traveller {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-plan.yaml");
    let text = std::fs::read_to_string(path).expect("the sample plan reads");
    let mut t = traveller::parse(&text).expect("the plan parses").traveller;
    let base = t.features.clone();
    t.features = (0..n)
        .map(|i| {
            let mut f = base[i % base.len()].clone();
            f.id = format!("F{}", i + 1);
            f
        })
        .collect();
    t
}

fn options() -> Options {
    Options {
        read_only: false,
        color: true,
        operator: Some("KM".into()),
        file_label: "jobs/J-2417.yaml".into(),
        today: jiff::civil::date(2026, 12, 1),
        review: false,
    }
}

/// Open a job as `tiltbook open` does (no lock: the file is only read), land and draw once.
fn launch(path: &Path, shop: &ShopView, term: &mut Terminal<TestBackend>) -> App {
    let loaded = store::load(path).expect("the job reads");
    let problems = traveller::validate(&loaded.traveller, &loaded.locator);
    assert!(problems.is_empty(), "{problems:#?}");
    let mut app = App::new(loaded.traveller, shop.clone(), options());
    let mut runner = Runner::new(None, shop.clone());
    update::update(&mut app, Msg::Resize(W, H));
    let first = update::land(&mut app);
    runner.drain(&mut app, first);
    term.draw(|f| view::draw(f, &app)).expect("a frame");
    app
}

fn benches(c: &mut Criterion) {
    let shop = ShopView::from_shop(&Shop::built_in());
    let job = big_job(300);
    assert_eq!(job.features.len(), 300, "the big job has 300 features");
    let dir = tempfile::tempdir().expect("a temporary folder");
    let path = dir.path().join("J-2417-300.yaml");
    let yaml = traveller::to_yaml(&job).expect("the job renders");
    std::fs::write(&path, &yaml).expect("the job is written");
    println!(
        "300-feature job: {} bytes of YAML, {} features",
        yaml.len(),
        job.features.len()
    );

    let mut term = Terminal::new(TestBackend::new(W, H)).expect("a test terminal");
    let mut app = launch(&path, &shop, &mut term);
    let mut g = c.benchmark_group("screens");
    g.bench_function("one frame, overview, 300 features, 200x60", |b| {
        b.iter(|| {
            term.draw(|f| view::draw(f, black_box(&app)))
                .expect("a frame");
        });
    });
    // the last feature selected: the list is scrolled to its end
    let mut runner = Runner::new(None, shop.clone());
    for _ in 0..299 {
        let e = update::update(&mut app, Msg::Key(Input::Act(Action::Down)));
        runner.drain(&mut app, e);
    }
    g.bench_function("one frame, overview scrolled to F300, 200x60", |b| {
        b.iter(|| {
            term.draw(|f| view::draw(f, black_box(&app)))
                .expect("a frame");
        });
    });
    // F300 opened: the fixture choice of a feature of the big job
    let e = update::update(&mut app, Msg::Key(Input::Act(Action::Forward)));
    runner.drain(&mut app, e);
    g.bench_function("one frame, F300 fixture choice, 200x60", |b| {
        b.iter(|| {
            term.draw(|f| view::draw(f, black_box(&app)))
                .expect("a frame");
        });
    });
    g.bench_function("launch to first frame, 300 features, 200x60", |b| {
        b.iter(|| {
            let mut term = Terminal::new(TestBackend::new(W, H)).expect("a test terminal");
            black_box(launch(&path, &shop, &mut term));
        });
    });
    let plan = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-half-done.yaml");
    g.bench_function(
        "launch to first frame, ds-204-half-done.yaml, 200x60",
        |b| {
            b.iter(|| {
                let mut term = Terminal::new(TestBackend::new(W, H)).expect("a test terminal");
                black_box(launch(&plan, &shop, &mut term));
            });
        },
    );
    g.finish();
}

fn main() {
    let mut c = Criterion::default().configure_from_args();
    benches(&mut c);
    c.final_summary();
}
