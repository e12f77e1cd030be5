//! Angles as typed on the shop floor (`30`, `30.25`, `30°15'20"`, `30d15m20s`, `30:15:20`,
//! `30 15 20`) and tolerances (`±0°05'`, `±0.1°`, `+0°02'/-0°00'`).

use serde::{Deserialize, Serialize};
use std::fmt;
use thiserror::Error;

/// An angle in decimal degrees (floating point; lengths are the exact quantities).
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd, Default)]
pub struct Angle(f64);

/// What was wrong with a typed angle or tolerance.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum AngleError {
    #[error("no angle was given; type degrees, e.g. 30, 30.25, 30°15'20\" or 30d15m20s")]
    Empty,
    #[error(
        "'{0}' is not an angle; type degrees, e.g. 30, 30.25, 30°15'20\", 30d15m20s or 30:15:20"
    )]
    NotAnAngle(String),
    #[error(
        "'{0}': minutes must be under 60 (60 minutes make a degree), e.g. 31d01m instead of 30d61m"
    )]
    MinutesTooLarge(String),
    #[error(
        "'{0}': seconds must be under 60 (60 seconds make a minute), e.g. 30d16m05s instead of 30d15m65s"
    )]
    SecondsTooLarge(String),
    #[error(
        "'{0}': when minutes or seconds are given, degrees and minutes must be whole numbers, e.g. 30°15.5' is not accepted; type 30°15'30\""
    )]
    FractionBeforeLast(String),
    #[error("'{0}' is not a tolerance; type ±0°05', ±0.1°, +-0.1 or +0°02'/-0°00'")]
    NotATolerance(String),
}

impl Angle {
    /// From decimal degrees.
    pub const fn from_deg(d: f64) -> Self {
        Angle(d)
    }
    /// From arc-seconds.
    pub fn from_arcsec(s: f64) -> Self {
        Angle(s / 3600.0)
    }
    /// From radians.
    pub fn from_rad(r: f64) -> Self {
        Angle(r.to_degrees())
    }
    /// From whole degrees, minutes and (possibly fractional) seconds, all with the sign given.
    pub fn from_dms(negative: bool, d: u32, m: u32, s: f64) -> Self {
        let v = d as f64 + m as f64 / 60.0 + s / 3600.0;
        Angle(if negative { -v } else { v })
    }
    /// Decimal degrees.
    pub fn deg(self) -> f64 {
        self.0
    }
    /// Radians.
    pub fn rad(self) -> f64 {
        self.0.to_radians()
    }
    /// Arc-seconds.
    pub fn arcsec(self) -> f64 {
        self.0 * 3600.0
    }
    /// Absolute value.
    pub fn abs(self) -> Self {
        Angle(self.0.abs())
    }

    /// Parse what a machinist types.
    pub fn parse(text: &str) -> Result<Self, AngleError> {
        let s = text.trim();
        if s.is_empty() {
            return Err(AngleError::Empty);
        }
        let bad = || AngleError::NotAnAngle(s.to_string());
        let (neg, body) = match s.strip_prefix('-') {
            Some(rest) => (true, rest.trim_start()),
            None => (false, s.strip_prefix('+').unwrap_or(s).trim_start()),
        };
        // split into numeric fields, remembering which marker ended each
        let mut fields: Vec<(String, char)> = Vec::new();
        let mut cur = String::new();
        for c in body.chars() {
            match c {
                '0'..='9' | '.' => cur.push(c),
                '°' | 'd' | 'D' | '\'' | '′' | 'm' | 'M' | '"' | '″' | 's' | 'S' | ':' | ' ' =>
                {
                    if cur.is_empty() {
                        if c == ' ' {
                            continue;
                        }
                        // `''` as seconds after a number already closed: `30°15'20''`
                        if c == '\''
                            && fields.last().map(|f| f.1) == Some('\'')
                            && fields.len() == 3
                        {
                            continue;
                        }
                        return Err(bad());
                    }
                    let mark = match c {
                        '°' | 'd' | 'D' => 'd',
                        '\'' | '′' | 'm' | 'M' => '\'',
                        '"' | '″' | 's' | 'S' => '"',
                        _ => ' ',
                    };
                    fields.push((std::mem::take(&mut cur), mark));
                }
                _ => return Err(bad()),
            }
        }
        if !cur.is_empty() {
            fields.push((cur, ' '));
        }
        if fields.is_empty() || fields.len() > 3 {
            return Err(bad());
        }
        // assign positions: explicit markers decide; plain separators go in order d, m, s
        let mut slots: [Option<&str>; 3] = [None; 3];
        let mut next = 0usize;
        for (num, mark) in &fields {
            let pos = match mark {
                'd' => 0,
                '\'' => 1,
                '"' => 2,
                _ => next,
            };
            if pos > 2 || pos < next || slots[pos].is_some() {
                return Err(bad());
            }
            slots[pos] = Some(num.as_str());
            next = pos + 1;
        }
        let num = |t: &str| -> Result<f64, AngleError> {
            if t.chars().filter(|c| *c == '.').count() > 1 || t == "." {
                return Err(bad());
            }
            t.parse::<f64>()
                .map_err(|_| bad())
                .and_then(|v| if v.is_finite() { Ok(v) } else { Err(bad()) })
        };
        let last = slots.iter().rposition(|x| x.is_some()).unwrap_or(0);
        let mut parts = [0.0f64; 3];
        for (i, slot) in slots.iter().enumerate() {
            if let Some(t) = slot {
                let v = num(t)?;
                if i < last && v.fract() != 0.0 {
                    return Err(AngleError::FractionBeforeLast(s.to_string()));
                }
                parts[i] = v;
            }
        }
        if parts[1] >= 60.0 {
            return Err(AngleError::MinutesTooLarge(s.to_string()));
        }
        if parts[2] >= 60.0 {
            return Err(AngleError::SecondsTooLarge(s.to_string()));
        }
        let v = parts[0] + parts[1] / 60.0 + parts[2] / 3600.0;
        Ok(Angle(if neg { -v } else { v }))
    }

    /// Degrees, minutes, seconds with `places` decimals on the seconds: `30°15'20"`.
    pub fn dms(self, places: usize) -> String {
        let neg = self.0 < 0.0;
        let scale = 10f64.powi(places as i32);
        let total = (self.0.abs() * 3600.0 * scale).round() as i64;
        let per_deg = (3600.0 * scale) as i64;
        let per_min = (60.0 * scale) as i64;
        let d = total / per_deg;
        let m = (total % per_deg) / per_min;
        let s = (total % per_min) as f64 / scale;
        let sign = if neg && total != 0 { "-" } else { "" };
        if places == 0 {
            format!("{sign}{d}°{m:02}'{s:02.0}\"")
        } else {
            let w = places + 3;
            format!("{sign}{d}°{m:02}'{s:0w$.places$}\"")
        }
    }
    /// Degrees and whole minutes: `30°15'`.
    pub fn dm(self) -> String {
        let neg = self.0 < 0.0;
        let total = (self.0.abs() * 60.0).round() as i64;
        let sign = if neg && total != 0 { "-" } else { "" };
        format!("{sign}{}°{:02}'", total / 60, total % 60)
    }
    /// Decimal degrees with `places` decimals: `30.2556°`.
    pub fn decimal(self, places: usize) -> String {
        format!("{:.places$}°", self.0)
    }
    /// A small angle in arc-seconds with a sign: `+61.9"`.
    pub fn arcsec_signed(self, places: usize) -> String {
        format!("{:+.places$}\"", self.arcsec())
    }
}

impl fmt::Display for Angle {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{} ({})", self.dms(0), self.decimal(4))
    }
}

impl std::ops::Add for Angle {
    type Output = Angle;
    fn add(self, o: Angle) -> Angle {
        Angle(self.0 + o.0)
    }
}
impl std::ops::Sub for Angle {
    type Output = Angle;
    fn sub(self, o: Angle) -> Angle {
        Angle(self.0 - o.0)
    }
}
impl std::ops::Neg for Angle {
    type Output = Angle;
    fn neg(self) -> Angle {
        Angle(-self.0)
    }
}

/// Written as D-M-S text (`"30°15'20\""`) so a person reading the YAML sees the trade's form.
impl Serialize for Angle {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let whole_sec = (self.arcsec() - self.arcsec().round()).abs() < 1e-6;
        s.serialize_str(&self.dms(if whole_sec { 0 } else { 3 }))
    }
}
impl<'de> Deserialize<'de> for Angle {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        #[derive(Deserialize)]
        #[serde(untagged)]
        enum Raw {
            N(f64),
            S(String),
        }
        match Raw::deserialize(d)? {
            Raw::N(v) if v.is_finite() => Ok(Angle(v)),
            Raw::N(_) => Err(serde::de::Error::custom("angle is not a finite number")),
            Raw::S(s) => Angle::parse(&s).map_err(serde::de::Error::custom),
        }
    }
}

/// An allowed deviation below and above nominal. `minus` and `plus` are both given as
/// non-negative amounts: the feature passes when -minus <= deviation <= plus.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Tolerance {
    /// Allowed deviation above nominal (non-negative).
    pub plus: Angle,
    /// Allowed deviation below nominal (non-negative amount).
    pub minus: Angle,
}

impl Tolerance {
    /// The same amount either side.
    pub fn symmetric(a: Angle) -> Self {
        Tolerance {
            plus: a.abs(),
            minus: a.abs(),
        }
    }
    /// Is `dev` inside the band?
    pub fn contains(&self, dev: Angle) -> bool {
        dev.deg() <= self.plus.deg() + 1e-12 && -dev.deg() <= self.minus.deg() + 1e-12
    }
    /// The limit on the side `dev` falls.
    pub fn limit_for(&self, dev: Angle) -> Angle {
        if dev.deg() >= 0.0 {
            self.plus
        } else {
            self.minus
        }
    }
    /// The smaller of the two sides.
    pub fn tightest(&self) -> Angle {
        if self.plus.deg() < self.minus.deg() {
            self.plus
        } else {
            self.minus
        }
    }

    /// Parse `±0°05'`, `+-0.1`, `±0.1°`, `0°05'` (taken as ±), `+0°02'/-0°00'`.
    pub fn parse(text: &str) -> Result<Self, AngleError> {
        let s = text.trim();
        if s.is_empty() {
            return Err(AngleError::NotATolerance(s.to_string()));
        }
        let bad = || AngleError::NotATolerance(s.to_string());
        let sym = s
            .strip_prefix('±')
            .or_else(|| s.strip_prefix("+/-"))
            .or_else(|| s.strip_prefix("+-"));
        if let Some(rest) = sym {
            return Ok(Tolerance::symmetric(Angle::parse(rest)?));
        }
        if let Some((a, b)) = s.split_once('/') {
            let (a, b) = (a.trim(), b.trim());
            let side = |t: &str| -> Result<(char, Angle), AngleError> {
                let sign = t.chars().next().ok_or_else(bad)?;
                if sign != '+' && sign != '-' {
                    return Err(bad());
                }
                Ok((sign, Angle::parse(&t[1..])?.abs()))
            };
            let (sa, va) = side(a)?;
            let (sb, vb) = side(b)?;
            return match (sa, sb) {
                ('+', '-') => Ok(Tolerance {
                    plus: va,
                    minus: vb,
                }),
                ('-', '+') => Ok(Tolerance {
                    plus: vb,
                    minus: va,
                }),
                _ => Err(bad()),
            };
        }
        if s.starts_with('-') || s.starts_with('+') {
            return Err(bad());
        }
        Ok(Tolerance::symmetric(Angle::parse(s).map_err(|_| bad())?))
    }
}

impl fmt::Display for Tolerance {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let fmt1 = |a: Angle| {
            if (a.arcsec() - a.arcsec().round()).abs() < 1e-6
                && (a.arcsec().round() as i64) % 60 == 0
            {
                a.dm()
            } else {
                a.dms(0)
            }
        };
        if (self.plus.deg() - self.minus.deg()).abs() < 1e-12 {
            write!(f, "±{}", fmt1(self.plus))
        } else {
            write!(f, "+{}/-{}", fmt1(self.plus), fmt1(self.minus))
        }
    }
}

impl Serialize for Tolerance {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&self.to_string())
    }
}
impl<'de> Deserialize<'de> for Tolerance {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let s = String::deserialize(d)?;
        Tolerance::parse(&s).map_err(serde::de::Error::custom)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: Angle, d: f64) -> bool {
        (a.deg() - d).abs() < 1e-9
    }

    #[test]
    fn parses_every_notation() {
        let want = 30.0 + 15.0 / 60.0 + 20.0 / 3600.0;
        for s in [
            "30°15'20\"",
            "30d15m20s",
            "30:15:20",
            "30 15 20",
            "30° 15' 20\"",
            "30D15M20S",
            "30°15′20″",
        ] {
            assert!(close(Angle::parse(s).unwrap_or_default(), want), "{s}");
        }
        assert!(close(Angle::parse("30").unwrap_or_default(), 30.0));
        assert!(close(Angle::parse("30.25").unwrap_or_default(), 30.25));
        assert!(close(Angle::parse("0d30m").unwrap_or_default(), 0.5));
        assert!(close(
            Angle::parse("34°25'").unwrap_or_default(),
            34.0 + 25.0 / 60.0
        ));
        assert!(close(Angle::parse("-0.5").unwrap_or_default(), -0.5));
        assert!(close(
            Angle::parse("15\"").unwrap_or_default(),
            15.0 / 3600.0
        ));
    }

    #[test]
    fn refuses_sixty_minutes_and_junk() {
        let e = Angle::parse("30d61m")
            .err()
            .map(|e| e.to_string())
            .unwrap_or_default();
        assert!(e.contains("minutes must be under 60"), "{e}");
        let e = Angle::parse("30:15:60")
            .err()
            .map(|e| e.to_string())
            .unwrap_or_default();
        assert!(e.contains("seconds must be under 60"), "{e}");
        for s in [
            "",
            "abc",
            "30x",
            "1.2.3",
            "30d15m20s10",
            "NaN",
            "inf",
            "30m10d",
        ] {
            assert!(Angle::parse(s).is_err(), "{s:?} accepted");
        }
    }

    #[test]
    fn formats() {
        let a = Angle::parse("30°15'20\"").unwrap_or_default();
        assert_eq!(a.dms(0), "30°15'20\"");
        assert_eq!(a.dms(1), "30°15'20.0\"");
        assert_eq!(a.decimal(4), "30.2556°");
        assert_eq!(Angle::from_arcsec(61.879).arcsec_signed(1), "+61.9\"");
        assert_eq!(Angle::from_deg(59.99999999).dms(0), "60°00'00\"");
    }

    #[test]
    fn tolerances() {
        let t = Tolerance::parse("±0°05'").unwrap_or_default();
        assert!(close(t.plus, 5.0 / 60.0) && close(t.minus, 5.0 / 60.0));
        let t = Tolerance::parse("±0.1°").unwrap_or_default();
        assert!(close(t.plus, 0.1));
        let t = Tolerance::parse("+0°02'/-0°00'").unwrap_or_default();
        assert!(close(t.plus, 2.0 / 60.0) && close(t.minus, 0.0));
        assert!(t.contains(Angle::from_deg(0.01)) && !t.contains(Angle::from_deg(-0.01)));
        assert_eq!(t.to_string(), "+0°02'/-0°00'");
        assert_eq!(
            Tolerance::parse("+-0.1").unwrap_or_default().to_string(),
            "±0°06'"
        );
        assert!(Tolerance::parse("+0°02'").is_err());
        assert!(Tolerance::parse("x").is_err());
    }
}
