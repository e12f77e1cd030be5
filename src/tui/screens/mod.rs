//! One module per screen of the flow; each draws from the model only.

pub mod choose;
pub mod notice;
pub mod overview;
pub mod prompt;
pub mod readings;
pub mod remedy;
pub mod review;
pub mod review_attempt;
pub mod review_feature;
pub mod setup;
pub mod stack;
pub mod stack_info;
pub mod verdict;
pub mod verdict_views;

use ratatui::text::Span;

/// Text cut to `w` characters (with an ellipsis when cut), padded to `w`.
pub fn fit(text: &str, w: usize) -> String {
    let n = text.chars().count();
    if n <= w {
        format!("{text:<w$}")
    } else if w == 0 {
        String::new()
    } else {
        let mut s: String = text.chars().take(w - 1).collect();
        s.push('…');
        s
    }
}

/// A span of fitted text for a column: cut text keeps a space after its ellipsis, so the next
/// column never runs into it.
pub fn cell(text: &str, w: usize, style: ratatui::style::Style) -> Span<'static> {
    if text.chars().count() > w && w >= 2 {
        return Span::styled(format!("{} ", fit(text, w - 1)), style);
    }
    Span::styled(fit(text, w), style)
}

/// Arc-seconds with a sign, e.g. `+1.2"`.
pub fn arcsec(a: crate::units::Angle) -> String {
    format!("{:+.1}\"", a.arcsec())
}

/// The same angle in degrees, minutes and seconds, as tolerances are written, when it is a
/// minute or more: `= -0°04'58.5" · ` (empty below a minute).
pub fn as_minutes(a: crate::units::Angle) -> String {
    if a.arcsec().abs() < 60.0 {
        return String::new();
    }
    let s = a.dms(1);
    let s = if s.starts_with('-') {
        s
    } else {
        format!("+{s}")
    };
    format!("= {s} · ")
}

#[cfg(test)]
mod tests {
    #[test]
    fn a_minute_or_more_is_also_given_in_minutes() {
        use crate::units::Angle;
        assert_eq!(super::as_minutes(Angle::from_deg(59.9 / 3600.0)), "");
        assert_eq!(
            super::as_minutes(Angle::from_deg(-298.5 / 3600.0)),
            "= -0°04'58.5\" · "
        );
        assert_eq!(
            super::as_minutes(Angle::from_deg(618.8 / 3600.0)),
            "= +0°10'18.8\" · "
        );
    }

    #[test]
    fn fit_cuts_and_pads() {
        assert_eq!(super::fit("abc", 5), "abc  ");
        assert_eq!(super::fit("abcdef", 4), "abc…");
        assert_eq!(super::fit("abc", 0), "");
    }

    #[test]
    fn a_cut_cell_keeps_a_gap() {
        let s = ratatui::style::Style::default();
        assert_eq!(super::cell("dovetail flank", 10, s).content, "dovetail… ");
        assert_eq!(super::cell("abc", 5, s).content, "abc  ");
        assert_eq!(super::cell("abcde", 5, s).content, "abcde");
    }
}
