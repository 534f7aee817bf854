import type { AnalysisInput, PhaseInput, SubgroupInput } from '../engine/types';
import type { Characteristic, Phase, Sample } from '../schema';

/** What the engine needs for one characteristic, plus the sample id behind each plotted point. */
export interface ChartSeries {
  readonly input: AnalysisInput;
  /** sampleIds[i] is the sample plotted at point i. */
  readonly sampleIds: readonly string[];
  readonly samples: readonly Sample[];
  /** Phase behind each entry of input.phases (same order). */
  readonly phaseIds: readonly string[];
}

/** A common EWMA design: λ = 0.2 with L = 2.962 gives an in-control ARL of about 500 (Lucas & Saccucci 1990). */
export const DEFAULT_EWMA = { lambda: 0.2, L: 2.962 } as const;
/** The usual tabular CUSUM design: k = 0.5, h = 5 (common practice; Montgomery, CUSUM chapter). */
export const DEFAULT_CUSUM = { k: 0.5, h: 5 } as const;

/** Sort key: time taken, then id (ids are time-ordered UUIDv7, so ties keep entry order). */
export function compareSamples(a: Sample, b: Sample): number {
  if (a.takenAt !== b.takenAt) return a.takenAt < b.takenAt ? -1 : 1;
  return a.id < b.id ? -1 : a.id > b.id ? 1 : 0;
}

function isSorted(samples: readonly Sample[]): boolean {
  for (let i = 1; i < samples.length; i++) if (compareSamples(samples[i - 1]!, samples[i]!) > 0) return false;
  return true;
}

function toSubgroup(ch: Characteristic, s: Sample): SubgroupInput {
  // The reason an engineer gave for leaving the point out travels with it to the chart.
  const excluded = s.excluded === true ? (s.reason ? { excluded: true, exclusionReason: s.reason } : { excluded: true }) : { excluded: false };
  switch (ch.chartType) {
    case 'xmr':
    case 'xbar-r':
    case 'xbar-s':
    case 'ewma':
    case 'cusum':
      return { values: s.values ?? [], ...excluded };
    case 'c':
      return { count: s.count ?? 0, ...excluded };
    default: // p, np, u: count over the inspected quantity
      return { count: s.count ?? 0, size: s.inspected ?? ch.subgroupSize, ...excluded };
  }
}

/**
 * Builds the engine input from current samples (corrections already applied) and the
 * characteristic's phases (withdrawn ones left out). A phase starts at the first sample taken at or after its start.
 */
export function buildChartSeries(ch: Characteristic, phases: readonly Phase[], current: readonly Sample[]): ChartSeries {
  const samples = isSorted(current) ? [...current] : [...current].sort(compareSamples);
  // A withdrawn phase is left out: its points are judged as if it had never started.
  const ordered = [...phases].filter((p) => p.characteristicId === ch.id && !p.withdrawn).sort((a, b) => a.number - b.number);
  const phaseInputs: PhaseInput[] = [];
  const phaseIds: string[] = [];
  for (const p of ordered) {
    // Compared as instants: '08:00:00Z' and '08:00:00.000Z' are the same moment but not the same text.
    let start = 0; // the first phase covers everything before it too
    if (phaseInputs.length > 0) {
      const startsAt = Date.parse(p.startsAt);
      start = samples.findIndex((s) => Date.parse(s.takenAt) >= startsAt);
      if (start < 0) start = samples.length;
    }
    const prev = phaseInputs[phaseInputs.length - 1];
    if (prev && prev.start === start) {
      phaseInputs.pop(); // an empty phase is superseded by the later one
      phaseIds.pop();
    }
    phaseInputs.push(p.given ? { start, given: p.given } : { start, baselineCount: p.baselineCount ?? ch.baselineSize });
    phaseIds.push(p.id);
  }
  if (phaseInputs.length === 0) phaseInputs.push({ start: 0, baselineCount: ch.baselineSize });
  return {
    input: {
      chart: ch.chartType,
      subgroups: samples.map((s) => toSubgroup(ch, s)),
      phases: phaseInputs,
      rules: ch.rules,
      spec: ch.spec,
      ...(ch.chartType === 'ewma' ? { ewma: ch.ewma ?? DEFAULT_EWMA } : {}),
      ...(ch.chartType === 'cusum' ? { cusum: ch.cusum ?? DEFAULT_CUSUM } : {}),
    },
    sampleIds: samples.map((s) => s.id),
    samples,
    phaseIds,
  };
}
