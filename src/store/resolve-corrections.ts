import type { Sample } from '../schema';

/**
 * Applies corrections to a list of samples (pure). A sample whose `supersedes` names another sample in
 * the list replaces it at the original's place; chains (A ← B ← C) end at the last correction. When two
 * corrections supersede the same sample, the later one in the input order wins (callers pass samples
 * ordered by takenAt then id, and ids are time-ordered UUIDv7). A correction whose original is not in
 * the list stays where it is. The input is not mutated.
 */
export function resolveCorrections(samples: readonly Sample[]): Sample[] {
  // Most histories have no corrections at all: nothing to resolve.
  if (!samples.some((s) => s.supersedes !== undefined)) return samples.slice();
  const byId = new Map(samples.map((s) => [s.id, s] as const));
  const latestCorrection = new Map<string, Sample>();
  for (const s of samples) {
    if (s.supersedes !== undefined && s.supersedes !== s.id && byId.has(s.supersedes)) {
      latestCorrection.set(s.supersedes, s);
    }
  }
  const isCorrectionInList = (s: Sample) => s.supersedes !== undefined && latestCorrection.get(s.supersedes) !== undefined;
  const current: Sample[] = [];
  for (const s of samples) {
    // A correction is shown at its original's place, not its own.
    if (isCorrectionInList(s)) continue;
    let head = s;
    const seen = new Set<string>([s.id]);
    for (let next = latestCorrection.get(head.id); next !== undefined && !seen.has(next.id); next = latestCorrection.get(head.id)) {
      seen.add(next.id);
      head = next;
    }
    current.push(head);
  }
  return current;
}
