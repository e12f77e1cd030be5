//! Shared by the screen tests: an app on the demo plan and the built-in demo shop, with no
//! terminal and no file (the runner counts saves instead of writing).
#![allow(dead_code)]

use tiltbook::cli::demo::DEMO_PLAN;
use tiltbook::shop::Shop;
use tiltbook::traveller::{self, Traveller};
use tiltbook::tui::app::{App, Msg, Options};
use tiltbook::tui::keymap::{Action, Input};
use tiltbook::tui::shop_view::ShopView;
use tiltbook::tui::{Runner, update};

/// The fixed "today" of the tests: every demo calibration is in date.
pub fn today() -> jiff::civil::Date {
    jiff::civil::date(2026, 12, 1)
}

pub fn plan() -> Traveller {
    traveller::parse(DEMO_PLAN)
        .expect("demo plan reads")
        .traveller
}

pub fn shop() -> ShopView {
    ShopView::from_shop(&Shop::built_in())
}

/// An app and its runner, landed as `open` lands them.
pub fn app_with(doc: Traveller, operator: Option<&str>, read_only: bool) -> (App, Runner) {
    opened(doc, operator, read_only, false)
}

/// An app opened for the lead's review (`--review`), landed.
pub fn review_app(doc: Traveller, lead: Option<&str>, read_only: bool) -> (App, Runner) {
    opened(doc, lead, read_only, true)
}

/// A sample job from sample-jobs/ (read only; tests never write there).
pub fn sample(name: &str) -> Traveller {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("sample-jobs")
        .join(name);
    let text = std::fs::read_to_string(&path).expect("the sample job reads");
    traveller::parse(&text)
        .expect("the sample job parses")
        .traveller
}

/// Put every time stamped by the test run (from 30 November 2026, after the sample jobs' own
/// stamps of 23-24 November 2026) at one fixed time, so screens that show
/// when something was signed or returned can be compared with a snapshot.
pub fn fix_times(t: &mut Traveller) {
    use tiltbook::traveller::Stamp;
    let cut = Stamp::parse("2026-11-30T00:00:00Z").unwrap();
    let fixed = Stamp::parse("2026-12-01T10:30:00-05:00").unwrap();
    let f = |s: &mut Stamp| {
        if s.timestamp() > cut.timestamp() {
            *s = fixed;
        }
    };
    t.signoffs.iter_mut().for_each(|s| f(&mut s.at));
    t.returns.iter_mut().for_each(|r| f(&mut r.at));
    t.events.iter_mut().for_each(|e| f(&mut e.at));
    for h in &mut t.handovers {
        f(&mut h.at);
        h.read_by.iter_mut().for_each(|m| f(&mut m.at));
    }
}

fn opened(doc: Traveller, operator: Option<&str>, read_only: bool, review: bool) -> (App, Runner) {
    let opts = Options {
        read_only,
        color: false,
        operator: operator.map(str::to_string),
        file_label: "jobs/J-2417.yaml".into(),
        today: today(),
        review,
    };
    let mut app = App::new(doc, shop(), opts);
    let mut runner = Runner::new(None, shop());
    update::update(&mut app, Msg::Resize(80, 24));
    let first = update::land(&mut app);
    runner.drain(&mut app, first);
    (app, runner)
}

pub fn app() -> (App, Runner) {
    app_with(plan(), Some("JQ"), false)
}

/// Send one input and run what it asks for.
pub fn send(app: &mut App, runner: &mut Runner, input: Input) {
    let effects = update::update(app, Msg::Key(input));
    runner.drain(app, effects);
}

pub fn act(app: &mut App, runner: &mut Runner, a: Action) {
    send(app, runner, Input::Act(a));
}

pub fn enter(app: &mut App, runner: &mut Runner) {
    act(app, runner, Action::Forward);
}

pub fn esc(app: &mut App, runner: &mut Runner) {
    act(app, runner, Action::Back);
}

pub fn typ(app: &mut App, runner: &mut Runner, text: &str) {
    for c in text.chars() {
        send(app, runner, Input::Typed(c));
    }
}

pub fn clear_field(app: &mut App, runner: &mut Runner) {
    for _ in 0..40 {
        send(app, runner, Input::Erase);
    }
}

/// From the overview of a fresh plan: open F1, take the first fixture and set.
pub fn to_stack(app: &mut App, runner: &mut Runner) {
    enter(app, runner); // open F1
    enter(app, runner); // first ranked fixture
    enter(app, runner); // first set: the stack is solved
}

/// Tick every block and confirm the stack.
pub fn build_stack(app: &mut App, runner: &mut Runner) {
    let n = app
        .attempt()
        .and_then(|a| a.stack.as_ref())
        .map_or(0, |s| s.blocks.len());
    for _ in 0..n {
        act(app, runner, Action::Tick);
    }
    enter(app, runner);
}

/// From the overview to the readings of F1 (stack built, cautions confirmed, wait skipped).
pub fn to_readings(app: &mut App, runner: &mut Runner) {
    to_stack(app, runner);
    build_stack(app, runner);
    enter(app, runner); // safety confirmed
    act(app, runner, Action::Skip);
    enter(app, runner); // to readings
}

/// Type the travel, the count and each reading, with Enter after each.
pub fn readings(app: &mut App, runner: &mut Runner, travel: &str, values: &[&str]) {
    typ(app, runner, travel);
    enter(app, runner);
    typ(app, runner, &values.len().to_string());
    enter(app, runner);
    for v in values {
        typ(app, runner, v);
        enter(app, runner);
    }
}

/// The step on screen, when in a feature's flow.
pub fn step(app: &App) -> Option<tiltbook::traveller::Step> {
    app.flow().map(|(_, s)| s)
}

/// How many events of a kind the log holds.
pub fn events(app: &App, kind: tiltbook::traveller::EventKind) -> usize {
    app.doc.events.iter().filter(|e| e.kind == kind).count()
}

/// The traveller as saved must read back clean, or it could not be opened again.
pub fn assert_reopens(app: &App) {
    let text = traveller::to_yaml(&app.doc).expect("the job renders");
    let loaded = traveller::parse(&text).expect("the saved job reads back");
    let problems = traveller::validate(&loaded.traveller, &loaded.locator);
    assert!(
        problems.is_empty(),
        "the saved job has problems: {problems:#?}\n{text}"
    );
}

/// From the overview of a fresh plan: open the feature at `index` (0 = F1), take the first
/// ranked fixture and set.
pub fn to_stack_of(app: &mut App, runner: &mut Runner, index: usize) {
    for _ in 0..index {
        act(app, runner, Action::Down);
    }
    to_stack(app, runner);
}

/// Tick every block of every stack of the attempt, then confirm.
pub fn build_all(app: &mut App, runner: &mut Runner) {
    let n = app
        .attempt()
        .map_or(0, tiltbook::tui::flow::stack::block_count);
    app.ui.stack_sel = 0;
    for _ in 0..n {
        act(app, runner, Action::Tick);
    }
    enter(app, runner);
}

/// From a confirmed stack to the readings: cautions confirmed, the wait skipped.
pub fn stack_to_readings(app: &mut App, runner: &mut Runner) {
    build_all(app, runner);
    enter(app, runner); // safety confirmed
    act(app, runner, Action::Skip);
    enter(app, runner); // to readings
}

/// A one-feature plan with a small angle (0°30', ±0°01').
pub fn small_angle_plan() -> Traveller {
    use tiltbook::traveller::{Feature, Job};
    use tiltbook::units::{Angle, Tolerance, Unit};
    let job = Job {
        id: "J-9001".into(),
        part: "TP-7 test plate".into(),
        quantity: 1,
        unit: Unit::In,
        ..Job::default()
    };
    Traveller::plan(
        job,
        vec![Feature::plain(
            "F1",
            "shallow ramp",
            Angle::from_deg(0.5),
            Tolerance::symmetric(Angle::from_deg(1.0 / 60.0)),
        )],
    )
}

/// Open F1 of `doc`, choose the fixture `id` and the first set.
pub fn to_stack_on(app: &mut App, runner: &mut Runner, id: &str) {
    enter(app, runner); // open F1
    let i = app
        .ui
        .fixtures
        .iter()
        .position(|o| app.shop.fixtures[o.index].id == id)
        .expect("the fixture is offered");
    app.ui.fixture_sel = i;
    enter(app, runner);
    enter(app, runner); // first set
}
