//! The steps of working a feature, recorded as the screens record them: an attempt started,
//! fixture and set chosen, the stack the screen offers wrung block by block (a block swapped by
//! hand on the way), the cautions confirmed, the settle wait, the sweep, the verdict, the
//! operator's signature.

use super::compute::{angle_for, budget, expanded, fit};
use super::equipment::SET;
use super::stacks::{planned, planned_plates};
use super::views;
use tiltbook::traveller::validate::decide;
use tiltbook::traveller::*;
use tiltbook::units::{Angle, Length, Unit};

pub fn len(s: &str) -> Length {
    Length::parse(s, Unit::In).unwrap()
}

pub struct Clock(jiff::Timestamp, jiff::tz::Offset);
impl Clock {
    pub fn new(s: &str) -> Self {
        let st = Stamp::parse(s).unwrap();
        Clock(st.timestamp(), st.offset())
    }
    /// Move on `min` minutes and give the time.
    pub fn tick(&mut self, min: i64) -> Stamp {
        self.0 = self
            .0
            .checked_add(jiff::SignedDuration::from_mins(min))
            .unwrap();
        Stamp::from_parts(self.0, self.1)
    }
}

/// A block changed by hand while wringing: with a reason given by the operator, or (empty
/// reason) typed on the stack screen as it records swaps.
#[derive(Clone, Copy)]
pub struct HandSwap {
    pub at: usize,
    pub planned: &'static str,
    pub used: &'static str,
    pub reason: &'static str,
}

fn stack(blocks: Vec<StackBlock>, swaps: Vec<Swap>, achieved: Angle, by: &str, at: Stamp) -> Stack {
    let height = blocks.iter().map(|b| b.size).sum();
    Stack {
        blocks,
        height,
        achieved,
        swaps,
        built: Some(Mark { by: by.into(), at }),
    }
}

pub struct Shift<'a> {
    pub t: &'a mut Traveller,
    pub clock: &'a mut Clock,
    pub by: &'static str,
}

impl Shift<'_> {
    pub fn log(
        &mut self,
        min: i64,
        kind: EventKind,
        f: &str,
        a: Option<u32>,
        detail: &str,
    ) -> Stamp {
        let at = self.clock.tick(min);
        self.t.log_at(at, self.by, kind, Some(f), a, detail);
        at
    }
    pub fn state(&mut self, f: &str, s: FeatureState) {
        self.t.feature_mut(f).unwrap().state = s;
    }
    pub fn attempt(&mut self, f: &str) -> &mut Attempt {
        self.t
            .feature_mut(f)
            .unwrap()
            .current_attempt_mut()
            .unwrap()
    }

    /// Start an attempt and go as far as the settled stack: the stack the screen offers for
    /// the setting, with a block swapped by hand on the way.
    pub fn setup(&mut self, f: &str, fx: &str, swap: Option<HandSwap>) -> u32 {
        let n = self.start(f, fx, "");
        let fxs = self.t.fixture(fx).unwrap().clone();
        let (blocks, _) = planned(self.t, f, fx);
        let (bl, swaps) = self.wring(f, n, blocks, swap, "", &fxs);
        let height: Length = bl.iter().map(|b| b.size).sum();
        let achieved = angle_for(&fxs, height);
        let at = self.log(
            1,
            EventKind::StackBuilt,
            f,
            Some(n),
            &format!("stack {} gives {}", height.show(Unit::In), achieved.dms(1)),
        );
        self.attempt(f).stack = Some(stack(bl, swaps, achieved, self.by, at));
        self.settle(f, n);
        n
    }

    /// A compound angle: both plates' stacks from the one set, wrung and confirmed together.
    pub fn setup_plates(&mut self, f: &str, fx: &str) -> u32 {
        let n = self.start(f, fx, "");
        let fxs = self.t.fixture(fx).unwrap().clone();
        let (near, other) = planned_plates(self.t, f, fx);
        let (nb, _) = self.wring(f, n, near, None, "near plate: ", &fxs);
        let (ob, _) = self.wring(f, n, other, None, "other plate: ", &fxs);
        let total = |b: &[StackBlock]| b.iter().map(|b| b.size).sum::<Length>();
        let (hn, ho) = (total(&nb), total(&ob));
        let (an, ao) = (angle_for(&fxs, hn), angle_for(&fxs, ho));
        let at = self.log(
            1,
            EventKind::StackBuilt,
            f,
            Some(n),
            &format!(
                "near plate {} gives {}, other plate {} gives {}",
                hn.show(Unit::In),
                an.dms(1),
                ho.show(Unit::In),
                ao.dms(1)
            ),
        );
        self.attempt(f).stack = Some(stack(nb, Vec::new(), an, self.by, at));
        self.attempt(f).stack_b = Some(stack(ob, Vec::new(), ao, self.by, at));
        self.settle(f, n);
        n
    }

    /// A new attempt with the fixture and set chosen.
    pub fn start(&mut self, f: &str, fx: &str, reason: &str) -> u32 {
        let at = self.clock.tick(4);
        let n = self
            .t
            .feature_mut(f)
            .unwrap()
            .start_attempt(self.by, at)
            .number;
        self.t
            .log_at(at, self.by, EventKind::AttemptStarted, Some(f), Some(n), "");
        let at = self.log(3, EventKind::FixtureChosen, f, Some(n), fx);
        self.attempt(f).fixture = Some(Choice {
            id: fx.into(),
            reason: reason.into(),
            by: self.by.into(),
            at,
        });
        self.attempt(f).step = Step::BlockSet;
        self.state(f, FeatureState::FixtureChosen);
        let at = self.log(1, EventKind::SetChosen, f, Some(n), SET);
        self.attempt(f).block_set = Some(Choice {
            id: SET.into(),
            reason: String::new(),
            by: self.by.into(),
            at,
        });
        self.attempt(f).step = Step::Stack;
        self.state(f, FeatureState::SetChosen);
        n
    }

    /// Wring `blocks` one by one (logged), with a block swapped by hand on the way.
    pub fn wring(
        &mut self,
        f: &str,
        n: u32,
        blocks: Vec<StackBlock>,
        swap: Option<HandSwap>,
        whose: &str,
        fxs: &FixtureSnapshot,
    ) -> (Vec<StackBlock>, Vec<Swap>) {
        let mut bl = blocks;
        let mut swaps = Vec::new();
        for i in 0..bl.len() {
            let swap_here = swap.filter(|w| w.at == i);
            if let Some(w) = swap_here {
                assert_eq!(
                    bl[i].size,
                    len(w.planned),
                    "{f}: the swapped block is planned"
                );
            }
            match swap_here {
                Some(w) if w.reason.is_empty() => {
                    // as the screens record it: the size typed for the block, the angle
                    // worked out from what was built, no separate tick
                    bl[i].size = len(w.used);
                    bl[i].wrung = true;
                    let height: Length = bl.iter().map(|b| b.size).sum();
                    let at = self.log(
                        1,
                        EventKind::BlockSwapped,
                        f,
                        Some(n),
                        &format!(
                            "{whose}{} in place of {}: stack {} gives {}",
                            len(w.used).show(Unit::In),
                            len(w.planned).show(Unit::In),
                            height.show(Unit::In),
                            angle_for(fxs, height).dms(1)
                        ),
                    );
                    swaps.push(Swap {
                        planned: len(w.planned),
                        used: len(w.used),
                        reason: String::new(),
                        by: self.by.into(),
                        at,
                    });
                    self.state(f, FeatureState::StackBuilt);
                    continue;
                }
                Some(w) => {
                    let at = self.log(
                        1,
                        EventKind::BlockSwapped,
                        f,
                        Some(n),
                        &format!("{} in for {} in: {}", w.planned, w.used, w.reason),
                    );
                    swaps.push(Swap {
                        planned: len(w.planned),
                        used: len(w.used),
                        reason: w.reason.into(),
                        by: self.by.into(),
                        at,
                    });
                    bl[i].size = len(w.used);
                    self.state(f, FeatureState::StackBuilt);
                }
                None => {}
            }
            bl[i].wrung = true;
            let detail = format!("{whose}{} in wrung", bl[i].size.exact_number(Unit::In, 4));
            self.log(1, EventKind::BlockWrung, f, Some(n), &detail);
        }
        (bl, swaps)
    }

    /// The stack confirmed: the cautions, then the settle wait.
    pub fn settle(&mut self, f: &str, n: u32) {
        self.attempt(f).step = Step::Safety;
        self.state(f, FeatureState::StackBuilt);
        let at = self.log(
            1,
            EventKind::SafetyConfirmed,
            f,
            Some(n),
            "work clamped to the stop; eye protection",
        );
        self.attempt(f).safety = Some(Mark {
            by: self.by.into(),
            at,
        });
        self.attempt(f).step = Step::Settle;
        let at = self.log(10, EventKind::Settled, f, Some(n), "10 min");
        self.attempt(f).settle = Some(Settle {
            done: true,
            minutes: Some(10),
            reason: String::new(),
            by: self.by.into(),
            at,
        });
        self.attempt(f).step = Step::Sweep;
        self.state(f, FeatureState::Settled);
    }

    /// Enter readings (spaced over 4 in, 5 points); `upto` of them.
    pub fn sweep(&mut self, f: &str, n: u32, readings: &[&str], upto: usize) {
        self.sweep_view(f, n, false, readings, upto);
    }

    /// Enter readings of the near view (`other` false) or of a compound angle's other view.
    pub fn sweep_view(&mut self, f: &str, n: u32, other: bool, readings: &[&str], upto: usize) {
        fn slot(a: &mut Attempt, other: bool) -> &mut Option<Sweep> {
            if other { &mut a.sweep_b } else { &mut a.sweep }
        }
        if slot(self.attempt(f), other).is_none() {
            *slot(self.attempt(f), other) = Some(Sweep {
                mode: SweepMode::Spaced,
                travel: Some(len("4in")),
                points: Some(readings.len() as u32),
                readings: Vec::new(),
                pairs: Vec::new(),
                resolution: Some(len("0.0001in")),
                entered: None,
            });
        }
        let done = slot(self.attempt(f), other)
            .as_ref()
            .unwrap()
            .readings
            .len();
        let view = if other { "view B " } else { "" };
        for r in &readings[done..upto] {
            let at = self.log(
                2,
                EventKind::ReadingEntered,
                f,
                Some(n),
                &format!("{view}{r} in"),
            );
            let by = self.by;
            let s = slot(self.attempt(f), other).as_mut().unwrap();
            s.readings.push(len(r));
            s.entered = Some(Mark { by: by.into(), at });
        }
        self.state(f, FeatureState::Sweeping);
    }

    pub fn judge(&mut self, f: &str, n: u32) -> Verdict {
        let feat = self.t.feature(f).unwrap().clone();
        let a = feat.current_attempt().unwrap();
        let fx = self
            .t
            .fixture(&a.fixture.as_ref().unwrap().id)
            .unwrap()
            .clone();
        let s = a.stack.as_ref().unwrap();
        let sw = a.sweep.as_ref().unwrap();
        let fit = fit(&sw.points_xy());
        let residual = Angle::from_rad(fit.slope.atan());
        let deviation = (s.achieved - feat.setting_angle().unwrap()) - residual;
        let set = self.t.block_set(SET).unwrap().clone();
        let b = budget(&fx, &set, s, sw);
        let u = expanded(&b);
        let own = decide(DecisionRule::Guarded, deviation, u, feat.tolerance);
        // a compound angle: the other view judged on its own; both must pass
        let view_b = feat
            .compound
            .as_ref()
            .map(|c| views::judge_view_b(&fx, &set, c, a, feat.tolerance));
        let verdict = view_b.as_ref().map_or(own, |v| own.worse(v.verdict));
        let correction = (verdict == Verdict::Fail).then(|| {
            let th = s.achieved.rad();
            let dh = fx.centre.as_in() * ((th - residual.rad()).sin() - th.sin());
            let delta = Length::from_f64((dh * 10_000.0).round() / 10_000.0, Unit::In);
            Correction {
                delta,
                height: s.height + delta,
            }
        });
        let at = self.log(3, EventKind::AttemptJudged, f, Some(n), verdict.label());
        let by = self.by;
        let att = self.attempt(f);
        att.judgement = Some(Judgement {
            fit,
            residual,
            deviation,
            u,
            budget: b,
            rule: DecisionRule::Guarded,
            verdict,
            correction,
            doubt_decision: None,
            by: by.into(),
            at,
            view_b,
        });
        att.step = if verdict == Verdict::Fail {
            Step::Done
        } else {
            Step::Sign
        };
        self.state(f, FeatureState::Judged);
        verdict
    }

    pub fn sign(&mut self, f: &str) {
        let at = self.clock.tick(2);
        self.t
            .sign(self.by, Role::Operator, Scope::Feature, Some(f), at)
            .unwrap();
        self.attempt(f).step = Step::Done;
    }
}
