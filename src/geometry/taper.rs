//! Tapers set on sine centres: a taper given as a ratio (1:20), as a diameter change per foot
//! (0.75in/ft), as an included angle or as a half angle. The half angle is atan(D/(2·len)) and
//! is the angle the centres are set to; the included angle is twice the half angle.

use crate::units::{Angle, Length, Unit};
use thiserror::Error;

/// What was wrong with a typed taper.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum TaperError {
    #[error(
        "'{0}' is not a taper tiltbook reads; type a ratio, a diameter change per foot, an included angle or a half angle, e.g. 1:20, 0.75in/ft, 0.75 in per foot, included 3°34' or half 1°47'"
    )]
    NotATaper(String),
    #[error("'{0}': both sides of a ratio must be more than zero, e.g. 1:20")]
    BadRatio(String),
    #[error("'{0}': the diameter change per foot must be more than zero, e.g. 0.75in/ft")]
    BadChange(String),
    #[error(
        "'{0}': the angle must be more than 0° and less than 90° (half angle) or 180° (included), e.g. included 3°34'"
    )]
    BadAngle(String),
}

/// How the taper was given.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TaperSpec {
    /// Diameter change `diameter` over `length` (any unit, the ratio is what counts), e.g. 1:20.
    Ratio { diameter: f64, length: f64 },
    /// Diameter change per foot (12 in).
    PerFoot(Length),
    /// The included angle (between opposite sides).
    Included(Angle),
    /// The half angle (side to axis).
    Half(Angle),
}

/// A taper and the angles it needs.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Taper {
    pub spec: TaperSpec,
    /// Side to axis: the angle the sine centres are set to.
    pub half: Angle,
}

impl Taper {
    /// From a diameter change `d` over a length `len` (same units): half = atan(d/(2·len)).
    pub fn from_change(d: f64, len: f64) -> Self {
        Taper {
            spec: TaperSpec::Ratio {
                diameter: d,
                length: len,
            },
            half: Angle::from_rad((d / (2.0 * len)).atan()),
        }
    }
    /// The angle to set on the sine centres (the half angle).
    pub fn setting(&self) -> Angle {
        self.half
    }
    /// The included angle, 2 × half.
    pub fn included(&self) -> Angle {
        Angle::from_deg(2.0 * self.half.deg())
    }
    /// Diameter change per unit length, 2·tan(half).
    pub fn change_per_length(&self) -> f64 {
        2.0 * self.half.rad().tan()
    }

    /// Read a taper as typed: `1:20`, `0.75in/ft`, `0.75 in per foot`, `0.75/ft` (inches),
    /// `19.05mm/ft`, `included 3°34'`, `3°34' included`, `half 1°47'`, `1°47' half`.
    pub fn parse(text: &str) -> Result<Self, TaperError> {
        let s = text.trim();
        let bad = || TaperError::NotATaper(s.to_string());
        if s.is_empty() {
            return Err(bad());
        }
        let lower = s.to_lowercase();
        for (word, inc) in [
            ("included", true),
            ("incl", true),
            ("half angle", false),
            ("half", false),
        ] {
            let rest = lower
                .strip_prefix(word)
                .or_else(|| lower.strip_suffix(word))
                .map(|r| r.trim().trim_start_matches([':', '=']).trim());
            if let Some(rest) = rest {
                let a = Angle::parse(rest).map_err(|_| bad())?;
                let max = if inc { 180.0 } else { 90.0 };
                if !(a.deg() > 0.0 && a.deg() < max) {
                    return Err(TaperError::BadAngle(s.to_string()));
                }
                return Ok(if inc {
                    Taper {
                        spec: TaperSpec::Included(a),
                        half: Angle::from_deg(a.deg() / 2.0),
                    }
                } else {
                    Taper {
                        spec: TaperSpec::Half(a),
                        half: a,
                    }
                });
            }
        }
        if let Some((a, b)) = s.split_once(':') {
            let num = |t: &str| t.trim().parse::<f64>().ok().filter(|v| v.is_finite());
            let (d, len) = match (num(a), num(b)) {
                (Some(d), Some(l)) => (d, l),
                _ => return Err(bad()),
            };
            if d <= 0.0 || len <= 0.0 {
                return Err(TaperError::BadRatio(s.to_string()));
            }
            return Ok(Taper::from_change(d, len));
        }
        let per_foot = ["per foot", "per ft", "/ft", "/foot", "tpf"]
            .iter()
            .find_map(|w| lower.strip_suffix(w));
        if let Some(amount) = per_foot {
            let amount = amount.trim();
            let d = Length::parse(amount, Unit::In).map_err(|_| bad())?;
            let foot = 12 * crate::units::NM_PER_INCH;
            if d.nm() <= 0 {
                return Err(TaperError::BadChange(s.to_string()));
            }
            let half = Angle::from_rad((d.nm() as f64 / (2.0 * foot as f64)).atan());
            return Ok(Taper {
                spec: TaperSpec::PerFoot(d),
                half,
            });
        }
        Err(bad())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn half(s: &str) -> f64 {
        Taper::parse(s).map(|t| t.half.deg()).unwrap_or(f64::NAN)
    }

    #[test]
    fn the_forms_agree() {
        // tapers.csv (mpmath): 1:16 and 0.75 in/ft both have half angle 1.7899106082°
        for s in [
            "1:16",
            "0.75in/ft",
            "0.75 in per foot",
            "0.75/ft",
            "0.75\" per ft",
            "19.05mm/ft",
            "half 1.7899106082",
            "included 3.5798212165",
            "3.5798212165 included",
        ] {
            assert!((half(s) - 1.7899106082).abs() < 1e-9, "{s}: {}", half(s));
        }
    }

    #[test]
    fn refuses_junk_with_examples() {
        for s in [
            "",
            "abc",
            "0:20",
            "1:-2",
            "0in/ft",
            "-1in/ft",
            "included 190",
            "half 0",
            "1:x",
        ] {
            let e = Taper::parse(s)
                .err()
                .map(|e| e.to_string())
                .unwrap_or_default();
            assert!(e.contains("e.g."), "{s:?} gave {e:?}");
        }
    }
}
