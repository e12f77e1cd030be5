//! The uncertainty budget of an angle set on a sine fixture and checked with an indicator sweep
//! (GUM, JCGM 100): each contribution is a standard uncertainty of an input quantity times its
//! sensitivity, in arc-seconds; they combine in quadrature to u_c, and U = 2·u_c.
//!
//! [`budget`] is a pure function from a setup and a list of [`Contribution`]s to a [`Budget`];
//! [`decide`] turns a deviation, a tolerance and U into a [`Verdict`].

mod decision;
mod grades;

pub use decision::{Decision, Rule, Verdict, decide};
pub use grades::{GRADE_SOURCE, Grade, GradeError, Material};

use crate::geometry::{GeometryError, SineFixture};
use crate::units::{Angle, Length};
use thiserror::Error;

/// Standard uncertainty of one wrung joint in a stack: 0.025 µm. The wringing film is commonly
/// quoted as a few hundredths of a micrometre: common practice (no source).
pub const DEFAULT_JOINT_NM: f64 = 25.0;

/// Coverage factor for U (about 95 % for a normal distribution).
pub const COVERAGE_K: f64 = 2.0;

const ARCSEC_PER_RAD: f64 = 180.0 * 3600.0 / std::f64::consts::PI;

/// Why a budget cannot be drawn up.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum UncertaintyError {
    #[error(transparent)]
    Geometry(#[from] GeometryError),
    #[error(transparent)]
    Grade(#[from] GradeError),
    #[error("the stack has no blocks; list the blocks wrung, e.g. 2in 0.5in 0.1001in")]
    NoBlocks,
    #[error(
        "the indicator positions have no spread, so a reading's uncertainty cannot be turned into an angle; give the travel or the positions"
    )]
    NoTravel,
    #[error("{0} must be a finite number zero or more; check what was given")]
    BadValue(&'static str),
}

/// One source of uncertainty, as the shop knows it.
#[derive(Debug, Clone, PartialEq)]
pub enum Contribution {
    /// The blocks of the stack, graded: t_e/√3 per block in quadrature (rectangular), plus a
    /// term per wrung joint (blocks − 1 joints).
    Stack {
        blocks: Vec<Length>,
        grade: Grade,
        /// Standard uncertainty per wrung joint, nm (see [`DEFAULT_JOINT_NM`]).
        per_joint_nm: f64,
    },
    /// A stack whose blocks carry calibrated values: the combined standard uncertainty given.
    StackCalibrated { u: Length },
    /// The fixture's centre distance: its standard uncertainty from calibration
    /// (a certificate's U divided by its k). Sensitivity tan θ / C.
    CenterCalibration { u: Length },
    /// A roll-diameter difference d_p − d_r not corrected for, taken as a limit: the height is
    /// off by up to half of it, rectangular (/√3).
    RollDifference { limit: Length },
    /// A temperature difference between stack and fixture of up to `limit_k` kelvin,
    /// rectangular (/√3), moving the height by α·H·δT.
    Temperature { alpha_per_k: f64, limit_k: f64 },
    /// Indicator resolution: resolution/√12 per reading, turned into slope by 1/√Sxx.
    IndicatorResolution { resolution: Length, sxx_nm2: f64 },
    /// Indicator repeatability u_r (one reading's standard deviation), over the travel by
    /// 1/√Sxx: √2·u_r/travel for two readings, the slope's standard uncertainty for n.
    IndicatorRepeatability { u_r: Length, sxx_nm2: f64 },
    /// The scatter of three or more readings about the fitted line: the residual angle's
    /// standard deviation (type A), used instead of a repeatability figure when there is none.
    SweepScatter { angle_sd: Angle },
    /// Anything else, already as a standard uncertainty in angle.
    Other { source: String, u: Angle },
}

/// The unit a line's input value is shown in.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum InputUnit {
    Micrometre,
    Kelvin,
    Arcsec,
}

impl InputUnit {
    pub fn symbol(self) -> &'static str {
        match self {
            InputUnit::Micrometre => "µm",
            InputUnit::Kelvin => "K",
            InputUnit::Arcsec => "\"",
        }
    }
}

/// One line of the budget.
#[derive(Debug, Clone, PartialEq)]
pub struct Line {
    /// The source, in words.
    pub source: String,
    /// Standard uncertainty of the input quantity, in `unit`.
    pub value: f64,
    pub unit: InputUnit,
    /// Arc-seconds per one `unit` (magnitude).
    pub sensitivity: f64,
    /// |sensitivity × value|, arc-seconds.
    pub arcsec: f64,
}

/// The whole budget.
#[derive(Debug, Clone, PartialEq)]
pub struct Budget {
    pub lines: Vec<Line>,
    /// Combined standard uncertainty u_c.
    pub combined: Angle,
    pub k: f64,
    /// Expanded uncertainty U = k·u_c.
    pub expanded: Angle,
}

impl Budget {
    /// A plain-text table: source, value, sensitivity, contribution.
    pub fn text(&self) -> String {
        let mut s = format!(
            "{:<46} {:>12} {:>14} {:>10}\n",
            "source", "value (u)", "sensitivity", "in angle"
        );
        for l in &self.lines {
            s.push_str(&format!(
                "{:<46} {:>9.4} {:<2} {:>9.4} \"/{:<2} {:>9.2}\"\n",
                l.source,
                l.value,
                l.unit.symbol(),
                l.sensitivity,
                l.unit.symbol(),
                l.arcsec
            ));
        }
        s.push_str(&format!(
            "combined standard uncertainty u_c = {:.2}\"\nexpanded uncertainty U = {:.2}\" (k = {})\n",
            self.combined.arcsec(),
            self.expanded.arcsec(),
            self.k
        ));
        s
    }
}

/// Where the angle is set: the fixture and the setting θ (the stack H = C·sin θ).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Setup {
    pub fixture: SineFixture,
    pub angle: Angle,
}

fn finite_non_negative(v: f64, what: &'static str) -> Result<f64, UncertaintyError> {
    if v.is_finite() && v >= 0.0 {
        Ok(v)
    } else {
        Err(UncertaintyError::BadValue(what))
    }
}

/// Draw up the budget for `setup` from `contributions`, in the order given.
pub fn budget(setup: &Setup, contributions: &[Contribution]) -> Result<Budget, UncertaintyError> {
    let height_nm = setup.fixture.ideal_height_nm(setup.angle)?;
    let c_nm = setup.fixture.center.nm() as f64;
    let theta = setup.angle.rad();
    // arc-seconds per µm of stack height: 1/(C·cos θ)
    let per_um_height = 1000.0 / (c_nm * theta.cos()) * ARCSEC_PER_RAD;
    let um = |l: Length| l.nm() as f64 / 1000.0;
    let mut lines = Vec::new();
    for c in contributions {
        let line = match c {
            Contribution::Stack {
                blocks,
                grade,
                per_joint_nm,
            } => {
                if blocks.is_empty() {
                    return Err(UncertaintyError::NoBlocks);
                }
                let joint = finite_non_negative(*per_joint_nm, "the per-joint uncertainty")?;
                let mut sum = 0.0;
                for b in blocks {
                    let te = grade.limit_deviation(*b)?.nm() as f64 / 3f64.sqrt();
                    sum += te * te;
                }
                let blocks_u = sum.sqrt() / 1000.0;
                lines.push(Line {
                    source: format!(
                        "stack: {} block{}, {grade}, t_e/√3",
                        blocks.len(),
                        if blocks.len() == 1 { "" } else { "s" }
                    ),
                    value: blocks_u,
                    unit: InputUnit::Micrometre,
                    sensitivity: per_um_height,
                    arcsec: blocks_u * per_um_height,
                });
                let joints = blocks.len() - 1;
                if joints == 0 {
                    continue;
                }
                let u = joint * (joints as f64).sqrt() / 1000.0;
                Line {
                    source: format!(
                        "wringing: {joints} joint{} × {:.3} µm",
                        if joints == 1 { "" } else { "s" },
                        joint / 1000.0
                    ),
                    value: u,
                    unit: InputUnit::Micrometre,
                    sensitivity: per_um_height,
                    arcsec: u * per_um_height,
                }
            }
            Contribution::StackCalibrated { u } => Line {
                source: "stack: calibrated block values".into(),
                value: um(u.abs()),
                unit: InputUnit::Micrometre,
                sensitivity: per_um_height,
                arcsec: um(u.abs()) * per_um_height,
            },
            Contribution::CenterCalibration { u } => {
                let sens = theta.tan() / c_nm * 1000.0 * ARCSEC_PER_RAD;
                Line {
                    source: "centre distance calibration".into(),
                    value: um(u.abs()),
                    unit: InputUnit::Micrometre,
                    sensitivity: sens,
                    arcsec: um(u.abs()) * sens,
                }
            }
            Contribution::RollDifference { limit } => {
                let u = um(limit.abs()) / 2.0 / 3f64.sqrt();
                Line {
                    source: format!(
                        "rolls differ ≤ {:.2} µm, uncorrected (½, /√3)",
                        um(limit.abs())
                    ),
                    value: u,
                    unit: InputUnit::Micrometre,
                    sensitivity: per_um_height,
                    arcsec: u * per_um_height,
                }
            }
            Contribution::Temperature {
                alpha_per_k,
                limit_k,
            } => {
                let a = finite_non_negative(*alpha_per_k, "the expansion coefficient")?;
                let t = finite_non_negative(limit_k.abs(), "the temperature difference")?;
                let u = t / 3f64.sqrt();
                // α·H µm per kelvin, times 1/(C cos θ)
                let sens = a * height_nm / 1000.0 * per_um_height;
                Line {
                    source: format!("temperature, stack vs fixture ≤ {t} K (/√3)"),
                    value: u,
                    unit: InputUnit::Kelvin,
                    sensitivity: sens,
                    arcsec: u * sens,
                }
            }
            Contribution::IndicatorResolution {
                resolution,
                sxx_nm2,
            } => {
                let sxx = finite_non_negative(*sxx_nm2, "Sxx")?;
                if sxx <= 0.0 {
                    return Err(UncertaintyError::NoTravel);
                }
                let u = um(resolution.abs()) / 12f64.sqrt();
                let sens = 1000.0 / sxx.sqrt() * ARCSEC_PER_RAD;
                Line {
                    source: format!("indicator resolution {:.2} µm (/√12)", um(resolution.abs())),
                    value: u,
                    unit: InputUnit::Micrometre,
                    sensitivity: sens,
                    arcsec: u * sens,
                }
            }
            Contribution::IndicatorRepeatability { u_r, sxx_nm2 } => {
                let sxx = finite_non_negative(*sxx_nm2, "Sxx")?;
                if sxx <= 0.0 {
                    return Err(UncertaintyError::NoTravel);
                }
                let u = um(u_r.abs());
                let sens = 1000.0 / sxx.sqrt() * ARCSEC_PER_RAD;
                Line {
                    source: "indicator repeatability".into(),
                    value: u,
                    unit: InputUnit::Micrometre,
                    sensitivity: sens,
                    arcsec: u * sens,
                }
            }
            Contribution::SweepScatter { angle_sd } => Line {
                source: "scatter of the readings about the line".into(),
                value: angle_sd.arcsec().abs(),
                unit: InputUnit::Arcsec,
                sensitivity: 1.0,
                arcsec: angle_sd.arcsec().abs(),
            },
            Contribution::Other { source, u } => Line {
                source: source.clone(),
                value: u.arcsec().abs(),
                unit: InputUnit::Arcsec,
                sensitivity: 1.0,
                arcsec: u.arcsec().abs(),
            },
        };
        lines.push(line);
    }
    let uc = lines
        .iter()
        .map(|l| l.arcsec * l.arcsec)
        .sum::<f64>()
        .sqrt();
    Ok(Budget {
        lines,
        combined: Angle::from_arcsec(uc),
        k: COVERAGE_K,
        expanded: Angle::from_arcsec(COVERAGE_K * uc),
    })
}

/// Sxx for two readings at the ends of `travel`: travel²/2 (so 1/√Sxx = √2/travel).
pub fn sxx_two_readings(travel: Length) -> f64 {
    let t = travel.nm() as f64;
    t * t / 2.0
}

#[cfg(test)]
mod tests;
