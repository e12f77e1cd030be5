//! The app model: the traveller being worked, the shop, where the operator is, and what is
//! typed. `update` (in `update.rs`) changes it from messages; screens draw it.

use super::field::Field;
use super::keymap::{Ctx, Input};
use super::rank::{FixtureOption, SetOption};
use super::shop_view::ShopView;
use super::solve::{Solution, SolveJob};
use super::theme::Theme;
use crate::blocks::small::SmallAngle;
use crate::traveller::{Attempt, Feature, Step, Traveller};
use crate::units::Unit;
use jiff::civil::Date;

/// Where the operator is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Screen {
    /// The job: every feature, progress, the next action.
    Overview,
    /// Asking the operator's name (once, when neither --as nor the shop file gave it).
    Name,
    /// One step of one feature's flow.
    Flow { feature: usize, step: Step },
    /// Handover notes and return comments left for this person: shown before anything else.
    Notice,
    /// The lead's review: every feature with its state, attempts and flags.
    Review,
    /// One feature under review: its attempts in order, stack, readings, chart and budget.
    ReviewFeature { feature: usize },
}

/// A one-line question over a screen.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum PromptKind {
    /// Why an out-of-date fixture is used (index into the shop's fixtures).
    FixtureReason(usize),
    /// Why an out-of-date block set is used (index into the shop's sets).
    SetReason(usize),
    /// The size really wrung in place of the block at this position of the stack.
    Swap(usize),
    /// The note that goes with a nonconforming feature.
    Nonconforming,
    /// Why a fixture or set now out of date is carried into a new attempt.
    CarryReason,
    /// A change that clears later work of the attempt: yes or no.
    Redo(Redo),
    /// The optional note for the next shift, asked on quitting with work unfinished.
    Handover,
    /// The lead signs a feature (by index) or the whole job (None): yes or no.
    LeadSign(Option<usize>),
    /// The lead's comment sending a feature (by index) or the whole job (None) back.
    Return(Option<usize>),
}

/// An earlier choice changed after later work was done.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Redo {
    Fixture { index: usize },
    Set { index: usize },
}

/// The prompt being answered.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Prompt {
    pub kind: PromptKind,
    pub title: String,
    /// What to type, or what Enter and Esc do for a yes/no question.
    pub hint: String,
    /// Text prompts have a field; yes/no questions do not.
    pub field: Option<Field>,
    /// The message beside the field after a refused Enter.
    pub error: Option<String>,
    /// Kept for a prompt that needs a value besides the text (a reason carried into a redo).
    pub carry: String,
}

/// How serious a status message is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Level {
    Info,
    Done,
    Warn,
    Error,
}

/// The status line.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Status {
    pub level: Level,
    pub text: String,
}

/// Which field of the readings screen has the focus.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum RField {
    Travel,
    Points,
    Position,
    #[default]
    Reading,
}

/// What is typed on the readings screen.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct ReadingsUi {
    /// Compound angles: the readings of the other plate's view (`sweep_b`) are on screen.
    pub other_view: bool,
    pub focus: RField,
    pub travel: Field,
    pub points: Field,
    pub position: Field,
    pub reading: Field,
}

/// Cursors, fields and lists of the screens (nothing here is saved).
#[derive(Debug, Clone, Default)]
pub struct Ui {
    pub overview_sel: usize,
    pub fixture_sel: usize,
    pub set_sel: usize,
    pub stack_sel: usize,
    pub verdict_sel: usize,
    pub fixtures: Vec<FixtureOption>,
    /// The set the fixtures' U estimate is for: id, grade as written, and whether its grade's
    /// limits are known (else the stack is left out of the estimate).
    pub rank_set: Option<(String, String, bool)>,
    pub sets: Vec<SetOption>,
    pub name: Field,
    pub sign: Field,
    pub readings: ReadingsUi,
    /// Seconds left of the settle wait, while it runs.
    pub settle_left: Option<u32>,
    /// A solve has been asked for and not answered.
    pub solving: bool,
    /// The last solver refusal, with its remedies.
    pub solve_error: Option<String>,
    /// Something the last solve left to say (protectors left off…).
    pub solve_note: Option<String>,
    /// The small-angle remedies of this attempt, when the direct stack is poor.
    pub remedies: Option<RemedyUi>,
    pub review: ReviewUi,
}

/// The small-angle remedies side by side, as offered on the stack screen.
#[derive(Debug, Clone, PartialEq)]
pub struct RemedyUi {
    pub small: Box<SmallAngle>,
    /// The fixture they were worked out for.
    pub fixture_id: String,
    /// The option under the cursor (an index into `flow::remedy::options`).
    pub sel: usize,
    /// The choice is on screen (not yet made, or opened again with r).
    pub open: bool,
}

/// Cursors of the review screens.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct ReviewUi {
    /// The selected feature (an index into the job's features).
    pub sel: usize,
    /// Show only the flagged features.
    pub flagged_only: bool,
    /// The attempt shown on the feature page (an index into its attempts).
    pub attempt: usize,
    /// Lines scrolled on the feature page.
    pub scroll: u16,
}

/// Messages `update` acts on.
#[derive(Debug, Clone, PartialEq)]
pub enum Msg {
    Key(Input),
    Resize(u16, u16),
    /// Seconds passed (for the settle timer).
    Tick(u32),
    /// The solver's answer for a feature's attempt.
    Solved {
        feature: usize,
        attempt: u32,
        result: Result<Solution, String>,
    },
    /// A save went through.
    Saved,
    /// A save failed: nothing after the last good save is on disk.
    SaveFailed(String),
}

/// Work for the effect runner: never done in `update` or the view.
#[derive(Debug, Clone, PartialEq)]
pub enum Effect {
    /// Write the traveller (atomic, under the lock).
    Save,
    /// Find the stack for a height.
    Solve(SolveRequest),
    /// Release the lock and leave.
    Quit,
}

/// What the solver is asked, for which attempt.
#[derive(Debug, Clone, PartialEq)]
pub struct SolveRequest {
    pub feature: usize,
    pub attempt: u32,
    pub set_id: String,
    pub job: SolveJob,
}

/// How the app was opened.
#[derive(Debug, Clone)]
pub struct Options {
    pub read_only: bool,
    pub color: bool,
    /// From --as or the shop file.
    pub operator: Option<String>,
    /// The file as the operator knows it, for the title line.
    pub file_label: String,
    pub today: Date,
    /// Opened for the lead's review (`--review`).
    pub review: bool,
}

/// The whole model.
#[derive(Debug, Clone)]
pub struct App {
    pub doc: Traveller,
    pub shop: ShopView,
    pub file_label: String,
    /// Name or initials of the person at the terminal (empty until known).
    pub operator: String,
    pub read_only: bool,
    pub theme: Theme,
    pub today: Date,
    pub screen: Screen,
    /// Where the Name screen leads once answered.
    pub after_name: Screen,
    /// Opened for the lead's review: the operator's flow is not offered.
    pub review_mode: bool,
    /// The handover notes and return comments have been shown (and, once the name is known,
    /// the notes marked read).
    pub notice_seen: bool,
    /// Handover notes shown but not yet marked read (the name was not known yet).
    pub notice_unmarked: bool,
    pub help: bool,
    pub prompt: Option<Prompt>,
    pub status: Option<Status>,
    pub size: (u16, u16),
    pub quit: bool,
    /// The last save failed; the next confirmed entry tries again.
    pub unsaved: bool,
    /// Something was confirmed in this session (the note for the next shift is asked then).
    pub worked: bool,
    pub ui: Ui,
}

/// The order of the steps a screen goes through (Done is not a screen).
pub const STEPS: [Step; 8] = [
    Step::Fixture,
    Step::BlockSet,
    Step::Stack,
    Step::Safety,
    Step::Settle,
    Step::Sweep,
    Step::Verdict,
    Step::Sign,
];

/// The step's name on screen.
pub fn step_name(s: Step) -> &'static str {
    match s {
        Step::Fixture => "Fixture",
        Step::BlockSet => "Block set",
        Step::Stack => "Stack",
        Step::Safety => "Safety",
        Step::Settle => "Settle",
        Step::Sweep => "Readings",
        Step::Verdict => "Verdict",
        Step::Sign => "Sign",
        Step::Done => "Done",
    }
}

/// The step before `s` (None before the fixture).
pub fn prev_step(s: Step) -> Option<Step> {
    let i = STEPS.iter().position(|x| *x == s)?;
    i.checked_sub(1).map(|j| STEPS[j])
}

/// The step after `s`.
pub fn next_step(s: Step) -> Step {
    STEPS
        .iter()
        .position(|x| *x == s)
        .and_then(|i| STEPS.get(i + 1).copied())
        .unwrap_or(Step::Done)
}

impl App {
    /// A model for `doc`, landing where work stopped.
    pub fn new(doc: Traveller, shop: ShopView, opts: Options) -> App {
        let operator = opts.operator.clone().unwrap_or_default();
        let mut app = App {
            doc,
            shop,
            file_label: opts.file_label,
            operator: operator.trim().to_string(),
            read_only: opts.read_only,
            theme: Theme::new(opts.color),
            today: opts.today,
            screen: Screen::Overview,
            after_name: Screen::Overview,
            review_mode: opts.review,
            notice_seen: false,
            notice_unmarked: false,
            help: false,
            prompt: None,
            status: None,
            size: (80, 24),
            quit: false,
            unsaved: false,
            worked: false,
            ui: Ui::default(),
        };
        app.ui.name = Field::new(40);
        app.ui.sign = Field::new(40);
        app
    }

    /// The job's unit (heights and readings are shown in it).
    pub fn unit(&self) -> Unit {
        self.doc.job.unit
    }

    /// The feature and step being worked, if in a flow.
    pub fn flow(&self) -> Option<(usize, Step)> {
        match self.screen {
            Screen::Flow { feature, step } => Some((feature, step)),
            _ => None,
        }
    }

    /// The feature being worked.
    pub fn feature(&self) -> Option<&Feature> {
        self.flow().and_then(|(i, _)| self.doc.features.get(i))
    }

    /// The attempt being worked (the feature's last).
    pub fn attempt(&self) -> Option<&Attempt> {
        self.feature().and_then(|f| f.current_attempt())
    }

    /// The attempt being worked, to change it.
    pub fn attempt_mut(&mut self) -> Option<&mut Attempt> {
        let (i, _) = self.flow()?;
        self.doc.features.get_mut(i)?.current_attempt_mut()
    }

    /// The keymap context of what has the keys now.
    pub fn ctx(&self) -> Ctx {
        if self.help {
            return Ctx::Help;
        }
        self.screen_ctx()
    }

    /// The context of the screen (or prompt) under the help overlay: what the help explains.
    pub fn screen_ctx(&self) -> Ctx {
        if let Some(p) = &self.prompt {
            return if p.kind == PromptKind::Handover {
                Ctx::Handover
            } else {
                Ctx::Prompt
            };
        }
        match self.screen {
            Screen::Overview => Ctx::Overview,
            Screen::Name => Ctx::Name,
            Screen::Notice => Ctx::Notice,
            Screen::Review => Ctx::Review,
            Screen::ReviewFeature { .. } => Ctx::ReviewFeature,
            Screen::Flow { step, .. } => match step {
                Step::Fixture => Ctx::Fixture,
                Step::BlockSet => Ctx::BlockSet,
                Step::Stack if self.ui.remedies.as_ref().is_some_and(|r| r.open) => Ctx::Remedy,
                Step::Stack => Ctx::Stack,
                Step::Safety => Ctx::Safety,
                Step::Settle => Ctx::Settle,
                Step::Sweep => Ctx::Readings,
                Step::Verdict => Ctx::Verdict,
                Step::Sign | Step::Done => Ctx::Sign,
            },
        }
    }

    /// Is a text field taking the keys?
    pub fn typing(&self) -> bool {
        if self.help {
            return false;
        }
        if let Some(p) = &self.prompt {
            return p.field.is_some();
        }
        matches!(
            self.screen,
            Screen::Name
                | Screen::Flow {
                    step: Step::Sweep | Step::Sign,
                    ..
                }
        ) && !self.read_only
    }

    /// Set the status line.
    pub fn say(&mut self, level: Level, text: impl Into<String>) {
        self.status = Some(Status {
            level,
            text: text.into(),
        });
    }
}
