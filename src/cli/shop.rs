//! `tiltbook shop`: list the shop's fixtures and block sets, or write a starting shop file.

use super::{CliError, emit};
use crate::blocks::{BlockSet, Condition};
use crate::shop::{ENV_VAR, Fixture, Shop, ShopError, ShopSource, write_template};
use crate::traveller::DecisionRule;
use crate::units::{Length, Unit};
use clap::Args;
use serde_json::{Value, json};
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

#[derive(Debug, Args)]
#[command(after_help = "Examples:\n  \
tiltbook shop\n  \
tiltbook shop --json\n  \
tiltbook shop --init\n  \
tiltbook shop --init --shop ./cell-4-shop.yaml\n\n\
The shop file is read from --shop FILE, else the file named by TILTBOOK_SHOP, else shop.yaml \
in the configuration folder; with none of these, tiltbook uses a built-in demo shop.")]
pub struct ShopArgs {
    /// Write an editable starting shop file (never overwrites an existing one)
    #[arg(long)]
    pub init: bool,
    /// The shop file to list or write instead of the usual one
    #[arg(long, value_name = "FILE")]
    pub shop: Option<PathBuf>,
    /// Print JSON instead of text
    #[arg(long, conflicts_with = "init")]
    pub json: bool,
}

fn shop_error(e: ShopError) -> CliError {
    match e {
        ShopError::Read { .. } | ShopError::Write { .. } => CliError::Io(e.to_string()),
        _ => CliError::Usage(e.to_string()),
    }
}

fn num(l: Length, unit: Unit) -> String {
    l.exact_number(unit, unit.places())
}

fn sizes(set: &BlockSet, c: Condition) -> Vec<String> {
    set.sizes_in(c).iter().map(|l| set.number(*l)).collect()
}

pub fn run(args: &ShopArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let source = ShopSource::locate(args.shop.as_deref());
    if args.init {
        let target = source
            .init_target()
            .map(PathBuf::from)
            .ok_or_else(|| shop_error(ShopError::NoConfigFolder))?;
        write_template(&target).map_err(shop_error)?;
        emit(
            out,
            &format!(
                "Wrote a starting shop file to {}.\nEdit it in a text editor: replace the invented demo fixtures and block sets with your own \
(the notes at its top explain each key); `tiltbook shop` then lists them.\n",
                target.display()
            ),
        )?;
        return Ok(ExitCode::SUCCESS);
    }
    let shop = Shop::load_from(source).map_err(shop_error)?;
    let today = jiff::Zoned::now().date();
    if args.json {
        emit(out, &format!("{:#}\n", to_json(&shop, today)))?;
    } else {
        emit(out, &to_text(&shop, today))?;
    }
    Ok(ExitCode::SUCCESS)
}

fn source_json(s: &ShopSource) -> (&'static str, Option<String>) {
    match s {
        ShopSource::Option(p) => ("option", Some(p.display().to_string())),
        ShopSource::Env(p) => ("env", Some(p.display().to_string())),
        ShopSource::Config(p) => ("config", Some(p.display().to_string())),
        ShopSource::BuiltIn { .. } => ("built-in", None),
    }
}

fn fixture_json(f: &Fixture, today: jiff::civil::Date) -> Value {
    let u = f.unit;
    json!({
        "id": f.id,
        "kind": f.kind.words(),
        "unit": u.symbol(),
        "center": num(f.center, u),
        "pivot_roll": num(f.pivot_roll, u),
        "raised_roll": num(f.raised_roll, u),
        "calibrated": f.calibrated.to_string(),
        "calibration_due": f.calibration_due.map(|d| d.to_string()),
        "calibration_overdue": f.calibration_overdue(today),
        "center_uncertainty": num(f.center_uncertainty, u),
        "largest_stack": num(f.largest_stack, u),
        "angle_range_deg": [f.angle_range.0.deg(), f.angle_range.1.deg()],
        "note": f.note,
    })
}

fn set_json(s: &BlockSet, today: jiff::civil::Date) -> Value {
    json!({
        "id": s.id,
        "catalogue": s.catalogue,
        "unit": s.unit.symbol(),
        "grade": s.grade.map(|g| g.to_string()),
        "calibration_due": s.calibration_due.map(|d| d.to_string()),
        "calibration_overdue": s.calibration_due.is_some_and(|d| d < today),
        "resolution": s.number(s.resolution()),
        "block_count": s.blocks.len(),
        "usable_count": s.usable_count(),
        "missing": sizes(s, Condition::Missing),
        "damaged": sizes(s, Condition::Damaged),
        "worn": sizes(s, Condition::Worn),
        "protectors": s.protectors.map(|p| s.number(p.size)),
        "material": s.material,
        "note": s.note,
    })
}

fn to_json(shop: &Shop, today: jiff::civil::Date) -> Value {
    let (kind, path) = source_json(&shop.source);
    let config = match &shop.source {
        ShopSource::BuiltIn { config } => config.clone(),
        _ => crate::shop::config_file(),
    };
    json!({
        "source": kind,
        "path": path,
        "config_file": config.map(|p| p.display().to_string()),
        "fixtures": shop.fixtures.iter().map(|f| fixture_json(f, today)).collect::<Vec<_>>(),
        "block_sets": shop.block_sets.iter().map(|s| set_json(s, today)).collect::<Vec<_>>(),
        "settings": settings_json(&shop.settings),
    })
}

/// A small length in both units: `0.00010 in (0.0025 mm)`.
fn both_units(l: Length) -> String {
    format!("{} ({})", l.show_fine(Unit::In), l.show_fine(Unit::Mm))
}

fn rule_words(r: DecisionRule) -> &'static str {
    match r {
        DecisionRule::Simple => "simple (pass when |deviation| <= tolerance)",
        DecisionRule::Guarded => "guarded (pass when |deviation| + U <= tolerance)",
    }
}

fn settings_json(s: &crate::shop::Settings) -> Value {
    json!({
        "decision_rule": match s.rule {
            DecisionRule::Simple => "simple",
            DecisionRule::Guarded => "guarded",
        },
        "settle_minutes": s.settle_minutes,
        "operator": s.operator,
        "rules": s.rules,
        "indicator_division_in": s.indicator_resolution.number(Unit::In, 6),
        "indicator_repeatability_in": s.indicator_repeatability.map(|r| r.number(Unit::In, 6)),
    })
}

/// Past its due date (usable through the due date itself).
fn due(d: Option<jiff::civil::Date>, today: jiff::civil::Date) -> String {
    match d {
        Some(d) if d < today => format!("due {d} (overdue)"),
        Some(d) => format!("due {d}"),
        None => "due date not given".into(),
    }
}

fn to_text(shop: &Shop, today: jiff::civil::Date) -> String {
    let mut t = match &shop.source {
        ShopSource::BuiltIn { config } => {
            let at = config
                .as_ref()
                .map(|p| format!(" at {}", p.display()))
                .unwrap_or_default();
            format!(
                "Shop: the built-in demo shop (invented equipment). There is no shop file{at};\n\
                 write one with `tiltbook shop --init`, or name one with --shop FILE or {ENV_VAR}.\n"
            )
        }
        s => format!("Shop: {s}\n"),
    };
    t.push_str(&format!("\nFixtures ({}):\n", shop.fixtures.len()));
    for f in &shop.fixtures {
        let u = f.unit;
        t.push_str(&format!(
            "  {}  {}, centre distance {} {u}, rolls {} / {} {u}\n",
            f.id,
            f.kind,
            num(f.center, u),
            num(f.pivot_roll, u),
            num(f.raised_roll, u)
        ));
        t.push_str(&format!(
            "      calibrated {}, {}; standard uncertainty {} {u}\n",
            f.calibrated,
            due(f.calibration_due, today),
            num(f.center_uncertainty, u),
        ));
        t.push_str(&format!(
            "      stacks up to {} {u}; rated {} to {}\n",
            num(f.largest_stack, u),
            f.angle_range.0.dm(),
            f.angle_range.1.dm()
        ));
        if let Some(n) = &f.note {
            t.push_str(&format!("      note: {n}\n"));
        }
    }
    t.push_str(&format!("\nBlock sets ({}):\n", shop.block_sets.len()));
    for s in &shop.block_sets {
        let from = s.catalogue.as_deref().unwrap_or("own list");
        let grade = s
            .grade
            .map(|g| g.to_string())
            .unwrap_or("grade not given".into());
        t.push_str(&format!(
            "  {}  {from}, {} blocks ({} usable), {grade}\n      calibration {}\n",
            s.id,
            s.blocks.len(),
            s.usable_count(),
            due(s.calibration_due, today)
        ));
        let mut parts = Vec::new();
        for (word, c) in [
            ("missing", Condition::Missing),
            ("damaged", Condition::Damaged),
            ("worn", Condition::Worn),
        ] {
            let v = sizes(s, c);
            if !v.is_empty() {
                parts.push(format!("{word} {} {}", v.join(", "), s.unit));
            }
        }
        if let Some(p) = s.protectors {
            parts.push(format!("protectors 2 × {}", s.show(p.size)));
        }
        if let Some(m) = &s.material {
            parts.push(m.clone());
        }
        if parts.is_empty() {
            parts.push("every block present and good".into());
        }
        t.push_str(&format!("      {}\n", parts.join("; ")));
        if let Some(n) = &s.note {
            t.push_str(&format!("      note: {n}\n"));
        }
    }
    let st = &shop.settings;
    t.push_str(&format!(
        "\nSettings:\n  decision rule: {}\n  stacks settle {} min before the readings\n  indicator: division {}, repeatability {}\n  operator: {}\n",
        rule_words(st.rule),
        st.settle_minutes,
        both_units(st.indicator_resolution),
        st.indicator_repeatability
            .map_or("not given (left out of U)".into(), both_units),
        st.operator.as_deref().unwrap_or("asked once at the terminal"),
    ));
    for r in &st.rules {
        t.push_str(&format!("  rule: {r}\n"));
    }
    t.push_str(
        "\nStandard sets for --set: inch-81, metric-88, metric-112 (complete, nothing missing).\n",
    );
    t
}
