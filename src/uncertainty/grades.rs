//! Reference data the budget needs: gauge-block grade tolerances and thermal expansion.
//!
//! Grade tolerances: ISO 3650 grades K, 0, 1, 2, limit deviation t_e (± µm) by nominal length,
//! as reproduced (secondary source) from the DIN 861 table stated to correspond to ISO 3650.
//! Grade K is given t_e as grade 1 (from memory, unverified). ASME B89.1.9 grades K, 0, AS-1,
//! AS-2 are stated (publisher's abstract) to be identical to ISO 3650 grades K, 0, 1, 2.
//! Thermal expansion: steel gauge blocks 11.5 × 10⁻⁶ /K (J. Res. NIST 99, 31 (1994)); chrome
//! carbide 8.4 and tungsten carbide about 4 × 10⁻⁶ /K (secondary, citing NIST); ceramic
//! (zirconia) 9.2–9.5 × 10⁻⁶ /K (secondary / from memory), taken here as 9.35.

use crate::units::Length;
use serde::{Deserialize, Serialize};
use std::fmt;
use std::str::FromStr;
use thiserror::Error;

/// Where the grade table comes from, for reports.
pub const GRADE_SOURCE: &str = "ISO 3650 limit deviations t_e (DIN 861 table as reproduced on engineering reference pages; grade K as grade 1, from memory)";

/// A gauge-block grade (tolerance class).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum Grade {
    /// Calibration grade K (ASME K).
    #[serde(rename = "K")]
    K,
    /// Grade 0 (ASME 0).
    #[serde(rename = "0")]
    Zero,
    /// Grade 1 (ASME AS-1).
    #[serde(rename = "1", alias = "AS-1")]
    One,
    /// Grade 2 (ASME AS-2).
    #[serde(rename = "2", alias = "AS-2")]
    Two,
}

/// A grade that cannot be read, or a block the table does not cover.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum GradeError {
    #[error(
        "'{0}' is not a gauge-block grade tiltbook knows; use K, 0, 1 or 2 (ISO 3650), or the ASME names K, 0, AS-1, AS-2"
    )]
    Unknown(String),
    #[error(
        "grade 00 has no tolerance in tiltbook's table; give the blocks' calibrated uncertainty instead, or the grade they meet (K, 0, 1 or 2)"
    )]
    DoubleZero,
    #[error(
        "a {0} mm block is outside the grade table (0.5 mm to 150 mm); give the block's calibrated uncertainty instead"
    )]
    OutsideTable(String),
}

/// Upper end of each nominal-length row (mm, the row covers lengths above the previous end up
/// to and including this one; the first row starts at 0.5 mm), and t_e in nm for K, 0, 1, 2.
const TE_TABLE: [(i64, [i64; 4]); 6] = [
    (10, [200, 120, 200, 450]),
    (25, [300, 140, 300, 600]),
    (50, [400, 200, 400, 800]),
    (75, [500, 250, 500, 1000]),
    (100, [600, 300, 600, 1200]),
    (150, [800, 400, 800, 1600]),
];

impl Grade {
    /// Every grade in the table.
    pub const ALL: [Grade; 4] = [Grade::K, Grade::Zero, Grade::One, Grade::Two];

    fn column(self) -> usize {
        match self {
            Grade::K => 0,
            Grade::Zero => 1,
            Grade::One => 2,
            Grade::Two => 3,
        }
    }
    /// The ISO 3650 name.
    pub fn iso(self) -> &'static str {
        match self {
            Grade::K => "K",
            Grade::Zero => "0",
            Grade::One => "1",
            Grade::Two => "2",
        }
    }
    /// The ASME B89.1.9 name.
    pub fn asme(self) -> &'static str {
        match self {
            Grade::K => "K",
            Grade::Zero => "0",
            Grade::One => "AS-1",
            Grade::Two => "AS-2",
        }
    }
    /// The limit deviation ±t_e for a block of `nominal` length.
    pub fn limit_deviation(self, nominal: Length) -> Result<Length, GradeError> {
        let nm = nominal.nm().abs();
        let mm = crate::units::NM_PER_MM;
        if nm < mm / 2 {
            return Err(GradeError::OutsideTable(
                nominal.exact_number(crate::units::Unit::Mm, 0),
            ));
        }
        TE_TABLE
            .iter()
            .find(|(upper, _)| nm <= upper * mm)
            .map(|(_, te)| Length::from_nm(te[self.column()]))
            .ok_or_else(|| {
                GradeError::OutsideTable(nominal.exact_number(crate::units::Unit::Mm, 0))
            })
    }
}

impl fmt::Display for Grade {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Grade::One | Grade::Two => write!(f, "grade {} ({})", self.iso(), self.asme()),
            _ => write!(f, "grade {}", self.iso()),
        }
    }
}

impl FromStr for Grade {
    type Err = GradeError;
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        let t = s.trim().to_ascii_uppercase();
        let t = t.strip_prefix("GRADE").unwrap_or(&t).trim();
        match t {
            "K" => Ok(Grade::K),
            "0" => Ok(Grade::Zero),
            "1" | "AS-1" | "AS1" => Ok(Grade::One),
            "2" | "AS-2" | "AS2" => Ok(Grade::Two),
            "00" => Err(GradeError::DoubleZero),
            _ => Err(GradeError::Unknown(s.trim().to_string())),
        }
    }
}

/// What a gauge block (or a fixture) is made of, for thermal expansion.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Material {
    Steel,
    ChromeCarbide,
    TungstenCarbide,
    Ceramic,
}

impl Material {
    /// Linear expansion coefficient, per kelvin.
    pub fn alpha_per_k(self) -> f64 {
        match self {
            Material::Steel => 11.5e-6,
            Material::ChromeCarbide => 8.4e-6,
            Material::TungstenCarbide => 4.0e-6,
            Material::Ceramic => 9.35e-6,
        }
    }
    /// Where the coefficient comes from and how sure it is.
    pub fn source(self) -> &'static str {
        match self {
            Material::Steel => "J. Res. NIST 99, 31 (1994)",
            Material::ChromeCarbide => "secondary, citing NIST",
            Material::TungstenCarbide => "about 4, secondary, citing NIST",
            Material::Ceramic => "9.2 to 9.5, secondary / from memory; middle taken",
        }
    }
    /// In words.
    pub fn words(self) -> &'static str {
        match self {
            Material::Steel => "steel",
            Material::ChromeCarbide => "chrome carbide",
            Material::TungstenCarbide => "tungsten carbide",
            Material::Ceramic => "ceramic",
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grade_table_rows_and_edges() {
        // standards.md, "Grade tolerances" (secondary DIN 861 / ISO 3650 table)
        let mm = |v: i64| Length::from_nm(v * 1_000_000);
        assert_eq!(
            Grade::Zero.limit_deviation(mm(10)),
            Ok(Length::from_nm(120))
        );
        assert_eq!(
            Grade::Zero.limit_deviation(mm(11)),
            Ok(Length::from_nm(140))
        );
        assert_eq!(
            Grade::Two.limit_deviation(mm(100)),
            Ok(Length::from_nm(1200))
        );
        assert_eq!(
            Grade::One.limit_deviation(mm(150)),
            Ok(Length::from_nm(800))
        );
        assert_eq!(Grade::K.limit_deviation(mm(60)), Ok(Length::from_nm(500)));
        assert!(Grade::One.limit_deviation(mm(151)).is_err());
        assert!(
            Grade::One
                .limit_deviation(Length::from_nm(400_000))
                .is_err()
        );
        // a 4 in block (101.6 mm) is in the 100–150 mm row
        assert_eq!(
            Grade::One.limit_deviation(Length::inches(4.0)),
            Ok(Length::from_nm(800))
        );
    }

    #[test]
    fn grade_names() {
        assert_eq!("AS-1".parse::<Grade>(), Ok(Grade::One));
        assert_eq!("grade 2".parse::<Grade>(), Ok(Grade::Two));
        assert_eq!("k".parse::<Grade>(), Ok(Grade::K));
        assert_eq!("00".parse::<Grade>(), Err(GradeError::DoubleZero));
        assert!(
            "3".parse::<Grade>()
                .is_err_and(|e| e.to_string().contains("AS-1"))
        );
    }
}
