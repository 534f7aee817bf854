/** Validated phase layout: where each phase starts and which subgroups form its baseline. */
import { EngineInputError } from './subgroup-stats';
import type { PhaseInput } from './types';

export interface PhasePlan {
  readonly index: number;
  readonly start: number;
  /** Exclusive; Infinity for the last phase. */
  readonly end: number;
  readonly baselineStart: number;
  /** Exclusive; clipped to the phase end. */
  readonly baselineEnd: number;
  readonly input: PhaseInput;
}

export function planPhases(phases: readonly PhaseInput[] | undefined): PhasePlan[] {
  const list = phases && phases.length > 0 ? phases : [{ start: 0 }];
  const plans: PhasePlan[] = [];
  list.forEach((input, index) => {
    const start = input.start;
    if (!Number.isInteger(start) || start < 0) throw new EngineInputError(`phase ${index}: start must be a whole number ≥ 0, got ${start}`);
    if (index === 0 && start !== 0) throw new EngineInputError('the first phase must start at subgroup 0');
    const prev = plans[index - 1];
    if (prev && start <= prev.start) throw new EngineInputError(`phase ${index}: starts at ${start}, not after phase ${index - 1} (${prev.start})`);
    const next = list[index + 1];
    if (next && !(next.start > start)) throw new EngineInputError(`phase ${index + 1}: starts at ${next.start}, not after phase ${index} (${start})`);
    const end = next ? next.start : Infinity;
    const baselineStart = input.baselineStart ?? start;
    if (!Number.isInteger(baselineStart) || baselineStart < start || baselineStart >= end) {
      throw new EngineInputError(`phase ${index}: the baseline must start inside the phase (${start} to ${end === Infinity ? 'the end' : end - 1}), got ${baselineStart}`);
    }
    const count = input.baselineCount;
    if (count !== undefined && (!Number.isInteger(count) || count < 1)) throw new EngineInputError(`phase ${index}: baselineCount must be a whole number ≥ 1, got ${count}`);
    const baselineEnd = Math.min(end, count === undefined ? Infinity : baselineStart + count);
    if (input.given) {
      const g = input.given;
      if (!Number.isFinite(g.centre)) throw new EngineInputError(`phase ${index}: the given centre must be a finite number`);
      if (g.sigma !== undefined && !(Number.isFinite(g.sigma) && g.sigma > 0)) throw new EngineInputError(`phase ${index}: the given sigma must be a positive number`);
    }
    plans.push({ index, start, end, baselineStart, baselineEnd, input });
  });
  return plans;
}
