//! The shop file's `settings:`: the decision rule, settle time, operator, the shop's own rules
//! and the indicator, with defaults for what is left out and a located message for a mistake.

use tiltbook::shop::{Settings, Shop, ShopSource};
use tiltbook::traveller::DecisionRule;
use tiltbook::units::{Length, Unit};

fn parse(text: &str) -> Result<Shop, String> {
    Shop::parse(text, "s.yaml", ShopSource::BuiltIn { config: None }).map_err(|e| e.to_string())
}

const FIXTURE: &str = "version: 1
fixtures:
  - id: SB5-1
    kind: sine bar
    center: 5in
    rolls: [0.75in, 0.75in]
    calibrated: 2026-01-01
    center_uncertainty: 0.00005in
    largest_stack: 4.5in
    angle_range: [0, 60]
block_sets:
  - id: B81
    catalogue: inch-81
";

#[test]
fn left_out_means_the_defaults() {
    let shop = parse(FIXTURE).unwrap();
    assert_eq!(shop.settings, Settings::default());
    assert_eq!(shop.settings.rule, DecisionRule::Simple);
    assert_eq!(
        shop.settings.indicator_resolution,
        Length::parse("0.0001", Unit::In).unwrap()
    );
}

#[test]
fn every_key_is_read() {
    let text = format!(
        "{FIXTURE}settings:
  decision_rule: guarded
  settle_minutes: 12
  operator: ' KM '
  rules: [Gloves on., '', Blocks back in the box.]
  indicator_division: 0.001mm
  indicator_repeatability: 0.0005mm
"
    );
    let s = parse(&text).unwrap().settings;
    assert_eq!(s.rule, DecisionRule::Guarded);
    assert_eq!(s.settle_minutes, 12);
    assert_eq!(s.operator.as_deref(), Some("KM"));
    assert_eq!(s.rules, ["Gloves on.", "Blocks back in the box."]);
    assert_eq!(s.indicator_resolution, Length::from_nm(1_000));
    assert_eq!(s.indicator_repeatability, Some(Length::from_nm(500)));
}

#[test]
fn mistakes_are_located_and_say_what_to_write() {
    let cases = [
        ("  decision_rule: strict\n", "s.yaml:15:", "unknown variant"),
        (
            "  settle_minutes: 600\n",
            "s.yaml:15:3:",
            "e.g. `settle_minutes: 10`",
        ),
        (
            "  operator: '  '\n",
            "s.yaml:15:3:",
            "give a name or initials",
        ),
        (
            "  indicator_division: 0.01in\n",
            "s.yaml:15:3:",
            "e.g. 0.0001in or 0.001mm",
        ),
        (
            "  indicator_division: 0.0001\n",
            "s.yaml:15:",
            "needs a unit",
        ),
        (
            "  indicator_repeatability: 0.1mm\n",
            "s.yaml:15:3:",
            "standard deviation",
        ),
        ("  colour: blue\n", "s.yaml:15:", "unknown field `colour`"),
    ];
    for (line, at, words) in cases {
        let text = format!("{FIXTURE}settings:\n{line}");
        let e = parse(&text).unwrap_err();
        assert!(e.starts_with(at) && e.contains(words), "{line:?}: {e}");
    }
}

#[test]
fn the_demo_shop_uses_the_guarded_rule_like_its_sample_jobs() {
    let s = Shop::built_in().settings;
    assert_eq!(s.rule, DecisionRule::Guarded);
    assert_eq!(s.settle_minutes, 10);
    assert!(!s.rules.is_empty());
}

#[test]
fn the_shop_listing_shows_the_settings() {
    let run = |json: bool| {
        let mut c = std::process::Command::new(env!("CARGO_BIN_EXE_tiltbook"));
        c.arg("shop").env_remove("TILTBOOK_SHOP");
        // a config folder with no shop file in it: the built-in demo shop is listed
        let dir = tempfile::tempdir().unwrap();
        c.env("XDG_CONFIG_HOME", dir.path()).env("HOME", dir.path());
        if json {
            c.arg("--json");
        }
        let out = c.output().unwrap();
        assert_eq!(out.status.code(), Some(0), "{out:?}");
        String::from_utf8_lossy(&out.stdout).into_owned()
    };
    let text = run(false);
    assert!(text.contains("decision rule: guarded"), "{text}");
    assert!(
        text.contains("division 0.00010 in (0.0025 mm), repeatability 0.00005 in (0.0013 mm)"),
        "{text}"
    );
    assert!(text.contains("rule: Blocks go back in their box"), "{text}");
    let v: serde_json::Value = serde_json::from_str(&run(true)).unwrap();
    assert_eq!(v["settings"]["decision_rule"], "guarded");
    assert_eq!(v["settings"]["settle_minutes"], 10);
}
