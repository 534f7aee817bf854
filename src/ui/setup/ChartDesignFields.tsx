import type { CharacteristicField, CharacteristicForm } from '../../app/characteristic-form';
import type { ChartType, FieldErrors } from './editor-types';
import { TextField } from './TextField';

const CHART_CHOICES: readonly { readonly type: ChartType; readonly text: string }[] = [
  { type: 'xmr', text: 'Individuals and moving range (one value per sample)' },
  { type: 'xbar-r', text: 'X̄ and R (subgroups of 2–10)' },
  { type: 'xbar-s', text: 'X̄ and s (larger subgroups)' },
  { type: 'ewma', text: 'EWMA (small sustained shifts)' },
  { type: 'cusum', text: 'Tabular CUSUM (small sustained shifts)' },
  { type: 'p', text: 'p: proportion of defectives' },
  { type: 'np', text: 'np: number of defectives, fixed sample' },
  { type: 'c', text: 'c: defects per item' },
  { type: 'u', text: 'u: defects per unit, varying size' },
];

/** Chart type, subgroup size, interval, baseline, and the EWMA / CUSUM design when those charts are chosen. */
export function ChartDesignFields({ form, errors, onInput, onChartType }: {
  form: CharacteristicForm; errors: FieldErrors; onInput: (field: CharacteristicField, value: string) => void; onChartType: (t: ChartType) => void;
}) {
  const t = form.chartType;
  const attribute = t === 'p' || t === 'np' || t === 'c' || t === 'u';
  const sizeLabel = t === 'p' || t === 'np' ? 'Usual inspected quantity' : t === 'u' ? 'Usual units inspected' : 'Subgroup size';
  return (
    <div class="stack" style="gap:12px">
      <div class="entry-field setup-field">
        <label for="ch-chart">Chart type</label>
        <select id="ch-chart" class="text-input" value={t} onChange={(e) => onChartType((e.target as HTMLSelectElement).value as ChartType)} data-testid="chart-type">
          {CHART_CHOICES.map((c) => <option key={c.type} value={c.type}>{c.text}</option>)}
        </select>
      </div>
      <div class="setup-grid">
        <TextField id="ch-size" label={sizeLabel} value={form.subgroupSize} onInput={(v) => onInput('subgroupSize', v)} error={errors.subgroupSize} inputMode="numeric"
          hint={t === 'xmr' || t === 'c' ? 'Always 1 for this chart.' : attribute ? 'Each sample can say how many were inspected.' : 'Values measured per sample.'} />
        <TextField id="ch-interval" label="Sample every (minutes)" value={form.intervalMinutes} onInput={(v) => onInput('intervalMinutes', v)} error={errors.intervalMinutes} inputMode="numeric" />
        <TextField id="ch-baseline" label="Baseline (subgroups)" value={form.baselineSize} onInput={(v) => onInput('baselineSize', v)} error={errors.baselineSize} inputMode="numeric"
          hint="Limits of each phase come from its first subgroups; under 20 they are provisional." />
      </div>
      {t === 'ewma' ? (
        <div class="setup-grid" role="group" aria-label="EWMA design">
          <TextField id="ch-lambda" label="Weight λ (0–1)" value={form.ewmaLambda} onInput={(v) => onInput('ewmaLambda', v)} error={errors.ewmaLambda} inputMode="decimal" />
          <TextField id="ch-L" label="Limit width L (sigmas)" value={form.ewmaL} onInput={(v) => onInput('ewmaL', v)} error={errors.ewmaL} inputMode="decimal"
            hint="λ 0.2 with L 2.962 gives an in-control average run length of about 500 (Lucas & Saccucci, 1990)." />
        </div>
      ) : null}
      {t === 'cusum' ? (
        <div class="setup-grid" role="group" aria-label="CUSUM design">
          <TextField id="ch-k" label="Reference value k (sigmas)" value={form.cusumK} onInput={(v) => onInput('cusumK', v)} error={errors.cusumK} inputMode="decimal" />
          <TextField id="ch-h" label="Decision interval h (sigmas)" value={form.cusumH} onInput={(v) => onInput('cusumH', v)} error={errors.cusumH} inputMode="decimal"
            hint="k 0.5 with h 4 or 5 is the usual design for detecting a 1-sigma shift (Montgomery, CUSUM chapter)." />
        </div>
      ) : null}
    </div>
  );
}
