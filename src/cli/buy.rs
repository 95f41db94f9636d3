//! `--buy N`, `--buy-teeth LO..HI` and `--buy-module MM`, shared by `search` and `thread`: trains
//! may use up to N gears not on hand, and each listed train says which to buy. Turns the flags
//! into the library's [`Purchase`]; the counting and ranking are the library's.

use clap::Args;
use gearsieve::model::pool::{Pool, MAX_TEETH, MIN_TEETH};
use gearsieve::model::purchase::Purchase;
use gearsieve::numbers::range::{parse_int_range, IntRange};
use gearsieve::Quantity;

use super::args::number;
use super::flags::refuse;

/// The flags of gears to buy.
#[derive(Args, Debug, Default)]
pub struct BuyArgs {
    /// Let each train use up to N gears that are not on hand (needs gears on hand, --stock);
    /// each train listed says which gears to buy. Every train listed is within --tol; they rank
    /// first by the number of gears to buy, fewest first, then as usual. A gear bought is a new
    /// gear cut standard (no shift); buying more of a tooth count on hand raises its quantity.
    #[arg(long, value_name = "N")]
    pub buy: Option<u32>,
    /// Tooth counts that may be bought [default: for search, the least to the most teeth on hand
    /// in the module bought; for thread, that range widened to take in 20..127].
    #[arg(long, value_name = "LO..HI", requires = "buy", allow_hyphen_values = true)]
    pub buy_teeth: Option<String>,
    /// Module of the gears to buy, mm: one the gears on hand come in [default: theirs, when they
    /// all share one].
    #[arg(long, value_name = "MM", requires = "buy", allow_negative_numbers = true, value_parser = number)]
    pub buy_module: Option<f64>,
}

impl BuyArgs {
    /// The purchase the flags ask for, added to `on_hand`, or `None` without `--buy`.
    /// `widen_to` widens the default tooth range to take in that range (a lathe's usual change
    /// gears); `stock_flags` says how gears on hand are given, for the refusal without them.
    pub fn purchase(
        &self,
        on_hand: &Pool,
        widen_to: Option<IntRange>,
        stock_flags: &str,
    ) -> anyhow::Result<Option<Purchase>> {
        let Some(most) = self.buy else { return Ok(None) };
        if !on_hand.from_stock {
            return Err(refuse(
                "--buy",
                format!("adds gears to buy to the gears on hand; give them with {stock_flags}"),
            ));
        }
        let teeth = self
            .buy_teeth
            .as_deref()
            .map(|t| parse_int_range(t, Quantity::BuyTeeth, "teeth", MIN_TEETH, MAX_TEETH))
            .transpose()?;
        let mut purchase = Purchase::new(on_hand.clone(), most, teeth, self.buy_module)?;
        if let (None, Some(w)) = (teeth, widen_to) {
            purchase.teeth = IntRange { lo: purchase.teeth.lo.min(w.lo), hi: purchase.teeth.hi.max(w.hi) };
        }
        Ok(Some(purchase))
    }
}
