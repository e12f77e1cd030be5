//! What the kinds of feature need beyond a plain angle: a taper's half and included angles,
//! a compound angle's two views and two plates, and the words screens and reports show for
//! the angle of any feature.

use super::model::*;
use crate::geometry::{CompoundSetting, GeometryError};
use crate::units::{Angle, Length};

impl Taper {
    /// The half angle (the setting angle on sine centres): atan(D / (2·len)).
    pub fn half_angle(&self) -> Result<Angle, String> {
        let given = [
            self.ratio.is_some(),
            self.per_foot.is_some(),
            self.included.is_some(),
            self.half.is_some(),
        ]
        .iter()
        .filter(|b| **b)
        .count();
        if given != 1 {
            return Err(format!(
                "give exactly one of ratio, per_foot, included or half (found {given}), e.g. `taper: {{ ratio: \"1:20\" }}`"
            ));
        }
        if let Some(r) = &self.ratio {
            let k = parse_ratio(r)?;
            return Ok(Angle::from_rad((1.0 / (2.0 * k)).atan()));
        }
        if let Some(d) = self.per_foot {
            if d.nm() <= 0 {
                return Err("per_foot must be more than zero, e.g. \"0.6250 in\"".into());
            }
            let foot = Length::from_nm(12 * crate::units::NM_PER_INCH);
            return Ok(Angle::from_rad(
                (d.nm() as f64 / (2.0 * foot.nm() as f64)).atan(),
            ));
        }
        if let Some(a) = self.included {
            return Ok(Angle::from_deg(a.deg() / 2.0));
        }
        self.half.ok_or_else(|| "no taper given".to_string())
    }
}

/// Parse a taper ratio `1:k` (diameter change 1 over length k); returns k.
pub fn parse_ratio(text: &str) -> Result<f64, String> {
    let bad = || format!("taper ratio '{text}' is not of the form 1:k; write it like \"1:20\"");
    let (a, b) = text.split_once(':').ok_or_else(bad)?;
    let a: f64 = a.trim().parse().map_err(|_| bad())?;
    let b: f64 = b.trim().parse().map_err(|_| bad())?;
    if !(a.is_finite() && b.is_finite()) || a <= 0.0 || b <= 0.0 {
        return Err(bad());
    }
    Ok(b / a)
}

impl Compound {
    /// (near plate, far plate) setting angles: the near plate is set to its own view angle,
    /// the far one to atan(tan(far view) · cos(near view)).
    pub fn plate_angles(&self) -> (Angle, Angle) {
        let (near, far) = match self.near {
            NearPlate::A => (self.a, self.b),
            NearPlate::B => (self.b, self.a),
        };
        let far_set = Angle::from_rad((far.rad().tan() * near.rad().cos()).atan());
        (near, far_set)
    }
    /// True slope of the plane: atan(√(tan²A + tan²B)).
    pub fn true_slope(&self) -> Angle {
        let (ta, tb) = (self.a.rad().tan(), self.b.rad().tan());
        Angle::from_rad((ta * ta + tb * tb).sqrt().atan())
    }
}

/// Which plate a view belongs to, in words (`A`, `B`).
impl NearPlate {
    /// The letter of this view.
    pub fn letter(self) -> &'static str {
        match self {
            NearPlate::A => "A",
            NearPlate::B => "B",
        }
    }
    /// The other view.
    pub fn other(self) -> NearPlate {
        match self {
            NearPlate::A => NearPlate::B,
            NearPlate::B => NearPlate::A,
        }
    }
}

impl Compound {
    /// The near plate's view slope, then the other view's.
    pub fn views(&self) -> (Angle, Angle) {
        match self.near {
            NearPlate::A => (self.a, self.b),
            NearPlate::B => (self.b, self.a),
        }
    }
    /// The letters of the near plate's view and the other view: ("A", "B") when near is A.
    pub fn letters(&self) -> (&'static str, &'static str) {
        (self.near.letter(), self.near.other().letter())
    }
    /// Both plates' settings, the heights they need and the true slope.
    pub fn setting(&self) -> Result<CompoundSetting, GeometryError> {
        let (n, o) = self.views();
        crate::geometry::compound(n, o)
    }
    /// The view slopes (near view, other view) that plates set to `near_plate` and
    /// `other_plate` level: the near view is the near plate's angle, the other is
    /// atan(tan other_plate / cos near_plate).
    pub fn views_levelled(near_plate: Angle, other_plate: Angle) -> (Angle, Angle) {
        crate::blocks::plates::views_for_plates(near_plate, other_plate)
    }
    /// `A 30°00' / B 20°00' (true slope 34°19')`.
    pub fn words(&self) -> String {
        format!(
            "A {} / B {} (true slope {})",
            short(self.a),
            short(self.b),
            self.true_slope().dm()
        )
    }
}

impl Taper {
    /// The included angle, twice the half angle.
    pub fn included_angle(&self) -> Result<Angle, String> {
        self.half_angle().map(|h| Angle::from_deg(2.0 * h.deg()))
    }
    /// How the drawing gives it: `1:20`, `0.6250 in per foot`, `included 3°00'`, `half 1°30'`.
    pub fn given(&self) -> String {
        if let Some(r) = &self.ratio {
            r.clone()
        } else if let Some(p) = self.per_foot {
            format!("{} per foot", p.show(crate::units::Unit::In))
        } else if let Some(i) = self.included {
            format!("included {}", i.dms(0))
        } else if let Some(h) = self.half {
            format!("half {}", h.dms(0))
        } else {
            String::new()
        }
    }
}

/// An angle in degrees and minutes when it has no seconds, else with its seconds.
pub fn short(a: Angle) -> String {
    let secs = (a.arcsec().abs().round() as i64) % 60;
    if secs == 0 { a.dm() } else { a.dms(0) }
}

impl Feature {
    /// The angle as screens and reports name it: the nominal for a plain angle;
    /// `half 1°25'56" · incl 2°51'51"` for a taper; `A 30°00' / B 20°00' (true slope 34°19')`
    /// for a compound angle.
    pub fn angle_words(&self) -> String {
        match self.kind {
            FeatureKind::Compound => match &self.compound {
                Some(c) => c.words(),
                None => "no angle".into(),
            },
            FeatureKind::Taper => match self.taper.as_ref().map(Taper::half_angle) {
                Some(Ok(h)) => format!(
                    "half {} · incl {}",
                    h.dms(0),
                    Angle::from_deg(2.0 * h.deg()).dms(0)
                ),
                _ => self.nominal.map_or("no angle".into(), |n| n.dms(0)),
            },
            FeatureKind::Plain => self.nominal.map_or("no angle".into(), |n| n.dms(0)),
        }
    }
    /// A compound feature's angles, when it is one.
    pub fn compound_angles(&self) -> Option<&Compound> {
        match self.kind {
            FeatureKind::Compound => self.compound.as_ref(),
            _ => None,
        }
    }
}

impl Verdict {
    /// The worse of two verdicts: a fail over a doubt over a pass.
    pub fn worse(self, other: Verdict) -> Verdict {
        let rank = |v: Verdict| match v {
            Verdict::Pass => 0,
            Verdict::Doubt => 1,
            Verdict::Fail => 2,
        };
        if rank(other) > rank(self) {
            other
        } else {
            self
        }
    }
}

impl Attempt {
    /// The height the fixture is set by: the stack, less the stack under the pivot roll when
    /// there are two.
    pub fn setting_height(&self) -> Option<Length> {
        let s = self.stack.as_ref()?;
        Some(match &self.stack_pivot {
            Some(p) => s.height - p.height,
            None => s.height,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn taper_half_angles() {
        // 1:20 on the diameter: half angle atan(1/40) = 1.432096° (direct computation)
        let t = Taper {
            ratio: Some("1:20".into()),
            ..Taper::default()
        };
        let h = t.half_angle().unwrap();
        assert!((h.deg() - (1.0f64 / 40.0).atan().to_degrees()).abs() < 1e-12);
        assert!((h.deg() - 1.432_096).abs() < 1e-6, "{}", h.deg());
        let two = Taper {
            ratio: Some("1:20".into()),
            half: Some(Angle::from_deg(1.0)),
            ..Taper::default()
        };
        assert!(two.half_angle().is_err());
        assert!(parse_ratio("20").is_err());
    }

    #[test]
    fn compound_words_and_worse_verdicts() {
        let c = Compound {
            a: Angle::from_deg(30.0),
            b: Angle::from_deg(20.0),
            near: NearPlate::A,
        };
        // compound.csv row 30,20 (mpmath, tests/data/sine-tables): true slope 34.3135770215°,
        // which is 34°18.8' → 34°19'
        assert_eq!(c.words(), "A 30°00' / B 20°00' (true slope 34°19')");
        assert!(
            (c.true_slope().deg() - 34.3135770215).abs() < 1e-9,
            "{}",
            c.true_slope().deg()
        );
        // the same row: the lower (other) plate is set to 17.495240757°
        let set = c.setting().unwrap();
        assert!(
            (set.other.deg() - 17.495240757).abs() < 1e-8,
            "{}",
            set.other.deg()
        );
        let flipped = Compound {
            near: NearPlate::B,
            ..c.clone()
        };
        assert_eq!(flipped.views().0, c.b);
        assert_eq!(flipped.letters(), ("B", "A"));
        assert_eq!(Verdict::Pass.worse(Verdict::Doubt), Verdict::Doubt);
        assert_eq!(Verdict::Fail.worse(Verdict::Doubt), Verdict::Fail);
        assert_eq!(Verdict::Pass.worse(Verdict::Pass), Verdict::Pass);
        assert_eq!(short(Angle::from_dms(false, 5, 43, 0.0)), "5°43'");
        assert_eq!(short(Angle::from_dms(false, 1, 25, 56.0)), "1°25'56\"");
    }
}
