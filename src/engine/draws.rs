//! Random draws for the bulk engines' forecasts, which sample their work by random descents;
//! a leaf of the engine folder that imports nothing, so the engines and the forecast can share
//! it without tying each other in a loop.

/// Random draws for the bulk engines' random descents (Knuth's estimate of a search tree's
/// size): xorshift64*, plenty for picking one choice among a few hundred, and the same draws
/// on every run.
pub(crate) struct Draws(u64);

impl Draws {
    /// The draws from a fixed seed.
    pub(crate) fn new() -> Draws {
        Draws(0x9e37_79b9_7f4a_7c15)
    }

    /// One of `0..choices` (`choices > 0`).
    pub(crate) fn pick(&mut self, choices: usize) -> usize {
        let s = &mut self.0;
        *s ^= *s >> 12;
        *s ^= *s << 25;
        *s ^= *s >> 27;
        (s.wrapping_mul(0x2545_f491_4f6c_dd1d) >> 11) as usize % choices
    }
}
