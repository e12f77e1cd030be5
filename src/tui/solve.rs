//! The stack for a height from the blocks a set has: a narrow door to the block solver, giving
//! the traveller's stack blocks in wringing order, or a message with the remedies.

use super::shop_view::SetView;
use crate::blocks::Solver;
use crate::traveller::StackBlock;
use crate::units::Length;

/// The fewest blocks of `set` that make `height` (protectors on the ends when asked), in
/// wringing order; or why not, with what to do instead.
pub fn solve(set: &SetView, height: Length, protectors: bool) -> Result<Vec<StackBlock>, String> {
    let solver = Solver::new(&set.set)
        .and_then(|s| s.with_protectors(protectors))
        .map_err(|e| e.to_string())?;
    match solver.solve(height) {
        Ok(stack) => Ok(stack
            .blocks
            .iter()
            .map(|b| StackBlock {
                size: b.size,
                protector: b.protector,
                wrung: false,
            })
            .collect()),
        Err(e) => {
            let mut msg = e.to_string();
            if matches!(e, crate::blocks::SolveError::BelowSmallest { .. }) {
                msg.push_str(
                    ". Small angle: put a stack under each roll whose difference is the height, or use a longer fixture",
                );
            } else if protectors {
                msg.push_str(". Try without the protector blocks (p)");
            }
            Err(msg)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tui::shop_view::ShopView;
    fn demo_shop(_: jiff::civil::Date) -> ShopView {
        ShopView::from_shop(&crate::shop::Shop::built_in())
    }

    #[test]
    fn two_and_a_half_inches_from_the_demo_set() {
        let shop = demo_shop(jiff::civil::date(2025, 3, 4));
        let set = &shop.sets[0];
        let s = solve(set, Length::inches(2.5), false).unwrap();
        let total: Length = s.iter().map(|b| b.size).sum();
        assert_eq!(total, Length::inches(2.5));
        // 2 + 0.5: two blocks is the fewest (81-piece set, standards.md composition)
        assert_eq!(s.len(), 2);
        let with = solve(set, Length::inches(2.5), true).unwrap();
        assert!(with[0].protector && with[with.len() - 1].protector);
        assert_eq!(
            with.iter().map(|b| b.size).sum::<Length>(),
            Length::inches(2.5)
        );
    }

    #[test]
    fn too_low_says_what_to_do() {
        let shop = demo_shop(jiff::civil::date(2025, 3, 4));
        let e = solve(&shop.sets[0], Length::inches(0.02), false).unwrap_err();
        assert!(e.contains("stack under each roll"), "{e}");
    }
}
