// Which answers are held out of a fit for the checks (held-out perplexity, cross-language
// alignment). Whole link groups are held out together, so that a held-out answer's translation
// or paired answer is not in the training data (common practice). Each group is held
// out with probability `share`, drawn from the run's seed on its own stream, so a refit with the
// same seed holds out the same answers.
import { Xoshiro128 } from '../model/index.js';

/** Stream of the generator used for the split (any constant apart from the fit's own streams). */
const HOLDOUT_STREAM = 7919;

/**
 * `groupKeys[i]` is the link group of answer i. Returns a flag per answer: 1 when held out.
 * Groups are drawn in order of their first answer, so the split depends only on the keys' order.
 */
export function heldOutGroups(groupKeys: readonly string[], share: number, seed: number): Uint8Array {
  const out = new Uint8Array(groupKeys.length);
  if (!(share > 0)) return out;
  const rng = Xoshiro128.fromSeed(seed, HOLDOUT_STREAM);
  const held = new Map<string, boolean>();
  for (let i = 0; i < groupKeys.length; i++) {
    const key = groupKeys[i];
    let h = held.get(key);
    if (h === undefined) held.set(key, (h = rng.nextDouble() < share));
    if (h) out[i] = 1;
  }
  return out;
}
