import type { Characteristic, Phase, Sample } from '../schema';
import { buildCharacteristicView } from './build-view';

/**
 * How many signals (run rules, or the EWMA / CUSUM decision) would begin at the imported points once
 * they stand on the chart with the samples already there. They show as signals to answer like any
 * other, so the engineer is told before recording. Pure.
 */
export function signalsAtImported(ch: Characteristic, phases: readonly Phase[], existing: readonly Sample[], imported: readonly Sample[]): number {
  if (!imported.length) return 0;
  const view = buildCharacteristicView(ch, phases, [...existing, ...imported], [], [], 0);
  const ids = new Set(imported.map((s) => s.id));
  return view.groups.filter((g) => ids.has(g.sampleId)).length;
}
