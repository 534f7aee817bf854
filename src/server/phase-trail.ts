import type { Phase } from '../schema/index';
import { canonicalJson } from './canonical-json';

/**
 * A phase's record is corrected, never rewritten: a new version of an existing phase keeps its recorded
 * corrections and its withdrawal, and a change to its start, reason or limits adds one correction (with
 * its note). Sending the same version again is fine (a retry). Returns what is wrong, in words, or undefined.
 */
export function phaseTrailProblem(before: Phase | undefined, after: Phase): string | undefined {
  if (!before) return undefined;
  const same = (a: unknown, b: unknown) => canonicalJson(a ?? null) === canonicalJson(b ?? null);
  const { corrections: beforeTrail = [], withdrawn: beforeWithdrawn, ...beforeContent } = before;
  const { corrections: afterTrail = [], withdrawn: afterWithdrawn, ...afterContent } = after;
  const name = `Phase ${before.number}`;
  if (beforeWithdrawn && !(same(beforeWithdrawn, afterWithdrawn) && same(beforeTrail, afterTrail) && same(beforeContent, afterContent))) {
    return `${name} was withdrawn and stays as it was; start a new phase instead.`;
  }
  if (afterTrail.length < beforeTrail.length || beforeTrail.some((c, i) => !same(c, afterTrail[i]))) {
    return `The corrections already recorded for ${name} cannot be removed or rewritten; a correction adds one.`;
  }
  if (!same(beforeContent, afterContent) && afterTrail.length !== beforeTrail.length + 1) {
    return `${name} already exists with other content (perhaps just saved from another tablet): reload, and correct it with a note if it needs changing.`;
  }
  return undefined;
}
