//! Colours that survive: the 16 named ANSI colours and `Reset`, modifiers that carry the meaning
//! on their own (selection is reverse video plus a marker), and no colour at all under `NO_COLOR`
//! or `--color never`.

use ratatui::style::{Color, Modifier, Style};

/// The `--color` choice.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum ColorChoice {
    /// Colour unless `NO_COLOR` is set (to anything but an empty string).
    #[default]
    Auto,
    Always,
    Never,
}

impl ColorChoice {
    /// Parse `auto`, `always` or `never`.
    pub fn parse(text: &str) -> Result<Self, String> {
        match text.trim().to_ascii_lowercase().as_str() {
            "auto" => Ok(ColorChoice::Auto),
            "always" => Ok(ColorChoice::Always),
            "never" => Ok(ColorChoice::Never),
            other => Err(format!(
                "--color '{other}' is not a choice; type --color auto, --color always or --color never"
            )),
        }
    }

    /// Whether to colour, given the value of `NO_COLOR` (if set).
    pub fn use_color(self, no_color: Option<&str>) -> bool {
        match self {
            ColorChoice::Always => true,
            ColorChoice::Never => false,
            ColorChoice::Auto => no_color.is_none_or(str::is_empty),
        }
    }
}

/// The marker drawn before a selected row, so selection never rests on colour alone.
pub const MARKER: &str = "▶ ";
/// The blank the marker leaves on other rows.
pub const NO_MARKER: &str = "  ";

/// Styles for each meaning on screen.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Theme {
    pub color: bool,
}

impl Theme {
    pub fn new(color: bool) -> Self {
        Theme { color }
    }

    fn fg(self, c: Color) -> Style {
        if self.color {
            Style::new().fg(c)
        } else {
            Style::new()
        }
    }

    /// Plain text.
    pub fn text(self) -> Style {
        Style::new()
    }
    /// Titles and headings.
    pub fn title(self) -> Style {
        self.fg(Color::Cyan).add_modifier(Modifier::BOLD)
    }
    /// The selected row: reverse video (with a marker drawn by the caller).
    pub fn selected(self) -> Style {
        Style::new().add_modifier(Modifier::REVERSED | Modifier::BOLD)
    }
    /// Less important text.
    pub fn dim(self) -> Style {
        if self.color {
            Style::new().fg(Color::DarkGray)
        } else {
            Style::new().add_modifier(Modifier::DIM)
        }
    }
    /// A key name in the footer and help.
    pub fn key(self) -> Style {
        self.fg(Color::Yellow).add_modifier(Modifier::BOLD)
    }
    /// The next action, said big.
    pub fn next(self) -> Style {
        self.fg(Color::Yellow).add_modifier(Modifier::BOLD)
    }
    /// Good news (pass, done, ticked).
    pub fn good(self) -> Style {
        self.fg(Color::Green).add_modifier(Modifier::BOLD)
    }
    /// Bad news (fail, error in a field).
    pub fn bad(self) -> Style {
        self.fg(Color::Red).add_modifier(Modifier::BOLD)
    }
    /// Needs a person's judgement (doubt band, warnings, out-of-date calibration).
    pub fn warn(self) -> Style {
        self.fg(Color::Yellow).add_modifier(Modifier::BOLD)
    }
    /// A text field being typed into.
    pub fn field(self) -> Style {
        Style::new().add_modifier(Modifier::UNDERLINED)
    }
    /// Lines of the setup drawing and chart.
    pub fn ink(self, c: Color) -> Color {
        if self.color { c } else { Color::Reset }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn no_color_is_honoured_only_in_auto() {
        // NO_COLOR convention: set and not empty means no colour (common practice, no source)
        assert!(!ColorChoice::Auto.use_color(Some("1")));
        assert!(ColorChoice::Auto.use_color(Some("")));
        assert!(ColorChoice::Auto.use_color(None));
        assert!(ColorChoice::Always.use_color(Some("1")));
        assert!(!ColorChoice::Never.use_color(None));
    }

    #[test]
    fn selection_does_not_need_colour() {
        let t = Theme::new(false);
        assert!(t.selected().add_modifier.contains(Modifier::REVERSED));
        assert_eq!(t.good().fg, None);
        assert_eq!(Theme::new(true).bad().fg, Some(Color::Red));
    }

    #[test]
    fn bad_color_word_says_what_to_type() {
        let e = ColorChoice::parse("sometimes").unwrap_err();
        assert!(e.contains("--color never"), "{e}");
    }
}
