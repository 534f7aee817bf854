/** Hand-built characteristics, phases and samples for the app-layer tests (no store, no server). */
import type { Analysis, ChartPoint, Signal } from '../../src/engine/types';
import type { Acknowledgement, Characteristic, Phase, Response, Sample } from '../../src/schema';
import { createRecordIdGenerator } from '../../src/sync/ids';

/** 2026-12-02 08:00 UTC: the clock the app tests start from. */
export const T0 = Date.UTC(2026, 11, 2, 8, 0, 0);
export const MINUTE = 60_000;

let idClock = T0;
const nextId = createRecordIdGenerator(() => idClock++, (b) => {
  for (let i = 0; i < b.length; i++) b[i] = (i * 53 + idClock) & 0xff;
});
/** Valid, time-ordered UUIDv7 ids (the schema requires UUIDs for device records). */
export const newId = (): string => nextId();

export const iso = (ms: number): string => new Date(ms).toISOString();

export function makeCharacteristic(overrides: Partial<Characteristic> = {}): Characteristic {
  return {
    id: 'ch-bore',
    stationId: 'st-1',
    name: 'Bore diameter',
    unit: 'mm',
    decimals: 2,
    chartType: 'xmr',
    subgroupSize: 1,
    intervalMinutes: 60,
    spec: { lsl: 9.5, usl: 10.5 },
    rules: ['we1'],
    reactionPlan: ['Stop the machine and call the setter', 'Change the insert'],
    causeCategories: [],
    safetyCritical: false,
    baselineSize: 20,
    ...overrides,
  };
}

export function makePhase(overrides: Partial<Phase> & Pick<Phase, 'number' | 'startsAt'>): Phase {
  return { id: `ph-${overrides.number}`, characteristicId: 'ch-bore', reason: 'New insert holder', ...overrides };
}

/** A sample taken `minutes` after T0. */
export function sampleAt(minutes: number, overrides: Partial<Sample> = {}): Sample {
  return {
    kind: 'sample',
    id: newId(),
    characteristicId: 'ch-bore',
    takenAt: iso(T0 + minutes * MINUTE),
    recordedBy: 'p-op',
    deviceId: 'tab-1',
    values: [10],
    ...overrides,
  };
}

/** Twenty in-control individuals around 10 (moving ranges 0.02–0.2), then whatever follows. */
export const BASELINE = [10, 10.1, 9.9, 10, 10.05, 9.95, 10, 10.1, 9.9, 10, 10.02, 9.98, 10, 10.1, 9.9, 10, 10.05, 9.95, 10, 10];

/** Samples one hour apart holding `values` (one individual each). */
export function individuals(values: readonly number[], overrides: Partial<Sample> = {}): Sample[] {
  return values.map((v, i) => sampleAt(i * 60, { values: [v], ...overrides }));
}

/** A chart point with limits; the rest is what the engine would fill in. */
export function point(index: number, value: number, limits: Partial<ChartPoint> = {}): ChartPoint {
  return { index, value, phase: 0, excluded: false, centre: 10, ucl: 10.3, lcl: 9.7, sigma: 0.1, ...limits };
}

/** A hand-built analysis: `n` points at 10 and the given signals. */
export function analysisWith(n: number, signals: readonly Signal[]): Analysis {
  return { chart: 'xmr', points: Array.from({ length: n }, (_, i) => point(i, 10)), phases: [], signals, warnings: [] };
}

export function makeResponse(sampleId: string, overrides: Partial<Response> = {}): Response {
  return {
    kind: 'response',
    id: newId(),
    characteristicId: 'ch-bore',
    sampleId,
    signals: [{ rule: 'we1', explanation: '1 point above the upper control limit', centre: 10, ucl: 10.3, lcl: 9.7, sampleIds: [sampleId] }],
    whatHappened: 'Insert chipped',
    causeCategory: 'Machine',
    action: 'Change the insert',
    respondedBy: 'p-op',
    respondedAt: iso(T0 + 5 * MINUTE),
    deviceId: 'tab-1',
    ...overrides,
  };
}

export function makeAck(responseId: string, overrides: Partial<Acknowledgement> = {}): Acknowledgement {
  return { kind: 'ack', id: newId(), responseId, characteristicId: 'ch-bore', by: 'p-sup', at: iso(T0 + 60 * MINUTE), deviceId: 'tab-1', ...overrides };
}
