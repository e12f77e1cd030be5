//! Whatever people type into the free-text fields (names, notes, reasons, ids) must save as YAML
//! that reads back to the same job: release builds save without reading each file back (see
//! docs/performance.md), so this is where that guarantee is checked. The awkward strings are
//! YAML 1.2's own special forms (§7.3 plain scalars and indicators, §10.3 core schema: `null`,
//! `true`, numbers), which a writer must quote to keep them text.

use proptest::prelude::*;
use tiltbook::traveller::*;
use tiltbook::units::{Angle, Tolerance};

/// Strings that look like YAML syntax or other types, mixed with any text.
fn awkward() -> impl Strategy<Value = String> {
    prop_oneof![
        Just(String::new()),
        Just("null".to_string()),
        Just("~".to_string()),
        Just("yes".to_string()),
        Just("NO".to_string()),
        Just("true".to_string()),
        Just("0x1F".to_string()),
        Just("1e3".to_string()),
        Just("1_000".to_string()),
        Just(".inf".to_string()),
        Just("- item".to_string()),
        Just("key: value".to_string()),
        Just("# not a comment".to_string()),
        Just("&anchor".to_string()),
        Just("*alias".to_string()),
        Just("!tag".to_string()),
        Just("|".to_string()),
        Just(">".to_string()),
        Just("'single'".to_string()),
        Just("\"double\"".to_string()),
        Just("  leading and trailing  ".to_string()),
        Just("line one\nline two\n".to_string()),
        Just("tab\there".to_string()),
        Just("{a: 1}".to_string()),
        Just("[1, 2]".to_string()),
        Just("30°00'00\"".to_string()),
        Just("±0°05'".to_string()),
        Just("---".to_string()),
        Just("...".to_string()),
        Just("%YAML 1.2".to_string()),
        Just("@at".to_string()),
        Just("`tick`".to_string()),
        Just("\u{feff}bom".to_string()),
        Just("carriage\rreturn".to_string()),
        Just("line\u{2028}separator\nand a break".to_string()),
        Just("paragraph\u{2029}separator".to_string()),
        Just("next\u{85}line".to_string()),
        Just("crlf\r\nline".to_string()),
        "\\PC{0,40}",
        any::<String>(),
    ]
}

fn job_with(texts: &[String]) -> Traveller {
    let job = Job {
        id: "J-1".into(),
        part: texts[0].clone(),
        quantity: 1,
        ..Job::default()
    };
    let mut f = Feature::plain(
        "F1",
        &texts[1],
        Angle::from_deg(30.0),
        Tolerance::symmetric(Angle::from_deg(5.0 / 60.0)),
    );
    f.description = texts[2].clone();
    let mut t = Traveller::plan(job, vec![f]);
    let at: Stamp = "2026-12-01T08:00:00+00:00".parse().expect("a stamp");
    t.notes.push(Note {
        text: texts[3].clone(),
        feature: Some("F1".into()),
        by: texts[4].clone(),
        at,
    });
    t.handovers.push(Handover {
        text: texts[5].clone(),
        by: "KM".into(),
        at,
        read_by: Vec::new(),
    });
    t
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    #[test]
    fn any_text_saves_and_reads_back_the_same(texts in proptest::collection::vec(awkward(), 6)) {
        let t = job_with(&texts);
        let y = to_yaml(&t).expect("renders");
        let back = parse(&y).map_err(|e| TestCaseError::fail(format!("{e}\n{y}")))?.traveller;
        prop_assert_eq!(&back, &t);
        // and saving again gives the same bytes
        prop_assert_eq!(to_yaml(&back).expect("renders"), y);
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(40))]

    /// A big job is written in pieces side by side; the pieces must give exactly the bytes of
    /// writing it in one pass, whatever the text in it.
    #[test]
    fn a_big_job_written_in_pieces_is_the_same_bytes(
        texts in proptest::collection::vec(awkward(), 6),
        names in proptest::collection::vec(awkward(), 50),
    ) {
        let mut t = job_with(&texts);
        let first = t.features[0].clone();
        t.features = names
            .iter()
            .enumerate()
            .map(|(k, name)| {
                let mut f = first.clone();
                f.id = format!("F{}", k + 1);
                f.name = name.clone();
                f.description = texts[k % texts.len()].clone();
                f
            })
            .collect();
        let y = to_yaml(&t).expect("renders");
        prop_assert_eq!(&y, &serde_yaml::to_string(&t).expect("renders in one pass"));
        let back = parse(&y).map_err(|e| TestCaseError::fail(format!("{e}\n{y}")))?.traveller;
        prop_assert_eq!(&back, &t);
    }
}
