//! Reports: every format carries the same facts; flags show; HTML is standalone and escaped.

use std::path::Path;
use tiltbook::traveller::report::{Flag, Format, flags, render};
use tiltbook::traveller::*;
use tiltbook::units::{Angle, Tolerance};

fn finished() -> Traveller {
    let p = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-finished.yaml");
    parse(&std::fs::read_to_string(p).unwrap())
        .unwrap()
        .traveller
}

#[test]
fn flags_of_the_finished_sample() {
    let t = finished();
    let f = |id: &str| flags(&t, t.feature(id).unwrap());
    assert!(f("F1").is_empty());
    // every item of the demo shop was in calibration on 23 November 2026
    assert!(f("F2").is_empty(), "{:?}", f("F2"));
    assert_eq!(f("F3"), vec![Flag::SwappedByHand]);
    assert_eq!(f("F4"), vec![Flag::DoubtBand]);
    assert_eq!(f("F5"), vec![Flag::SwappedByHand, Flag::LargeStraightness]);
    assert!(f("F6").is_empty(), "{:?}", f("F6"));
    assert!(f("F7").is_empty(), "{:?}", f("F7"));
}

#[test]
fn a_fixture_used_past_its_due_date_is_flagged_in_the_report() {
    // the same job with the centres' due date moved to 1 November 2026, before F2 was set on
    // them; the record F2 was signed on has changed, and that is flagged too
    let mut t = finished();
    let fx = t.fixtures.iter_mut().find(|f| f.id == "SC5-310").unwrap();
    fx.due = Some("2026-11-01".parse().unwrap());
    let f2 = flags(&t, t.feature("F2").unwrap());
    assert_eq!(
        f2,
        vec![
            Flag::CalibrationOutOfDate("fixture SC5-310 (due 2026-11-01)".into()),
            Flag::ChangedAfterSignOff(vec!["fixture".into()])
        ]
    );
    let text = render(&t, Format::Text);
    assert!(
        text.contains("calibration out of date: fixture SC5-310 (due 2026-11-01)"),
        "{text}"
    );
}

#[test]
fn a_change_after_sign_off_is_flagged_in_the_report() {
    let mut t = finished();
    t.feature_mut("F1").unwrap().tolerance = Tolerance::symmetric(Angle::from_deg(0.2));
    assert_eq!(
        flags(&t, t.feature("F1").unwrap()),
        vec![Flag::ChangedAfterSignOff(vec!["tolerance".into()])]
    );
    let text = render(&t, Format::Text);
    assert!(text.contains("changed after sign-off: tolerance"), "{text}");
}

#[test]
fn each_format_carries_the_feature_facts() {
    let t = finished();
    for fmt in [Format::Text, Format::Markdown, Format::Html] {
        let r = render(&t, fmt);
        // read the facts back as a person sees them
        let r = match fmt {
            Format::Html => r
                .replace("&quot;", "\"")
                .replace("&#39;", "'")
                .replace("&lt;", "<")
                .replace("&gt;", ">")
                .replace("&amp;", "&"),
            Format::Markdown => r.replace('\\', ""),
            Format::Text => r,
        };
        for want in [
            "J-2417",
            "15°30'00.0\"", // F3 nominal
            "0.0500(p) + 1.0000 + 0.1360 + 0.1002 + 0.0500(p) = 1.3362 in", // F3 stack
            "-1112.1\"",    // F3 attempt 1 deviation
            "1.3372 in",    // F3 attempt 1, 0.137 for 0.136
            "A 30°00' / B 20°00' (true slope 34°19')", // F4, both views
            "1.0000 + 0.3000 + 0.1030 + 0.1001 = 1.5031 in", // F4 other plate
            "View B",
            "over both views",
            "included angle 2°51'51.1\"", // F2: 2·atan(1/40), tapers.csv
            "on the included angle",
            "FAIL",
            "DOUBT",
            "stack swapped by hand",
            "inside the doubt band",
            "large straightness",
            "TJ, 2026-11-23 17:16",
            // F6 on the 5 in bar (stack-heights.csv row 5in,in,60: 4.33013 in, ×5.00002/5)
            "0.0500(p) + 4.0000 + 0.1300 + 0.1001 + 0.0500(p) = 4.3301 in",
            // F7 on the 10 in plate, protectors left off (10·sin 1°10' + 0.00002 in rolls)
            "0.1030 + 0.1006 = 0.2036 in",
            "SP10-042",
            "7 of 7 features finished",
        ] {
            assert!(r.contains(want), "{fmt:?} lacks {want}:\n{r}");
        }
    }
}

#[test]
fn html_is_standalone_and_prints_on_a4_and_letter() {
    let h = render(&finished(), Format::Html);
    assert!(h.starts_with("<!DOCTYPE html>"));
    assert!(h.contains("@page") && h.contains("@media print"));
    // no page size is forced, so both A4 and Letter use their own
    assert!(!h.contains("size: A4") && !h.contains("size: letter"));
    for external in ["<link", "<script", "src=", "href=", "@import", "url("] {
        assert!(!h.contains(external), "external asset: {external}");
    }
    assert_eq!(
        h.matches("<section>").count(),
        h.matches("</section>").count()
    );
}

#[test]
fn html_and_markdown_escape_what_people_typed() {
    let mut t = finished();
    t.job.part = "<script>alert('x')</script> & \"slide\"".into();
    t.feature_mut("F1").unwrap().name = "flank | *not bold*".into();
    let h = render(&t, Format::Html);
    assert!(!h.contains("<script>"), "unescaped");
    assert!(h.contains("&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; &quot;slide&quot;"));
    let m = render(&t, Format::Markdown);
    assert!(m.contains("flank \\| \\*not bold\\*"), "{m}");
}

#[test]
fn a_plan_reports_with_nothing_done() {
    let p = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-plan.yaml");
    let t = parse(&std::fs::read_to_string(p).unwrap())
        .unwrap()
        .traveller;
    let r = render(&t, Format::Text);
    assert!(r.contains("0 of 7 features finished"), "{r}");
    assert!(r.contains("taper 1:20"), "{r}");
}
