import { analyze, continuesEarlierEpisode, type Analysis, type AnalysisInput, type ChartKind, type RuleCode, type Signal, type SubgroupInput } from '../../engine/index';
import { SignalRuleId, type Acknowledgement, type Characteristic, type Response, type Sample, type SignalSnapshot } from '../../schema/index';
import { DEMO_CHARACTERISTICS, DEMO_DEVICE_ID, DEMO_GIVEN_LIMITS, DEMO_HISTORY_DAYS, demoPhaseId } from './demo-site';
import { BLEMISH_BURST, MODELS, TORQUE_OUTLIER, type ProcessModel, type Story } from './demo-process';
import { binomial, integerBetween, mulberry32, normal, poisson, seededUuidV7, type Random } from './prng';

/** The seed of the demo history; change it and every number in the demo changes. */
export const DEMO_SEED = 19;

const HOUR = 3_600_000;
const OPERATOR = 'p-rana';
const SUPERVISOR = 'p-tomasz';
/** Signals in the last hours before `now` are left unanswered: what a supervisor would find open. */
const OPEN_WINDOW_HOURS = 8;
const FIRST_SAMPLE_OFFSET_MINUTES = 15;

export interface DemoSignal {
  readonly characteristicId: string;
  readonly sampleId: string;
  readonly index: number;
  readonly rules: readonly string[];
  readonly answered: boolean;
}

export interface DemoHistory {
  readonly historyStart: Date;
  /** Every record in the order it would have been made (by its own time). */
  readonly records: readonly (Sample | Response | Acknowledgement)[];
  readonly samples: readonly Sample[];
  readonly responses: readonly Response[];
  readonly acks: readonly Acknowledgement[];
  /** Where the engine's rules fired, and whether the demo answered them. */
  readonly signals: readonly DemoSignal[];
  /** Engine problems met while building (e.g. a chart type it does not handle yet). */
  readonly warnings: readonly string[];
}

/**
 * Builds about three weeks of history ending just before `now`, from a seeded generator: the
 * same `now` and seed always give the same records. Rules are evaluated with the engine's
 * `analyze`; most signals get a Response (and some an Acknowledgement); the latest are left open.
 */
export function buildDemoHistory(now: Date, seed = DEMO_SEED): DemoHistory {
  const end = now.getTime();
  const historyStart = new Date(end - DEMO_HISTORY_DAYS * 24 * HOUR);
  const warnings: string[] = [];
  const samples: Sample[] = [];
  const responses: Response[] = [];
  const acks: Acknowledgement[] = [];
  const signals: DemoSignal[] = [];

  DEMO_CHARACTERISTICS.forEach((c, k) => {
    const model = MODELS[c.id];
    if (!model) throw new Error(`no demo model for ${c.id}`);
    const rng = mulberry32(seed + 1000 * (k + 1));
    const idRng = mulberry32(seed + 1000 * (k + 1) + 1);
    const count = Math.floor((DEMO_HISTORY_DAYS * 24 * 60) / c.intervalMinutes);
    // Offset so that the newest sample of each characteristic falls due 15–21 minutes after `now`.
    const times = Array.from(
      { length: count },
      (_, i) => historyStart.getTime() + (i * c.intervalMinutes + FIRST_SAMPLE_OFFSET_MINUTES + integerBetween(rng, 0, 6)) * 60_000,
    );
    const noise = drawNoise(rng, c, model, count);

    // Closed loop: the designed change lasts until the first signal after it begins, when the
    // operator applies the reaction plan and the process returns to its mean.
    let effectEnd = count;
    if (model.effect) {
      const first = firstSignalFrom(run(c, subgroupsOf(c, model, noise, count), warnings), model.effect.from);
      effectEnd = first === undefined ? count : first + 1;
    }
    const subgroups = subgroupsOf(c, model, noise, effectEnd);
    const analysis = run(c, subgroups, warnings);

    const chSamples = subgroups.map((g, i): Sample => {
      const takenAt = new Date(times[i] ?? 0).toISOString();
      return {
        kind: 'sample',
        id: seededUuidV7(idRng, times[i] ?? 0),
        characteristicId: c.id,
        takenAt,
        recordedBy: OPERATOR,
        deviceId: DEMO_DEVICE_ID,
        ...(g.values ? { values: [...g.values] } : {}),
        ...(g.count !== undefined ? { count: g.count } : {}),
        ...(g.size !== undefined && c.chartType === 'p' ? { inspected: g.size } : {}),
      };
    });
    samples.push(...chSamples);
    if (!analysis) return;

    const openFrom = end - OPEN_WINDOW_HOURS * HOUR;
    // A pattern firing point after point is one event: answer it where it began.
    const continuing = continuesEarlierEpisode(analysis.signals);
    for (const [index, fired] of groupByIndex(analysis.signals.filter((_, i) => !continuing[i]))) {
      const sample = chSamples[index];
      if (!sample) continue;
      const snapshots = fired.map((s) => snapshotOf(s, analysis, chSamples, c.id)).filter((s): s is SignalSnapshot => s !== undefined);
      if (snapshots.length === 0) continue;
      const answered = Date.parse(sample.takenAt) < openFrom;
      signals.push({ characteristicId: c.id, sampleId: sample.id, index, rules: snapshots.map((s) => s.rule), answered });
      if (!answered) continue;
      const respondedAt = Date.parse(sample.takenAt) + integerBetween(rng, 5, 25) * 60_000;
      const story = storyFor(c, model, index, effectEnd);
      const response: Response = {
        kind: 'response',
        id: seededUuidV7(idRng, respondedAt),
        characteristicId: c.id,
        sampleId: sample.id,
        signals: snapshots,
        ...story,
        respondedBy: OPERATOR,
        respondedAt: new Date(respondedAt).toISOString(),
        deviceId: DEMO_DEVICE_ID,
      };
      responses.push(response);
      // The supervisor acknowledges the designed events and every third of the others.
      const designed = story === model.effect?.story || story === TORQUE_OUTLIER.story;
      if (designed || responses.length % 3 === 0) {
        const at = respondedAt + integerBetween(rng, 1, 5) * HOUR;
        if (at < now.getTime()) {
          acks.push({
            kind: 'ack',
            id: seededUuidV7(idRng, at),
            responseId: response.id,
            characteristicId: c.id,
            by: SUPERVISOR,
            at: new Date(at).toISOString(),
            note: designed ? 'Cause found and fixed; seen on the line.' : 'Agreed: no cause found, keep watching.',
            deviceId: DEMO_DEVICE_ID,
          });
        }
      }
    }
  });

  const records = [...samples, ...responses, ...acks].sort((a, b) => timeOf(a) - timeOf(b) || a.id.localeCompare(b.id));
  return { historyStart, records, samples, responses, acks, signals, warnings };
}

interface Noise {
  readonly z: readonly (readonly number[])[];
  readonly counts: readonly number[];
  readonly sizes: readonly number[];
}

/** Random parts drawn once, so a later change of the mean moves the data without changing the draws. */
function drawNoise(rng: Random, c: Characteristic, model: ProcessModel, count: number): Noise {
  const z: number[][] = [];
  const counts: number[] = [];
  const sizes: number[] = [];
  for (let i = 0; i < count; i++) {
    if (c.chartType === 'c') counts.push(poisson(rng, model.mean));
    else if (c.chartType === 'p') {
      const size = integerBetween(rng, 80, 120);
      sizes.push(size);
      counts.push(binomial(rng, size, model.mean));
    } else z.push(Array.from({ length: c.subgroupSize }, () => normal(rng)));
  }
  return { z, counts, sizes };
}

/** The subgroups with the designed effects applied before `effectEnd`. */
function subgroupsOf(c: Characteristic, model: ProcessModel, noise: Noise, effectEnd: number): SubgroupInput[] {
  const n = noise.z.length || noise.counts.length;
  return Array.from({ length: n }, (_, i): SubgroupInput => {
    if (c.chartType === 'c') {
      const burst = i === n - BLEMISH_BURST.hoursBeforeEnd && c.id === 'coating-blemish';
      return { count: burst ? BLEMISH_BURST.count : (noise.counts[i] ?? 0) };
    }
    if (c.chartType === 'p') return { count: noise.counts[i] ?? 0, size: noise.sizes[i] ?? 100 };
    const shift = model.effect && i >= model.effect.from && i < effectEnd ? model.effect.at(i) : 0;
    const values = (noise.z[i] ?? []).map((z) => round(model.mean + shift + model.sigma * z, c.decimals));
    if (c.id === 'bonnet-torque' && i === TORQUE_OUTLIER.index) return { values: [TORQUE_OUTLIER.value] };
    return { values };
  });
}

function run(c: Characteristic, subgroups: readonly SubgroupInput[], warnings: string[]): Analysis | undefined {
  const input: AnalysisInput = {
    chart: c.chartType as ChartKind,
    subgroups,
    phases: [DEMO_GIVEN_LIMITS[c.id] ? { start: 0, given: DEMO_GIVEN_LIMITS[c.id]! } : { start: 0, baselineCount: c.baselineSize }],
    rules: c.rules as readonly RuleCode[],
    spec: c.spec,
    ...(c.ewma ? { ewma: c.ewma } : {}),
    ...(c.cusum ? { cusum: c.cusum } : {}),
  };
  try {
    return analyze(input);
  } catch (error) {
    const message = `${c.id}: the engine could not analyse this chart (${error instanceof Error ? error.message : String(error)}); no responses made for it.`;
    if (!warnings.includes(message)) warnings.push(message);
    return undefined;
  }
}

function firstSignalFrom(analysis: Analysis | undefined, from: number): number | undefined {
  if (!analysis) return from + 40; // without an engine the change lasts 40 subgroups
  const hits = analysis.signals.map((s) => s.index).filter((i) => i >= from);
  return hits.length > 0 ? Math.min(...hits) : undefined;
}

function groupByIndex(signals: readonly Signal[]): Map<number, Signal[]> {
  const byIndex = new Map<number, Signal[]>();
  for (const s of signals) byIndex.set(s.index, [...(byIndex.get(s.index) ?? []), s]);
  return new Map([...byIndex].sort((a, b) => a[0] - b[0]));
}

/** What fired, frozen with the limits at that point; undefined when the engine gave no limits. */
function snapshotOf(signal: Signal, analysis: Analysis, samples: readonly Sample[], characteristicId: string): SignalSnapshot | undefined {
  const rule = SignalRuleId.options.find((r) => r === signal.rule);
  const point = analysis.points[signal.index];
  const limits = signal.companion ? point?.companion : point;
  // CUSUM points carry no ucl/lcl (their decision interval is on the sums): snapshots keep nulls then.
  if (!rule || !limits || (limits.centre === null && signal.rule !== 'cusum')) return undefined;
  return {
    rule,
    explanation: (signal.companion ? `Spread chart: ${signal.explanation}` : signal.explanation).slice(0, 300),
    phaseId: demoPhaseId(characteristicId),
    centre: limits.centre,
    ucl: limits.ucl,
    lcl: limits.lcl,
    sampleIds: signal.points.map((i) => samples[i]?.id).filter((id): id is string => id !== undefined),
  };
}

function storyFor(c: Characteristic, model: ProcessModel, index: number, effectEnd: number): Story {
  if (model.effect && index >= model.effect.from && index <= effectEnd + 2) return model.effect.story;
  if (c.id === 'bonnet-torque' && (index === TORQUE_OUTLIER.index || index === TORQUE_OUTLIER.index + 1)) return TORQUE_OUTLIER.story;
  // The other signals get the small, everyday findings of a line (invented for the demo), and
  // now and then none at all: a real Pareto has a long tail and some honest "nothing found".
  const minor = MINOR_FINDINGS[index % MINOR_FINDINGS.length]!;
  return { ...minor, action: `${c.reactionPlan[0] ?? 'Checked the station.'} ${minor.action}` };
}

const GAUGE: Story = { whatHappened: 'The rule fired with no visible change at the station.', causeCategory: 'Measurement', cause: 'Gauge not zeroed at the start of the shift', action: 'Zeroed the gauge and re-measured; result normal.' };
const TOOL_CHANGE: Story = { whatHappened: 'The rule fired just after a tool change.', causeCategory: 'Method', cause: 'Tool change without the first-off check', action: 'First-off check done; result normal.' };
/** Weighted like a real line's findings: a vital few (gauge zeroing, tool changes) and a long tail. */
const MINOR_FINDINGS: readonly Story[] = [
  GAUGE, TOOL_CHANGE, GAUGE,
  { whatHappened: 'Readings moved after the shift change.', causeCategory: 'People', cause: 'New operator on the station, first shift', action: 'Went through the work instruction together; next samples normal.' },
  GAUGE, TOOL_CHANGE,
  { whatHappened: 'Bay doors open for a delivery; the hall cooled down.', causeCategory: 'Environment', cause: 'Hall temperature dropped during the delivery', action: 'Doors closed; process left running, next samples normal.' },
  GAUGE,
  { whatHappened: 'Parts from a new pallet of stock.', causeCategory: 'Material', cause: 'New batch of stock', action: 'Batch noted on the shift sheet; no change needed.' },
  { whatHappened: 'The rule fired with no visible change at the station.', causeCategory: 'Measurement', cause: 'No assignable cause found', action: 'Result normal; process left running.' },
];

function timeOf(r: Sample | Response | Acknowledgement): number {
  return Date.parse(r.kind === 'sample' ? r.takenAt : r.kind === 'response' ? r.respondedAt : r.at);
}

function round(x: number, decimals: number): number {
  return Number(x.toFixed(decimals));
}
