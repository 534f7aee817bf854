import { analyze } from '../engine';
import type { Capability } from '../engine/types';
import { isVariableChart } from '../schema';
import type { CharacteristicView } from './app-state';

export interface HistogramBin {
  readonly from: number;
  readonly to: number;
  readonly count: number;
}

export interface CapabilityStudy {
  readonly capability: Capability;
  /** Individual values of the phase studied (included subgroups only). */
  readonly values: readonly number[];
  readonly bins: readonly HistogramBin[];
}

/** Why no study can be made, in words for the screen; undefined when one can. */
export function capabilityUnavailable(view: CharacteristicView): string | undefined {
  const ch = view.characteristic;
  if (!isVariableChart(ch.chartType)) return 'Capability indices need measured values; this characteristic is counted.';
  if (ch.spec.lsl === undefined && ch.spec.usl === undefined) return 'This characteristic has no specification limits to compare the process with.';
  if (view.series.samples.length < 2) return 'Not enough samples yet.';
  return undefined;
}

/**
 * Equal-width bins over the values and the specification limits, about √n of them (between 6 and
 * 30: common practice for a first look at a distribution). With the gauge's `resolution`, the bin
 * width is a whole number of resolution steps, so readings do not pile up in every other bin.
 */
export function histogram(values: readonly number[], lsl?: number, usl?: number, resolution?: number): HistogramBin[] {
  if (values.length === 0) return [];
  let lo = Math.min(...values, ...(lsl !== undefined ? [lsl] : []));
  let hi = Math.max(...values, ...(usl !== undefined ? [usl] : []));
  if (hi === lo) {
    lo -= 0.5;
    hi += 0.5;
  }
  let k = Math.max(6, Math.min(30, Math.round(Math.sqrt(values.length))));
  let w = (hi - lo) / k;
  if (resolution && resolution > 0 && w > resolution) {
    w = Math.ceil(w / resolution - 1e-9) * resolution;
    lo = Math.floor(lo / resolution + 1e-9) * resolution - resolution / 2; // readings sit in the middle of a bin
    k = Math.max(1, Math.ceil((hi - lo) / w - 1e-9));
  }
  const bins = Array.from({ length: k }, (_, i) => ({ from: lo + i * w, to: lo + (i + 1) * w, count: 0 }));
  for (const v of values) bins[Math.min(k - 1, Math.max(0, Math.floor((v - lo) / w)))]!.count++;
  return bins;
}

/** The capability study of the current phase: the engine's indices and a histogram of its values. */
export function studyCapability(view: CharacteristicView): CapabilityStudy | undefined {
  if (capabilityUnavailable(view)) return undefined;
  const ch = view.characteristic;
  const analysis = analyze({ ...view.series.input, spec: ch.spec });
  const capability = analysis.capability;
  if (!capability) return undefined;
  const phase = analysis.phases[capability.phase];
  const values: number[] = [];
  if (phase) {
    view.series.input.subgroups?.forEach((g, i) => {
      if (i >= phase.start && i < phase.end && !g.excluded) values.push(...(g.values ?? []));
    });
  }
  return { capability, values, bins: histogram(values, ch.spec.lsl, ch.spec.usl, 10 ** -ch.decimals) };
}
