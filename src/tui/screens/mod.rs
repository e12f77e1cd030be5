//! One module per screen of the flow; each draws from the model only.

pub mod choose;
pub mod notice;
pub mod overview;
pub mod prompt;
pub mod readings;
pub mod review;
pub mod review_feature;
pub mod setup;
pub mod stack;
pub mod verdict;

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

/// A span of fitted text.
pub fn cell(text: &str, w: usize, style: ratatui::style::Style) -> Span<'static> {
    Span::styled(fit(text, w), style)
}

/// Arc-seconds with a sign, e.g. `+1.2"`.
pub fn arcsec(a: crate::units::Angle) -> String {
    format!("{:+.1}\"", a.arcsec())
}

#[cfg(test)]
mod tests {
    #[test]
    fn fit_cuts_and_pads() {
        assert_eq!(super::fit("abc", 5), "abc  ");
        assert_eq!(super::fit("abcdef", 4), "abc…");
        assert_eq!(super::fit("abc", 0), "");
    }
}
