//! The values a shop file holds, each read so that a mistake is reported at the value itself
//! (serde_yaml attaches the line and column of the value being read) with what to write instead.

use crate::blocks::{Grade, catalogue};
use crate::units::{Angle, Length, Unit};
use jiff::civil::Date;
use serde::Deserialize;
use serde::de::{self, Deserializer, SeqAccess, Visitor};
use std::fmt;

/// A length written with its unit, more than zero.
#[derive(Debug, Clone, Copy)]
pub(super) struct YLen {
    pub len: Length,
    pub unit: Unit,
}

pub(super) fn parse_len(s: &str) -> Result<YLen, String> {
    let t = s.trim();
    let lower = t.to_ascii_lowercase();
    let unit = if lower.ends_with("mm") {
        Unit::Mm
    } else if lower.ends_with("in")
        || lower.ends_with("inch")
        || lower.ends_with("inches")
        || lower.ends_with('"')
    {
        Unit::In
    } else {
        return Err(format!("'{t}' needs a unit: write it as {t}in or {t}mm"));
    };
    let len = Length::parse(t, unit).map_err(|e| e.to_string())?;
    if len.nm() <= 0 {
        return Err(format!("'{t}' must be more than zero, e.g. 0.7500in"));
    }
    Ok(YLen { len, unit })
}

fn no_unit<E: de::Error>(v: impl fmt::Display) -> E {
    E::custom(format!("{v} needs a unit: write it as {v}in or {v}mm"))
}

impl<'de> Deserialize<'de> for YLen {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = YLen;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a length with its unit, e.g. 5in or 127mm")
            }
            fn visit_str<E: de::Error>(self, s: &str) -> Result<YLen, E> {
                parse_len(s).map_err(E::custom)
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<YLen, E> {
                Err(no_unit(v))
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<YLen, E> {
                Err(no_unit(v))
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<YLen, E> {
                Err(no_unit(v))
            }
        }
        d.deserialize_str(V)
    }
}

/// A calendar date, `YYYY-MM-DD`.
#[derive(Debug, Clone, Copy)]
pub(super) struct YDate(pub Date);

impl<'de> Deserialize<'de> for YDate {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = YDate;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a date written YYYY-MM-DD, e.g. 2027-03-16")
            }
            fn visit_str<E: de::Error>(self, s: &str) -> Result<YDate, E> {
                s.trim().parse::<Date>().map(YDate).map_err(|_| {
                    E::custom(format!(
                        "'{}' is not a date; write YYYY-MM-DD, e.g. 2027-03-16",
                        s.trim()
                    ))
                })
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<YDate, E> {
                self.visit_str(&v.to_string())
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<YDate, E> {
                self.visit_str(&v.to_string())
            }
        }
        d.deserialize_str(V)
    }
}

/// An angle in degrees (a number) or as typed (`"30d15m"`).
#[derive(Debug, Clone, Copy)]
pub(super) struct YAngle(pub Angle);

impl<'de> Deserialize<'de> for YAngle {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = YAngle;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("an angle in degrees, e.g. 60 or \"59d30m\"")
            }
            fn visit_str<E: de::Error>(self, s: &str) -> Result<YAngle, E> {
                Angle::parse(s).map(YAngle).map_err(E::custom)
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<YAngle, E> {
                Ok(YAngle(Angle::from_deg(v as f64)))
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<YAngle, E> {
                Ok(YAngle(Angle::from_deg(v as f64)))
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<YAngle, E> {
                if v.is_finite() {
                    Ok(YAngle(Angle::from_deg(v)))
                } else {
                    Err(E::custom("an angle must be a number of degrees, e.g. 60"))
                }
            }
        }
        d.deserialize_any(V)
    }
}

/// `[smallest, largest]` rated angles, 0° ≤ smallest ≤ largest < 90°.
#[derive(Debug, Clone, Copy)]
pub(super) struct YRange(pub Angle, pub Angle);

impl<'de> Deserialize<'de> for YRange {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = YRange;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("the smallest and largest angle in brackets, e.g. [0, 60]")
            }
            fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<YRange, A::Error> {
                let bad = || {
                    de::Error::custom(
                        "angle_range takes two angles, the smallest and the largest, e.g. [0, 60]",
                    )
                };
                let lo: YAngle = seq.next_element()?.ok_or_else(bad)?;
                let hi: YAngle = seq.next_element()?.ok_or_else(bad)?;
                if seq.next_element::<YAngle>()?.is_some() {
                    return Err(bad());
                }
                let (lo, hi) = (lo.0, hi.0);
                if lo.deg() < 0.0 || hi.deg() >= 90.0 || lo.deg() > hi.deg() {
                    return Err(de::Error::custom(format!(
                        "angle_range [{}, {}] must run from 0 or more up to less than 90, smallest first, e.g. [0, 60]",
                        lo.deg(),
                        hi.deg()
                    )));
                }
                Ok(YRange(lo, hi))
            }
        }
        d.deserialize_seq(V)
    }
}

/// `[pivot, raised]` roll diameters (one value: both the same).
#[derive(Debug, Clone, Copy)]
pub(super) struct YRolls(pub YLen, pub YLen);

impl<'de> Deserialize<'de> for YRolls {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = YRolls;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("the two roll diameters, pivot first, e.g. [0.7500in, 0.7500in]")
            }
            fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<YRolls, A::Error> {
                let bad = || {
                    de::Error::custom(
                        "rolls takes the two roll diameters, pivot first, e.g. [0.7500in, 0.7500in]",
                    )
                };
                let a: YLen = seq.next_element()?.ok_or_else(bad)?;
                let b: Option<YLen> = seq.next_element()?;
                if seq.next_element::<YLen>()?.is_some() {
                    return Err(bad());
                }
                Ok(YRolls(a, b.unwrap_or(a)))
            }
            fn visit_str<E: de::Error>(self, s: &str) -> Result<YRolls, E> {
                let parts: Vec<&str> = s.split(',').collect();
                match parts.as_slice() {
                    [a] => parse_len(a).map(|a| YRolls(a, a)).map_err(E::custom),
                    [a, b] => Ok(YRolls(
                        parse_len(a).map_err(E::custom)?,
                        parse_len(b).map_err(E::custom)?,
                    )),
                    _ => Err(E::custom(
                        "rolls takes the two roll diameters, pivot first, e.g. [0.7500in, 0.7500in]",
                    )),
                }
            }
        }
        d.deserialize_any(V)
    }
}

/// A size with an optional count: `0.1001in` or `0.050in x2`.
#[derive(Debug, Clone, Copy)]
pub(super) struct YSize {
    pub size: YLen,
    pub count: u32,
}

impl<'de> Deserialize<'de> for YSize {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = YSize;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a block size, with a count when more than one, e.g. 0.050in x2")
            }
            fn visit_str<E: de::Error>(self, s: &str) -> Result<YSize, E> {
                let t = s.trim();
                let (size, count) = match t.rsplit_once(['x', 'X', '×']) {
                    Some((a, b))
                        if !b.trim().is_empty() && b.trim().bytes().all(|c| c.is_ascii_digit()) =>
                    {
                        let n: u32 = b
                            .trim()
                            .parse()
                            .map_err(|_| E::custom(format!("'{t}': the count is too large")))?;
                        (a.trim(), n)
                    }
                    _ => (t, 1),
                };
                if count == 0 {
                    return Err(E::custom(format!(
                        "'{t}': a count must be 1 or more; leave the size out instead"
                    )));
                }
                let size = parse_len(size).map_err(|e| {
                    E::custom(format!("{e} (a size with a count is written 0.050in x2)"))
                })?;
                Ok(YSize { size, count })
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<YSize, E> {
                Err(no_unit(v))
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<YSize, E> {
                Err(no_unit(v))
            }
        }
        d.deserialize_str(V)
    }
}

/// A grade (`ISO 1`, `ASME AS-1`, …).
#[derive(Debug, Clone, Copy)]
pub(super) struct YGrade(pub Grade);

impl<'de> Deserialize<'de> for YGrade {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = YGrade;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a grade, e.g. ISO 1 or ASME AS-1")
            }
            fn visit_str<E: de::Error>(self, s: &str) -> Result<YGrade, E> {
                s.parse().map(YGrade).map_err(E::custom)
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<YGrade, E> {
                self.visit_str(&v.to_string())
            }
        }
        d.deserialize_str(V)
    }
}

/// A standard set's id.
#[derive(Debug, Clone)]
pub(super) struct YCatalogue(pub String);

impl<'de> Deserialize<'de> for YCatalogue {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = YCatalogue;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a standard set: inch-81, metric-88 or metric-112")
            }
            fn visit_str<E: de::Error>(self, s: &str) -> Result<YCatalogue, E> {
                catalogue::set(s)
                    .map(|c| YCatalogue(c.id.to_string()))
                    .ok_or_else(|| {
                        E::custom(format!(
                            "'{}' is not a standard set tiltbook knows; write inch-81, metric-88 or metric-112, or list the sizes with `sizes:` instead",
                            s.trim()
                        ))
                    })
            }
        }
        d.deserialize_str(V)
    }
}

/// What blocks are made of.
#[derive(Debug, Clone)]
pub(super) struct YMaterial(pub String);

impl<'de> Deserialize<'de> for YMaterial {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = YMaterial;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("steel, chrome carbide, tungsten carbide or ceramic")
            }
            fn visit_str<E: de::Error>(self, s: &str) -> Result<YMaterial, E> {
                let w = s.trim().to_ascii_lowercase().replace(['_', '-'], " ");
                match w.as_str() {
                    "steel" | "chrome carbide" | "tungsten carbide" | "ceramic" => Ok(YMaterial(w)),
                    _ => Err(E::custom(format!(
                        "'{}' is not a block material tiltbook knows; write steel, chrome carbide, tungsten carbide or ceramic",
                        s.trim()
                    ))),
                }
            }
        }
        d.deserialize_str(V)
    }
}
