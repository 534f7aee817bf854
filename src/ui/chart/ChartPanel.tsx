import { useMemo, useState } from 'preact/hooks';
import type { AppActions, AppState, CharacteristicView } from '../../app/app-state';
import { ruleTag } from '../rule-text';
import { ControlChart, type PlotFlag, type PlotPoint } from './ControlChart';
import { PointDetails } from './PointDetails';

/** Points shown by default: the latest stretch of the history. */
const SPAN = 40;

const COMPANION_NAME: Record<string, string> = { xmr: 'Moving range', 'xbar-r': 'Range', 'xbar-s': 'Standard deviation' };
const MAIN_NAME: Record<string, string> = {
  xmr: 'Individual values', 'xbar-r': 'Subgroup means', 'xbar-s': 'Subgroup means', p: 'Proportion nonconforming', np: 'Number nonconforming', c: 'Defects per sample', u: 'Defects per unit',
  ewma: 'EWMA (exponentially weighted moving average)', cusum: 'Upper CUSUM (sum of rises above target)',
};

/**
 * The main chart and its companion (range / moving range / s) for one characteristic. With `span`
 * (the printed report) it shows those points only, with nothing to tap or move.
 */
export function ChartPanel({ view, state, actions, span }: { view: CharacteristicView; state: AppState; actions: AppActions; span?: { readonly from: number; readonly to: number } }) {
  const [whole, setWhole] = useState(false);
  /** Last point shown when looking back in history; null follows the newest point. */
  const [end, setEnd] = useState<number | null>(null);
  const [selected, setSelected] = useState<number | null>(null);
  const { analysis, characteristic: ch } = view;
  const hasCompanion = ch.chartType in COMPANION_NAME || ch.chartType === 'cusum';
  const companionName = ch.chartType === 'cusum' ? 'Lower CUSUM (sum of falls below target)' : COMPANION_NAME[ch.chartType];
  const isCount = ch.chartType === 'p' || ch.chartType === 'u';
  const isCusum = ch.chartType === 'cusum';
  const n = analysis.points.length;
  // Only the points on show go to the chart: the latest SPAN by default, or the whole history.
  const to = span ? Math.min(n, span.to) : whole ? n : Math.min(n, end ?? n);
  const from = span ? Math.min(span.from, to) : whole ? 0 : Math.max(0, to - SPAN);
  const main = useMemo<PlotPoint[]>(
    () => analysis.points.slice(from, to).map((p) => isCusum
      ? { value: p.cusum?.upper ?? null, centre: 0, ucl: p.cusum?.limit ?? null, lcl: null, sigma: null }
      : { value: p.value, centre: p.centre, ucl: p.ucl, lcl: p.lcl, sigma: ch.chartType === 'ewma' ? null : p.sigma }),
    [analysis, from, to],
  );
  const companion = useMemo<PlotPoint[]>(
    () => analysis.points.slice(from, to).map((p) => isCusum
      ? { value: p.cusum?.lower ?? null, centre: 0, ucl: p.cusum?.limit ?? null, lcl: null, sigma: null }
      : { value: p.companion?.value ?? null, centre: p.companion?.centre ?? null, ucl: p.companion?.ucl ?? null, lcl: p.companion?.lcl ?? null, sigma: null }),
    [analysis, from, to],
  );
  const onCompanion = (s: { companion?: boolean; side?: string }) => s.companion === true || (isCusum && s.side === 'below');
  const openAt = new Set<number>();
  for (const g of view.groups) if (g.state === 'unanswered') for (let i = g.index; i <= g.lastIndex; i++) openAt.add(i);
  const flagsFor = (onThisChart: (s: { companion?: boolean; side?: string }) => boolean): PlotFlag[] => {
    const byIndex = new Map<number, string[]>();
    for (const s of analysis.signals) {
      if (!onThisChart(s) || s.index < from || s.index >= to) continue;
      const tags = byIndex.get(s.index) ?? [];
      const tag = ruleTag(s.rule);
      if (!tags.includes(tag)) tags.push(tag);
      byIndex.set(s.index, tags);
    }
    return [...byIndex].map(([index, tags]) => ({ index: index - from, tag: tags.join(' '), open: openAt.has(index) }));
  };
  const flags = useMemo(() => flagsFor((s) => !onCompanion(s)), [analysis, view.groups, from, to]);
  const companionFlags = useMemo(() => flagsFor(onCompanion), [analysis, view.groups, from, to]);
  const phaseStarts = useMemo(
    () => analysis.phases.filter((p) => p.start > from && p.start < to).map((p) => ({ index: p.start - from, label: `phase ${p.index + 1}` })),
    [analysis, from, to],
  );
  // The CUSUM charts plot sums, not values: the specification does not belong on them.
  const spec = useMemo(() => (isCusum ? {} : { lsl: ch.spec.lsl, usl: ch.spec.usl }), [ch]);
  const last = analysis.points[n - 1];
  const pick = span ? undefined : (i: number) => setSelected(from + i);
  const selectedHere = selected !== null && selected >= from && selected < to ? selected - from : null;
  const f = (v: number | null) => (v === null ? 'not yet computed' : v.toFixed(ch.decimals + 1));
  const label = last
    ? `${MAIN_NAME[ch.chartType]} chart of ${ch.name}, ${span ? `${to - from} of ${n}` : n} points. Latest ${f(last.value)}; centre ${f(last.centre)}, limits ${f(last.lcl)} to ${f(last.ucl)}. ${view.groups.filter((g) => g.state === 'unanswered').length} signals open.`
    : `${ch.name}: no samples yet.`;
  return (
    <section class="chart-box stack" style="gap:8px" aria-label="Control chart">
      <div class="row" style="justify-content:space-between">
        <h2>{MAIN_NAME[ch.chartType]}</h2>
        {span ? null : <div class="row" style="gap:8px" role="group" aria-label="Span of the chart">
          <button type="button" class="btn small" disabled={whole || (end ?? n) <= SPAN} onClick={() => setEnd(Math.max(SPAN, (end ?? n) - SPAN / 2))}>◀ Earlier</button>
          <button type="button" class="btn small" disabled={whole || end === null} onClick={() => setEnd(end !== null && end + SPAN / 2 < n ? end + SPAN / 2 : null)}>Later ▶</button>
          <button type="button" class="btn small" onClick={() => { setWhole(!whole); setEnd(null); }} aria-pressed={whole}>
            {whole ? `Latest ${SPAN}` : 'Whole history'}
          </button>
        </div>}
      </div>
      <div class="chart-legend" aria-hidden="true">
        <span><i class="legend-centre" />{isCusum ? 'zero (on target)' : 'centre line'}</span>
        <span><i class="legend-limit" />{isCusum ? 'decision interval H' : 'control limits'}</span>
        {!isCusum && (ch.spec.lsl !== undefined || ch.spec.usl !== undefined) ? <span><i class="legend-spec" />specification</span> : null}
        <span><i class="legend-flag" />run rule fired</span>
      </div>
      <ControlChart label={label} points={main} flags={flags} phaseStarts={phaseStarts} spec={spec} decimals={isCount ? 3 : ch.decimals + 1}
        height={span ? 260 : 320} showZones offset={from} testId="main-chart" onPick={pick} selected={selectedHere} />
      {!hasCompanion ? null : (
        <>
          <h3>{companionName}</h3>
          <ControlChart label={`${companionName} chart of ${ch.name}`} points={companion} flags={companionFlags} phaseStarts={phaseStarts}
            decimals={ch.decimals + 1} height={span ? 130 : 160} showZones={false} offset={from} testId="companion-chart" onPick={pick} selected={selectedHere} />
        </>
      )}
      {phaseStarts.length ? (
        <p class="chart-hint" data-testid="phase-boundaries">
          {phaseStarts.map((p) => `New ${p.label} from point ${from + p.index + 1}`).join(' · ')}
        </p>
      ) : null}
      {span ? null : <p class="chart-hint">Tap a point for its details · drag across the chart to zoom in, double-tap to zoom out · Earlier / Later move through the history.</p>}
      {selected !== null && !span ? <PointDetails view={view} index={selected} state={state} actions={actions} onClose={() => setSelected(null)} /> : null}
    </section>
  );
}
