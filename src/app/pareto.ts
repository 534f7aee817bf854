import type { Response } from '../schema';

export interface ParetoBar {
  readonly category: string;
  readonly count: number;
  /** Share of all answers in the period, 0–1. */
  readonly share: number;
  /** Running share up to and including this bar, 0–1. */
  readonly cumulative: number;
  /** The most often named suspected causes within the category, most frequent first. */
  readonly causes: readonly { readonly cause: string; readonly count: number }[];
}

/**
 * Pareto of the cause categories named in the answers to signals in [from, to): most frequent
 * first (ties by name), with running shares. Pure.
 */
export function paretoOfCauses(responses: readonly Response[], from: number, to: number): ParetoBar[] {
  const inPeriod = responses.filter((r) => {
    const t = Date.parse(r.respondedAt);
    return t >= from && t < to;
  });
  const byCategory = new Map<string, Response[]>();
  for (const r of inPeriod) byCategory.set(r.causeCategory, [...(byCategory.get(r.causeCategory) ?? []), r]);
  const total = inPeriod.length;
  let running = 0;
  return [...byCategory]
    .sort((a, b) => b[1].length - a[1].length || a[0].localeCompare(b[0]))
    .map(([category, rs]) => {
      running += rs.length;
      const causes = new Map<string, number>();
      for (const r of rs) if (r.cause) causes.set(r.cause, (causes.get(r.cause) ?? 0) + 1);
      return {
        category,
        count: rs.length,
        share: rs.length / total,
        cumulative: running / total,
        causes: [...causes].sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0])).map(([cause, count]) => ({ cause, count })),
      };
    });
}
