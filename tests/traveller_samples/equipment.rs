//! The equipment of the sample jobs, taken from the built-in demo shop (sample-jobs/demo-shop.yaml)
//! through the adapter the screens use, so the travellers record what the screens would record
//! when the fixture and set are chosen: the 5 in sine bar SB5-117, the 10 in sine plate SP10-042,
//! the 5 in sine centres SC5-310, the 5 in compound sine plate CSP5-014 and the inch-81 set BX81-A.

use tiltbook::shop::Shop;
use tiltbook::traveller::{BlockSetSnapshot, FixtureSnapshot};
use tiltbook::tui::shop_view::{SetView, ShopView};

pub const BAR: &str = "SB5-117";
pub const CENTRES: &str = "SC5-310";
pub const PLATE: &str = "CSP5-014";
pub const PLATE10: &str = "SP10-042";
pub const SET: &str = "BX81-A";

/// The demo shop as the screens see it.
pub fn shop() -> ShopView {
    ShopView::from_shop(&Shop::built_in())
}

/// A fixture's snapshot, as recorded when the screens choose it.
pub fn fixture(id: &str) -> FixtureSnapshot {
    shop()
        .fixture(id)
        .cloned()
        .unwrap_or_else(|| panic!("the demo shop has no fixture {id}"))
}

/// The block set the samples use, with the blocks the solver may take.
pub fn set() -> SetView {
    shop()
        .set(SET)
        .cloned()
        .unwrap_or_else(|| panic!("the demo shop has no block set {SET}"))
}

/// The set's snapshot, as recorded when the screens choose it.
pub fn block_set() -> BlockSetSnapshot {
    set().snap
}
