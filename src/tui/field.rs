//! A one-line text field: what has been typed, and the message beside it saying whether it
//! reads as what is asked for.

/// A one-line text field with a length limit.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct Field {
    pub text: String,
    /// The most characters it takes.
    pub max: usize,
}

impl Field {
    pub fn new(max: usize) -> Self {
        Field {
            text: String::new(),
            max,
        }
    }
    pub fn with(text: &str, max: usize) -> Self {
        let mut f = Field::new(max);
        for c in text.chars() {
            f.push(c);
        }
        f
    }
    /// Type one character (control characters are ignored; the limit holds).
    pub fn push(&mut self, c: char) {
        if !c.is_control() && self.text.chars().count() < self.max {
            self.text.push(c);
        }
    }
    /// Erase the last character.
    pub fn pop(&mut self) {
        self.text.pop();
    }
    pub fn clear(&mut self) {
        self.text.clear();
    }
    pub fn is_blank(&self) -> bool {
        self.text.trim().is_empty()
    }
    pub fn trimmed(&self) -> &str {
        self.text.trim()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn keeps_to_its_limit_and_drops_control_characters() {
        let mut f = Field::new(3);
        for c in ['a', '\u{7}', 'b', 'c', 'd'] {
            f.push(c);
        }
        assert_eq!(f.text, "abc");
        f.pop();
        assert_eq!(f.text, "ab");
        assert!(!f.is_blank());
        f.clear();
        assert!(f.is_blank());
    }
}
