//! The standard gauge-block sets tiltbook knows by name, the usual protector (wear) block pairs,
//! and the grades a set can carry.
//!
//! Compositions (see `/work/shared/reference-data/standards.md`):
//! - `inch-81`: 0.1001–0.1009 in step 0.0001 (9); 0.101–0.149 in step 0.001 (49);
//!   0.050–0.950 in step 0.050 (19); 1, 2, 3, 4 in (4). Common practice; secondary reference
//!   pages agree.
//! - `metric-88`: 1.0005 mm (1); 1.001–1.009 step 0.001 (9); 1.01–1.49 step 0.01 (49);
//!   0.5–9.5 step 0.5 (19); 10–100 step 10 (10). **From memory** (common practice), not checked
//!   against a published list.
//! - `metric-112`: 1.0005 mm (1); 1.001–1.009 (9); 1.01–1.49 (49); 0.5–24.5 step 0.5 (49);
//!   25, 50, 75, 100 mm (4). **From memory** (common practice), not checked against a published
//!   list.
//! - Protector pairs 0.050 in, 1 mm and 2 mm: common practice (no source).

use crate::units::{Length, Unit};
use serde::{Deserialize, Serialize};
use std::fmt;
use std::str::FromStr;
use thiserror::Error;

/// The ids of the standard sets, in the order they are listed.
pub const SET_IDS: [&str; 3] = ["inch-81", "metric-88", "metric-112"];

/// One standard set: its sizes, each with how many blocks of that size it has.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct CatalogueSet {
    /// The id a shop file or `--set` uses, e.g. `inch-81`.
    pub id: &'static str,
    /// A plain description.
    pub name: &'static str,
    /// The unit the sizes are marked in.
    pub unit: Unit,
    /// Sizes and how many of each, in the order the series are listed above.
    pub sizes: Vec<(Length, u32)>,
    /// Where the composition comes from and how sure it is.
    pub source: &'static str,
}

impl CatalogueSet {
    /// Number of blocks in the set.
    pub fn count(&self) -> u32 {
        self.sizes.iter().map(|(_, n)| n).sum()
    }
}

/// A series `first, first+step, … last` (inclusive), in units of 10^-`places` of `unit`.
fn series(unit: Unit, places: u32, first: i64, last: i64, step: i64) -> Vec<(Length, u32)> {
    let mut v = Vec::new();
    let mut x = first;
    while x <= last {
        if let Some(l) = Length::from_scaled(x, unit, places) {
            v.push((l, 1));
        }
        x += step;
    }
    v
}

/// The standard set with this id (`inch-81`, `metric-88`, `metric-112`), if tiltbook knows it.
pub fn set(id: &str) -> Option<CatalogueSet> {
    let id = id.trim().to_ascii_lowercase();
    match id.as_str() {
        "inch-81" => {
            // units of 0.0001 in
            let mut s = series(Unit::In, 4, 1001, 1009, 1);
            s.extend(series(Unit::In, 4, 1010, 1490, 10));
            s.extend(series(Unit::In, 4, 500, 9500, 500));
            s.extend(series(Unit::In, 4, 10_000, 40_000, 10_000));
            Some(CatalogueSet {
                id: "inch-81",
                name: "inch set, 81 pieces",
                unit: Unit::In,
                sizes: s,
                source: "common practice; secondary reference pages agree",
            })
        }
        "metric-88" => {
            // units of 0.0001 mm
            let mut s = series(Unit::Mm, 4, 10_005, 10_005, 1);
            s.extend(series(Unit::Mm, 4, 10_010, 10_090, 10));
            s.extend(series(Unit::Mm, 4, 10_100, 14_900, 100));
            s.extend(series(Unit::Mm, 4, 5_000, 95_000, 5_000));
            s.extend(series(Unit::Mm, 4, 100_000, 1_000_000, 100_000));
            Some(CatalogueSet {
                id: "metric-88",
                name: "metric set, 88 pieces",
                unit: Unit::Mm,
                sizes: s,
                source: "from memory (common practice); not checked against a published list",
            })
        }
        "metric-112" => {
            let mut s = series(Unit::Mm, 4, 10_005, 10_005, 1);
            s.extend(series(Unit::Mm, 4, 10_010, 10_090, 10));
            s.extend(series(Unit::Mm, 4, 10_100, 14_900, 100));
            s.extend(series(Unit::Mm, 4, 5_000, 245_000, 5_000));
            s.extend(series(Unit::Mm, 4, 250_000, 1_000_000, 250_000));
            Some(CatalogueSet {
                id: "metric-112",
                name: "metric set, 112 pieces",
                unit: Unit::Mm,
                sizes: s,
                source: "from memory (common practice); not checked against a published list",
            })
        }
        _ => None,
    }
}

/// The standard sets.
pub fn sets() -> Vec<CatalogueSet> {
    SET_IDS.iter().filter_map(|id| set(id)).collect()
}

/// The usual protector (wear) block pairs: id and size. Common practice (no source).
pub fn protector_pairs() -> [(&'static str, Length); 3] {
    [
        ("protector-0.050in", Length::from_nm(Unit::In.nm() / 20)),
        ("protector-1mm", Length::from_nm(Unit::Mm.nm())),
        ("protector-2mm", Length::from_nm(2 * Unit::Mm.nm())),
    ]
}

/// The size of a usual protector pair by id (`protector-0.050in`, `protector-1mm`, `protector-2mm`).
pub fn protector_pair(id: &str) -> Option<Length> {
    let id = id.trim().to_ascii_lowercase();
    protector_pairs()
        .into_iter()
        .find(|(k, _)| *k == id)
        .map(|(_, l)| l)
}

/// A gauge-block grade: the ISO 3650 classes K, 0, 1, 2 or the ASME B89.1.9 classes K, 0,
/// AS-1, AS-2 and 00.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Grade {
    IsoK,
    Iso0,
    Iso1,
    Iso2,
    AsmeK,
    Asme0,
    AsmeAs1,
    AsmeAs2,
    Asme00,
}

/// A grade that cannot be read.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
#[error(
    "'{0}' is not a gauge-block grade tiltbook knows; write ISO K, ISO 0, ISO 1, ISO 2, or ASME K, ASME 0, ASME AS-1, ASME AS-2, ASME 00"
)]
pub struct GradeError(pub String);

impl Grade {
    /// Every grade.
    pub const ALL: [Grade; 9] = [
        Grade::IsoK,
        Grade::Iso0,
        Grade::Iso1,
        Grade::Iso2,
        Grade::AsmeK,
        Grade::Asme0,
        Grade::AsmeAs1,
        Grade::AsmeAs2,
        Grade::Asme00,
    ];

    /// The ISO 3650 class this grade is stated to equal (`K`, `0`, `1`, `2`), `None` for ASME 00,
    /// which has no ISO counterpart. ASME K, 0, AS-1, AS-2 are stated (publisher's abstract of
    /// ASME B89.1.9) to be identical to ISO 3650 K, 0, 1, 2 apart from measuring orientation.
    pub fn iso_class(self) -> Option<&'static str> {
        match self {
            Grade::IsoK | Grade::AsmeK => Some("K"),
            Grade::Iso0 | Grade::Asme0 => Some("0"),
            Grade::Iso1 | Grade::AsmeAs1 => Some("1"),
            Grade::Iso2 | Grade::AsmeAs2 => Some("2"),
            Grade::Asme00 => None,
        }
    }

    /// The tolerance class the uncertainty budget uses for this grade (`None` for ASME 00, whose
    /// limits are not in the table tiltbook carries; the budget then needs a calibrated value).
    pub fn tolerance_class(self) -> Option<crate::uncertainty::Grade> {
        use crate::uncertainty::Grade as Class;
        match self {
            Grade::IsoK | Grade::AsmeK => Some(Class::K),
            Grade::Iso0 | Grade::Asme0 => Some(Class::Zero),
            Grade::Iso1 | Grade::AsmeAs1 => Some(Class::One),
            Grade::Iso2 | Grade::AsmeAs2 => Some(Class::Two),
            Grade::Asme00 => None,
        }
    }
}

impl fmt::Display for Grade {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Grade::IsoK => "ISO K",
            Grade::Iso0 => "ISO 0",
            Grade::Iso1 => "ISO 1",
            Grade::Iso2 => "ISO 2",
            Grade::AsmeK => "ASME K",
            Grade::Asme0 => "ASME 0",
            Grade::AsmeAs1 => "ASME AS-1",
            Grade::AsmeAs2 => "ASME AS-2",
            Grade::Asme00 => "ASME 00",
        })
    }
}

impl FromStr for Grade {
    type Err = GradeError;
    /// Reads `ISO 1`, `iso-1`, `ISO 3650 grade 1`, `ASME AS-1`, `ASME B89.1.9 AS-2`, `AS-1`,
    /// `00`, or a bare `K`/`0`/`1`/`2` (taken as ISO 3650).
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        let up = s.trim().to_ascii_uppercase().replace(['_', '-'], " ");
        let words: Vec<&str> = up
            .split_whitespace()
            .filter(|w| !matches!(*w, "GRADE" | "3650" | "B89.1.9" | "B89"))
            .collect();
        let (std, rest) = match words.first() {
            Some(&"ISO") => (Some(false), &words[1..]),
            Some(&"ASME") => (Some(true), &words[1..]),
            _ => (None, &words[..]),
        };
        let class = rest.join("");
        let g = match (std, class.as_str()) {
            (Some(false) | None, "K") => Grade::IsoK,
            (Some(false) | None, "0") => Grade::Iso0,
            (Some(false) | None, "1") => Grade::Iso1,
            (Some(false) | None, "2") => Grade::Iso2,
            (Some(true), "K") => Grade::AsmeK,
            (Some(true), "0") => Grade::Asme0,
            (Some(true) | None, "AS1") => Grade::AsmeAs1,
            (Some(true) | None, "AS2") => Grade::AsmeAs2,
            (Some(true) | None, "00") => Grade::Asme00,
            _ => return Err(GradeError(s.trim().to_string())),
        };
        Ok(g)
    }
}

impl Serialize for Grade {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&self.to_string())
    }
}

impl<'de> Deserialize<'de> for Grade {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let s = String::deserialize(d)?;
        s.parse().map_err(serde::de::Error::custom)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grades_read_back_what_they_print() {
        for g in Grade::ALL {
            assert_eq!(g.to_string().parse::<Grade>(), Ok(g));
        }
        assert_eq!("iso-1".parse::<Grade>(), Ok(Grade::Iso1));
        assert_eq!("ISO 3650 grade 0".parse::<Grade>(), Ok(Grade::Iso0));
        assert_eq!("AS-2".parse::<Grade>(), Ok(Grade::AsmeAs2));
        assert_eq!("asme b89.1.9 as-1".parse::<Grade>(), Ok(Grade::AsmeAs1));
        assert!("ISO 00".parse::<Grade>().is_err());
        assert!("3".parse::<Grade>().is_err());
        assert_eq!(Grade::Asme00.iso_class(), None);
        assert_eq!(Grade::AsmeAs1.iso_class(), Some("1"));
    }

    #[test]
    fn protector_ids() {
        assert_eq!(
            protector_pair("protector-2mm").map(|l| l.nm()),
            Some(2_000_000)
        );
        assert_eq!(
            protector_pair("protector-0.050in").map(|l| l.nm()),
            Some(1_270_000)
        );
        assert!(protector_pair("protector-3mm").is_none());
    }
}
