//! The one place side effects happen: saving through the store (atomic, under the lock),
//! solving stacks, releasing the lock. The view and `update` never touch files.

use super::app::{App, Effect, Msg};
use super::shop_view::ShopView;
use super::solve;
use crate::store::Store;

/// Runs effects; holds the open store (and so the lock).
#[derive(Debug)]
pub struct Runner {
    store: Option<Store>,
    shop: ShopView,
    /// Saves asked for (for tests, and for a store-less run).
    pub saves: usize,
}

impl Runner {
    /// A runner saving through `store` (None: nothing is written, as in tests).
    pub fn new(store: Option<Store>, shop: ShopView) -> Runner {
        Runner {
            store,
            shop,
            saves: 0,
        }
    }

    /// Run one effect; the answer, if any, goes back into `update`.
    pub fn run(&mut self, app: &App, effect: Effect) -> Option<Msg> {
        match effect {
            Effect::Save => {
                self.saves += 1;
                match self.store.as_mut() {
                    None => Some(Msg::Saved),
                    Some(s) if s.is_read_only() => None,
                    Some(s) => Some(match s.save_confirmed(&app.doc) {
                        Ok(()) => Msg::Saved,
                        Err(e) => Msg::SaveFailed(e.to_string()),
                    }),
                }
            }
            Effect::Solve(req) => {
                let result = match self.shop.set(&req.set_id) {
                    Some(set) => solve::run(set, &req.job),
                    None => Err(format!(
                        "the block set {} is not in the shop file; choose another set",
                        req.set_id
                    )),
                };
                Some(Msg::Solved {
                    feature: req.feature,
                    attempt: req.attempt,
                    result,
                })
            }
            Effect::Quit => {
                // dropping the store releases the lock
                if let Some(s) = self.store.take() {
                    s.close();
                }
                None
            }
        }
    }

    /// Run effects until no more come back, feeding answers to `update`.
    pub fn drain(&mut self, app: &mut App, effects: Vec<Effect>) {
        let mut queue: std::collections::VecDeque<Effect> = effects.into();
        while let Some(e) = queue.pop_front() {
            if let Some(msg) = self.run(app, e) {
                queue.extend(super::update::update(app, msg));
            }
        }
    }
}
