//! Exact lengths in integer nanometres. One inch is exactly 25 400 000 nm and one millimetre
//! 1 000 000 nm, so every size on an inch or metric gauge block is held without rounding.

use serde::{Deserialize, Serialize};
use std::fmt;
use std::str::FromStr;
use thiserror::Error;

/// Nanometres in one inch (exact, by the 1959 definition of the inch).
pub const NM_PER_INCH: i64 = 25_400_000;
/// Nanometres in one millimetre.
pub const NM_PER_MM: i64 = 1_000_000;

/// The unit a length is typed or shown in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
#[serde(rename_all = "lowercase")]
pub enum Unit {
    /// Inches.
    #[default]
    #[serde(alias = "inch")]
    In,
    /// Millimetres.
    Mm,
}

impl Unit {
    /// Nanometres in one of this unit.
    pub fn nm(self) -> i64 {
        match self {
            Unit::In => NM_PER_INCH,
            Unit::Mm => NM_PER_MM,
        }
    }
    /// The short name shown after a number.
    pub fn symbol(self) -> &'static str {
        match self {
            Unit::In => "in",
            Unit::Mm => "mm",
        }
    }
    /// Decimal places a machinist expects for a height in this unit (0.0001 in, 0.001 mm).
    pub fn places(self) -> usize {
        match self {
            Unit::In => 4,
            Unit::Mm => 3,
        }
    }
    /// Places for fine values (0.00001 in, 0.0001 mm).
    pub fn fine_places(self) -> usize {
        self.places() + 1
    }
}

impl fmt::Display for Unit {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.symbol())
    }
}

impl FromStr for Unit {
    type Err = LengthError;
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        match s.trim().to_ascii_lowercase().as_str() {
            "in" | "inch" | "inches" | "\"" => Ok(Unit::In),
            "mm" | "millimetre" | "millimetres" | "millimeter" | "millimeters" => Ok(Unit::Mm),
            other => Err(LengthError::UnknownUnit(other.to_string())),
        }
    }
}

/// A length in whole nanometres (may be negative: a reading or a correction).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
pub struct Length(i64);

/// What was wrong with a typed length.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum LengthError {
    #[error("no length was given; type a number with its unit, e.g. 2.5in or 63.5mm")]
    Empty,
    #[error("'{0}' is not a length; type a number with its unit, e.g. 2.5in, 2.5\" or 63.5mm")]
    NotANumber(String),
    #[error("'{0}' is not a unit tiltbook knows; use in (or \") or mm, e.g. 2.5in or 63.5mm")]
    UnknownUnit(String),
    #[error("'{0}' has two units; give one, e.g. 2.5in or 63.5mm")]
    TwoUnits(String),
    #[error("'{0}' has more decimal places than a nanometre; round it, e.g. 2.50000in")]
    TooFine(String),
    #[error("'{0}' is too large to be a length on a sine fixture; check the number")]
    Overflow(String),
    #[error("'{0}' is negative, but this length must be zero or more, e.g. 2.5in")]
    Negative(String),
    #[error("'{0}' must be more than zero, e.g. 5in")]
    NotPositive(String),
}

impl Length {
    /// The zero length.
    pub const ZERO: Length = Length(0);

    /// A length of whole nanometres.
    pub const fn from_nm(nm: i64) -> Self {
        Length(nm)
    }
    /// Whole nanometres.
    pub const fn nm(self) -> i64 {
        self.0
    }
    /// A length of whole units of `unit` times 10^-`places` (e.g. 16428, In, 4 = 1.6428 in).
    pub fn from_scaled(value: i64, unit: Unit, places: u32) -> Option<Self> {
        let per = unit.nm().checked_div(10_i64.checked_pow(places)?)?;
        if per * 10_i64.pow(places) != unit.nm() {
            return None;
        }
        value.checked_mul(per).map(Length)
    }
    /// Whole inches.
    pub fn inches(v: f64) -> Self {
        Length((v * NM_PER_INCH as f64).round() as i64)
    }
    /// Whole millimetres.
    pub fn mm(v: f64) -> Self {
        Length((v * NM_PER_MM as f64).round() as i64)
    }
    /// From a floating value in `unit`, rounded to the nearest nanometre.
    pub fn from_f64(v: f64, unit: Unit) -> Self {
        Length((v * unit.nm() as f64).round() as i64)
    }
    /// The value in `unit` as floating point (for trigonometry only).
    pub fn to_f64(self, unit: Unit) -> f64 {
        self.0 as f64 / unit.nm() as f64
    }
    /// The value in inches as floating point.
    pub fn as_in(self) -> f64 {
        self.to_f64(Unit::In)
    }
    /// The value in millimetres as floating point.
    pub fn as_mm(self) -> f64 {
        self.to_f64(Unit::Mm)
    }
    /// Rounded to the nearest multiple of `step` (ties away from zero). `step` must be positive.
    pub fn round_to(self, step: Length) -> Self {
        if step.0 <= 0 {
            return self;
        }
        let q = self.0.div_euclid(step.0);
        let r = self.0.rem_euclid(step.0);
        let q = if 2 * r >= step.0 { q + 1 } else { q };
        Length(q * step.0)
    }
    /// Absolute value.
    pub fn abs(self) -> Self {
        Length(self.0.abs())
    }
    /// Checked sum.
    pub fn checked_add(self, o: Length) -> Option<Length> {
        self.0.checked_add(o.0).map(Length)
    }

    /// Parse a length; a bare number is taken in `default_unit`.
    ///
    /// Accepts `2.5in`, `2.5 in`, `2.5"`, `63.5mm`, `-0.0005` (bare, default unit), `.5in`.
    pub fn parse(text: &str, default_unit: Unit) -> Result<Self, LengthError> {
        let s = text.trim();
        if s.is_empty() {
            return Err(LengthError::Empty);
        }
        let split = s
            .char_indices()
            .find(|(i, c)| {
                !(c.is_ascii_digit() || *c == '.' || ((*c == '-' || *c == '+') && *i == 0))
            })
            .map(|(i, _)| i)
            .unwrap_or(s.len());
        let (num, rest) = s.split_at(split);
        let rest = rest.trim();
        let unit = if rest.is_empty() {
            default_unit
        } else {
            match rest.parse::<Unit>() {
                Ok(u) => u,
                Err(_) => {
                    let lower = rest.to_ascii_lowercase();
                    let units = ["in", "mm", "\""];
                    let n = units.iter().filter(|u| lower.contains(*u)).count();
                    if n >= 2 || (n == 1 && lower.matches(|c: char| c.is_ascii_digit()).count() > 0)
                    {
                        return Err(LengthError::TwoUnits(s.to_string()));
                    }
                    if num.is_empty() {
                        return Err(LengthError::NotANumber(s.to_string()));
                    }
                    return Err(LengthError::UnknownUnit(rest.to_string()));
                }
            }
        };
        let nm = parse_decimal_scaled(num, unit.nm()).map_err(|e| match e {
            DecErr::Bad => LengthError::NotANumber(s.to_string()),
            DecErr::TooFine => LengthError::TooFine(s.to_string()),
            DecErr::Overflow => LengthError::Overflow(s.to_string()),
        })?;
        Ok(Length(nm))
    }

    /// Parse a length that must not be negative.
    pub fn parse_non_negative(text: &str, default_unit: Unit) -> Result<Self, LengthError> {
        let l = Self::parse(text, default_unit)?;
        if l.0 < 0 {
            return Err(LengthError::Negative(text.trim().to_string()));
        }
        Ok(l)
    }

    /// Parse a length that must be more than zero (a centre distance, a travel).
    pub fn parse_positive(text: &str, default_unit: Unit) -> Result<Self, LengthError> {
        let l = Self::parse(text, default_unit)?;
        if l.0 <= 0 {
            return Err(LengthError::NotPositive(text.trim().to_string()));
        }
        Ok(l)
    }

    /// The number alone, in `unit`, with exactly `places` decimals (rounded half away from zero).
    pub fn number(self, unit: Unit, places: usize) -> String {
        let per = unit.nm() as i128;
        let scale = 10_i128.pow(places as u32);
        let v = self.0 as i128 * scale;
        let q = v / per;
        let r = v % per;
        let q = if 2 * r.abs() >= per {
            q + v.signum()
        } else {
            q
        };
        let neg = q < 0;
        let q = q.abs();
        let int = q / scale;
        let frac = q % scale;
        let sign = if neg { "-" } else { "" };
        if places == 0 {
            format!("{sign}{int}")
        } else {
            format!("{sign}{int}.{frac:0places$}")
        }
    }

    /// The shortest decimal in `unit` (no trailing zeros beyond `min_places`). In millimetres
    /// this is always exact (6 places hold a nanometre); in inches it is rounded to 9 places,
    /// which is exact for every length on the 0.00001 in grid that inch blocks and readings use.
    pub fn exact_number(self, unit: Unit, min_places: usize) -> String {
        let max = match unit {
            Unit::Mm => 6,
            Unit::In => 9,
        };
        let full = self.number(unit, max);
        let (int, frac) = full.split_once('.').unwrap_or((&full, ""));
        let mut frac = frac.trim_end_matches('0').to_string();
        while frac.len() < min_places {
            frac.push('0');
        }
        if frac.is_empty() {
            int.to_string()
        } else {
            format!("{int}.{frac}")
        }
    }

    /// Shown in `unit` with the usual places and the unit name (`2.5000 in`, `63.500 mm`).
    pub fn show(self, unit: Unit) -> String {
        format!("{} {}", self.number(unit, unit.places()), unit.symbol())
    }
    /// Shown with one more place (`0.00015 in`, `0.0005 mm`).
    pub fn show_fine(self, unit: Unit) -> String {
        format!(
            "{} {}",
            self.number(unit, unit.fine_places()),
            unit.symbol()
        )
    }
}

impl std::ops::Add for Length {
    type Output = Length;
    fn add(self, o: Length) -> Length {
        Length(self.0 + o.0)
    }
}
impl std::ops::Sub for Length {
    type Output = Length;
    fn sub(self, o: Length) -> Length {
        Length(self.0 - o.0)
    }
}
impl std::ops::Neg for Length {
    type Output = Length;
    fn neg(self) -> Length {
        Length(-self.0)
    }
}
impl std::iter::Sum for Length {
    fn sum<I: Iterator<Item = Length>>(iter: I) -> Length {
        Length(iter.map(|l| l.0).sum())
    }
}

/// Serialised as a string with its unit, e.g. `"2.5000 in"` is read back exactly.
impl Serialize for Length {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        // inches when the value is a whole number of 0.00001 in, else exact millimetres
        let unit = if self.0 % (NM_PER_INCH / 100_000) == 0 {
            Unit::In
        } else {
            Unit::Mm
        };
        s.serialize_str(&format!("{} {}", self.exact_number(unit, 0), unit.symbol()))
    }
}

impl<'de> Deserialize<'de> for Length {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let s = String::deserialize(d)?;
        Length::parse(&s, Unit::In).map_err(serde::de::Error::custom)
    }
}

enum DecErr {
    Bad,
    TooFine,
    Overflow,
}

/// Parse a plain decimal (`-12.345`) and multiply by `per` exactly, as integer nanometres.
fn parse_decimal_scaled(num: &str, per: i64) -> Result<i64, DecErr> {
    let (neg, body) = match num.as_bytes().first() {
        Some(b'-') => (true, &num[1..]),
        Some(b'+') => (false, &num[1..]),
        _ => (false, num),
    };
    if body.is_empty() || body == "." {
        return Err(DecErr::Bad);
    }
    let (int, frac) = body.split_once('.').unwrap_or((body, ""));
    if !int.bytes().all(|b| b.is_ascii_digit()) || !frac.bytes().all(|b| b.is_ascii_digit()) {
        return Err(DecErr::Bad);
    }
    let frac = frac.trim_end_matches('0');
    if frac.len() > 12 {
        return Err(DecErr::TooFine);
    }
    let int_v: i128 = if int.is_empty() {
        0
    } else {
        int.parse::<i128>().map_err(|_| DecErr::Overflow)?
    };
    let frac_v: i128 = if frac.is_empty() {
        0
    } else {
        frac.parse::<i128>().map_err(|_| DecErr::Bad)?
    };
    let scale = 10_i128.pow(frac.len() as u32);
    let total = int_v
        .checked_mul(scale)
        .and_then(|v| v.checked_add(frac_v))
        .and_then(|v| v.checked_mul(per as i128))
        .ok_or(DecErr::Overflow)?;
    if total % scale != 0 {
        return Err(DecErr::TooFine);
    }
    let nm = total / scale;
    let nm = if neg { -nm } else { nm };
    i64::try_from(nm)
        .ok()
        .filter(|v| v.abs() <= 1_000_000 * NM_PER_MM)
        .ok_or(DecErr::Overflow)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_the_usual_forms() {
        let want = Length::from_nm(63_500_000);
        for s in [
            "2.5in", "2.5 in", "2.5\"", "63.5mm", "63.5 mm", "2.5 inch", " 2.5in ",
        ] {
            assert_eq!(Length::parse(s, Unit::Mm), Ok(want), "{s}");
        }
        assert_eq!(Length::parse("2.5", Unit::In), Ok(want));
        assert_eq!(Length::parse("63.5", Unit::Mm), Ok(want));
        assert_eq!(
            Length::parse(".5in", Unit::Mm),
            Ok(Length::from_nm(12_700_000))
        );
        assert_eq!(
            Length::parse("-0.0005", Unit::In),
            Ok(Length::from_nm(-12_700))
        );
    }

    #[test]
    fn refuses_bad_input_with_an_example() {
        for (s, frag) in [
            ("", "no length"),
            ("abc", "not a length"),
            ("2.5inmm", "two units"),
            ("2.5 in mm", "two units"),
            ("NaN", "not a length"),
            ("2.5ft", "not a unit"),
            ("1.2.3in", "not a length"),
            ("99999999999999999999in", "too large"),
        ] {
            let e = Length::parse(s, Unit::In)
                .err()
                .map(|e| e.to_string())
                .unwrap_or_default();
            assert!(e.contains(frag), "{s:?} gave {e:?}");
        }
        assert!(Length::parse_non_negative("-1in", Unit::In).is_err());
        assert!(Length::parse_positive("0in", Unit::In).is_err());
    }

    #[test]
    fn formats_to_the_places_machinists_read() {
        let l = Length::parse("1.6428in", Unit::In).unwrap_or_default();
        assert_eq!(l.show(Unit::In), "1.6428 in");
        assert_eq!(l.show_fine(Unit::In), "1.64280 in");
        assert_eq!(
            Length::parse("58.345mm", Unit::In)
                .unwrap_or_default()
                .show(Unit::Mm),
            "58.345 mm"
        );
        assert_eq!(Length::from_nm(-12_700).show(Unit::In), "-0.0005 in");
        assert_eq!(
            Length::from_nm(63_500_000).exact_number(Unit::In, 4),
            "2.5000"
        );
    }

    #[test]
    fn rounds_to_a_step() {
        let step = Length::parse("0.0001in", Unit::In).unwrap_or_default();
        let l = Length::inches(2.82603);
        assert_eq!(l.round_to(step).show(Unit::In), "2.8260 in");
        assert_eq!(
            Length::inches(2.82605).round_to(step).show(Unit::In),
            "2.8261 in"
        );
    }
}
