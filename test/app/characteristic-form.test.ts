import { describe, expect, it } from 'vitest';
import {
  changeNeedsNewPhase, characteristicFromForm, entityIdFor, historyConflict, formFromCharacteristic, newCharacteristicForm, withChartType,
} from '../../src/app/characteristic-form';
import { Characteristic } from '../../src/schema';
import { makeCharacteristic } from './helpers';

const filled = () => ({ ...newCharacteristicForm('ch-new', 'st-1'), name: 'Seat bore', unit: 'mm', reactionPlan: ['Re-measure the part'] });

describe('formFromCharacteristic() / characteristicFromForm()', () => {
  it('round-trips a characteristic through the form unchanged', () => {
    const ch = makeCharacteristic({ spec: { lsl: 9.5, target: 10, usl: 10.5 }, causeCategories: ['Tooling', 'Coolant'], safetyCritical: true });
    const back = characteristicFromForm(formFromCharacteristic(ch));
    expect(back).toEqual({ ok: true, value: ch });
  });

  it('round-trips EWMA and CUSUM designs, and a one-sided specification', () => {
    for (const ch of [
      makeCharacteristic({ chartType: 'ewma', ewma: { lambda: 0.1, L: 2.814 }, rules: [], spec: { usl: 10.5 } }),
      makeCharacteristic({ chartType: 'cusum', cusum: { k: 0.5, h: 4 }, rules: [], spec: { lsl: 9.5 } }),
    ]) expect(characteristicFromForm(formFromCharacteristic(ch))).toEqual({ ok: true, value: ch });
  });

  it('gives a new form the published EWMA and CUSUM defaults', () => {
    const f = newCharacteristicForm('x', 'st-1');
    // source: Lucas & Saccucci (1990), Technometrics 32(1): λ = 0.2, L = 2.962 (ARL0 ≈ 500); as reproduced in Montgomery's EWMA chapter (from memory)
    expect([f.ewmaLambda, f.ewmaL]).toEqual(['0.2', '2.962']);
    // k = 0.5, h = 5: Montgomery, Introduction to SQC, CUSUM chapter (from memory)
    expect([f.cusumK, f.cusumH]).toEqual(['0.5', '5']);
  });

  it('accepts a decimal comma and produces a schema-valid record', () => {
    const r = characteristicFromForm({ ...filled(), decimals: '3', lsl: '24,985', usl: '25.015', target: '25' });
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.value.spec).toEqual({ lsl: 24.985, usl: 25.015, target: 25 });
      expect(Characteristic.safeParse(r.value).success).toBe(true);
    }
  });

  it('names the problem next to each field, in plain words', () => {
    const r = characteristicFromForm({ ...newCharacteristicForm('x', 'st-1'), decimals: '2.5', intervalMinutes: 'abc', subgroupSize: '0', lsl: '10', usl: '9', reactionPlan: [] });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors).toMatchObject({
        name: 'Required.', unit: 'Required.', decimals: 'A whole number.', intervalMinutes: '“abc” is not a number.', subgroupSize: 'At least 1.',
        usl: 'The upper limit must be above the lower limit.',
        reactionPlan: 'Give at least one step: operators choose the action taken from this list.',
      });
    }
  });

  it('checks rules between fields: XmR takes 1 value, X̄ charts 2–25, the target inside the spec, limits within the gauge resolution', () => {
    const errs = (over: object) => { const r = characteristicFromForm({ ...filled(), ...over }); return r.ok ? {} : r.errors; };
    expect(errs({ chartType: 'xmr', subgroupSize: '5' }).subgroupSize).toMatch(/one value/);
    expect(errs({ chartType: 'xbar-r', subgroupSize: '1' }).subgroupSize).toMatch(/2 to 25/);
    expect(errs({ lsl: '9', usl: '11', target: '12' }).target).toMatch(/within the specification/);
    expect(errs({ decimals: '1', usl: '10.25' }).usl).toMatch(/More decimals/);
    expect(errs({ rules: [] }).rules).toMatch(/at least one rule/);
    expect(errs({ chartType: 'ewma', rules: [], ewmaLambda: '1.5' }).ewmaLambda).toBe('At most 1.');
    expect(errs({ chartType: 'ewma', ewmaLambda: '0' }).ewmaLambda).toBe('Must be more than 0.');
    expect(errs({ causeCategories: ['Tooling', 'tooling'] }).causeCategories).toMatch(/once/);
  });

  it('drops blank reaction-plan steps and rules an EWMA chart does not use', () => {
    const r = characteristicFromForm({ ...filled(), chartType: 'ewma', reactionPlan: ['  Stop  ', '', 'Call the setter'] });
    expect(r.ok && r.value.reactionPlan).toEqual(['Stop', 'Call the setter']);
    expect(r.ok && r.value.rules).toEqual([]);
    expect(r.ok && r.value.ewma).toEqual({ lambda: 0.2, L: 2.962 });
  });
});

describe('withChartType()', () => {
  it('moves the subgroup size to one that fits the new chart', () => {
    const f = newCharacteristicForm('x', 'st-1');
    expect(withChartType(f, 'xbar-r').subgroupSize).toBe('5');
    expect(withChartType({ ...f, chartType: 'xbar-r', subgroupSize: '4' }, 'xbar-s').subgroupSize).toBe('4');
    expect(withChartType({ ...f, chartType: 'xbar-r', subgroupSize: '4' }, 'xmr').subgroupSize).toBe('1');
    expect(withChartType({ ...f, chartType: 'xbar-r', subgroupSize: '4' }, 'p').subgroupSize).toBe('50');
  });
});

describe('changeNeedsNewPhase()', () => {
  const ch = makeCharacteristic({ chartType: 'xbar-r', subgroupSize: 5 });
  it('says to start a new phase when chart type or subgroup size change on a characteristic with points', () => {
    expect(changeNeedsNewPhase(ch, { chartType: 'xbar-s', subgroupSize: '5' }, 30)).toMatch(/chart type .*start a new phase/);
    expect(changeNeedsNewPhase(ch, { chartType: 'xbar-r', subgroupSize: '4' }, 30)).toMatch(/subgroup size/);
  });
  it('says nothing for other changes, new characteristics or an empty chart', () => {
    expect(changeNeedsNewPhase(ch, { chartType: 'xbar-r', subgroupSize: '5' }, 30)).toBeUndefined();
    expect(changeNeedsNewPhase(undefined, { chartType: 'xmr', subgroupSize: '1' }, 0)).toBeUndefined();
    expect(changeNeedsNewPhase(ch, { chartType: 'xmr', subgroupSize: '1' }, 0)).toBeUndefined();
  });
});

describe('entityIdFor()', () => {
  it('makes a readable, schema-valid id and avoids ids in use', () => {
    expect(entityIdFor('Seat bore Ø (final)', new Set())).toBe('seat-bore-final');
    expect(entityIdFor('Assembly', new Set(['st-assembly']), 'st')).toBe('st-assembly-2');
    expect(entityIdFor('Ø', new Set())).toBe('characteristic');
  });
});

describe('historyConflict()', () => {
  const xbar = makeCharacteristic({ chartType: 'xbar-r', subgroupSize: 5 });
  const fives = [{ values: [1, 2, 3, 4, 5] }];
  it('refuses a switch between measurements and counts once there is history', () => {
    expect(historyConflict(xbar, 'p', fives)).toMatch(/count chart cannot plot/);
    expect(historyConflict(makeCharacteristic({ chartType: 'c', subgroupSize: 1 }), 'xmr', [{}])).toMatch(/measurement chart cannot plot/);
  });
  it('refuses an individuals chart over subgroups of several values', () => {
    expect(historyConflict(xbar, 'xmr', fives)).toMatch(/one value per sample/);
  });
  it('allows changes the history can follow, and anything on an empty chart', () => {
    expect(historyConflict(xbar, 'xbar-s', fives)).toBeUndefined();
    expect(historyConflict(xbar, 'ewma', fives)).toBeUndefined();
    expect(historyConflict(xbar, 'p', [])).toBeUndefined();
    expect(historyConflict(undefined, 'p', fives)).toBeUndefined();
  });
});
