//! Many implied volatilities, solved a block at a time and stage by stage.
//!
//! One solve is a chain of dependent steps (set-up, guess, one or two
//! iterations) of about a thousand instructions, more than the processor's
//! out-of-order window holds, so solves called one after another hardly
//! overlap: the loop runs at the chain's latency. Here a block of up to
//! [`BLOCK`] premiums goes through each stage together: every element's
//! set-up, then every guess, then each iteration for the elements not yet
//! converged. A stage of one element is short enough for the processor to run
//! the next element's beside it.
//!
//! Each element takes exactly the operations of [`super::solve_implied_vol`]
//! in the same order, so its vol or its error is the scalar call's, bit for
//! bit.

use super::{prepare, Objective, Prepared, MAX_ITERATIONS};
use crate::contract::{Contract, Market};
use crate::error::{Error, Field};

/// Premiums solved together. The block's state takes about 2 KB of stack;
/// blocks of 32 and 64 were within 2–3 % of this size's time on the
/// implied-vol benchmark's premiums (a scratch driver, not kept).
pub(crate) const BLOCK: usize = 16;

/// Solves each problem (or passes on its error) and hands the results to
/// `emit` in the order of `problems`, one per problem.
pub(crate) fn solve_in_blocks<I, F>(mut problems: I, mut emit: F)
where
    I: Iterator<Item = Result<(Contract, Market, f64), Error>>,
    F: FnMut(Result<f64, Error>),
{
    loop {
        // Past `len` the slots are never read.
        let mut block: [Result<Prepared, Error>; BLOCK] = [Err(Error::LengthMismatch {
            field: Field::Premium,
        }); BLOCK];
        let mut len = 0;
        for (slot, problem) in block.iter_mut().zip(problems.by_ref()) {
            *slot = match problem {
                Ok((contract, market, premium)) => prepare(&contract, &market, premium),
                Err(e) => Err(e),
            };
            len += 1;
        }
        let block = block.get(..len).unwrap_or(&[]);
        for (problem, s) in block.iter().zip(solve_block(block)) {
            emit(match problem {
                Ok(p) => p.vol(s),
                Err(e) => Err(*e),
            });
        }
        if len < BLOCK {
            return;
        }
    }
}

/// The solved s of each prepared element (unused for the refused ones): all
/// the guesses, then each iteration over the elements still unconverged.
fn solve_block(block: &[Result<Prepared, Error>]) -> [f64; BLOCK] {
    let mut iterates = [(0.0, Objective::Price); BLOCK];
    let mut live = [0usize; BLOCK];
    let mut n_live = 0;
    for (i, (problem, iterate)) in block.iter().zip(iterates.iter_mut()).enumerate() {
        if let (Ok(p), Some(slot)) = (problem, live.get_mut(n_live)) {
            *iterate = p.target.guess();
            *slot = i;
            n_live += 1;
        }
    }
    for _ in 0..MAX_ITERATIONS {
        let mut kept = 0;
        for k in 0..n_live {
            let Some(&i) = live.get(k) else { break };
            let (Some(Ok(p)), Some((s, objective))) = (block.get(i), iterates.get_mut(i)) else {
                continue;
            };
            let (next, _, converged) = p.target.iterate(*s, *objective);
            *s = next;
            if !converged {
                // kept ≤ k: the list is compacted in place, in order.
                if let Some(slot) = live.get_mut(kept) {
                    *slot = i;
                }
                kept += 1;
            }
        }
        n_live = kept;
    }
    iterates.map(|(s, _)| s)
}
