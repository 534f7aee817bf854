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

/** The main chart and its companion (range / moving range / s) for one characteristic. */
export function ChartPanel({ view, state, actions }: { view: CharacteristicView; state: AppState; actions: AppActions }) {
  const [whole, setWhole] = useState(false);
  /** Last point shown when looking back in history; null follows the newest point. */
  const [end, setEnd] = useState<number | null>(null);
  const [selected, setSelected] = useState<number | null>(null);
  const { analysis, characteristic: ch } = view;
  const hasCompanion = ch.chartType in COMPANION_NAME || ch.chartType === 'cusum';
  const companionName = ch.chartType === 'cusum' ? 'Lower CUSUM (sum of falls below target)' : COMPANION_NAME[ch.chartType];
  const isCount = ch.chartType === 'p' || ch.chartType === 'u';
  const isCusum = ch.chartType === 'cusum';
  const main = useMemo<PlotPoint[]>(
    () => analysis.points.map((p) => isCusum
      ? { value: p.cusum?.upper ?? null, centre: 0, ucl: p.cusum?.limit ?? null, lcl: null, sigma: null }
      : { value: p.value, centre: p.centre, ucl: p.ucl, lcl: p.lcl, sigma: ch.chartType === 'ewma' ? null : p.sigma }),
    [analysis],
  );
  const companion = useMemo<PlotPoint[]>(
    () => analysis.points.map((p) => isCusum
      ? { value: p.cusum?.lower ?? null, centre: 0, ucl: p.cusum?.limit ?? null, lcl: null, sigma: null }
      : { value: p.companion?.value ?? null, centre: p.companion?.centre ?? null, ucl: p.companion?.ucl ?? null, lcl: p.companion?.lcl ?? null, sigma: null }),
    [analysis],
  );
  const onCompanion = (s: { companion?: boolean; rule: string; side?: string }) => s.companion === true || (isCusum && s.side === 'below');
  const openAt = new Set(view.groups.filter((g) => g.state === 'unanswered').map((g) => g.index));
  const flags = useMemo<PlotFlag[]>(() => {
    const byIndex = new Map<number, string[]>();
    for (const s of analysis.signals) {
      if (onCompanion(s)) continue;
      const tags = byIndex.get(s.index) ?? [];
      const tag = ruleTag(s.rule);
      if (!tags.includes(tag)) tags.push(tag);
      byIndex.set(s.index, tags);
    }
    return [...byIndex].map(([index, tags]) => ({ index, tag: tags.join(' '), open: openAt.has(index) }));
  }, [analysis, view.groups]);
  const companionFlags = useMemo<PlotFlag[]>(
    () => analysis.signals.filter(onCompanion).map((s) => ({ index: s.index, tag: ruleTag(s.rule), open: openAt.has(s.index) })),
    [analysis, view.groups],
  );
  const phaseStarts = useMemo(() => analysis.phases.map((p) => p.start), [analysis]);
  const spec = useMemo(() => ({ lsl: ch.spec.lsl, usl: ch.spec.usl }), [ch]);
  const window = whole ? Math.max(analysis.points.length, 1) : SPAN;
  const n = analysis.points.length;
  const last = analysis.points[n - 1];
  const f = (v: number | null) => (v === null ? 'not yet computed' : v.toFixed(ch.decimals + 1));
  const label = last
    ? `${MAIN_NAME[ch.chartType]} chart of ${ch.name}, ${n} points. Latest ${f(last.value)}; centre ${f(last.centre)}, limits ${f(last.lcl)} to ${f(last.ucl)}. ${view.groups.filter((g) => g.state === 'unanswered').length} signals open.`
    : `${ch.name}: no samples yet.`;
  return (
    <section class="chart-box stack" style="gap:8px" aria-label="Control chart">
      <div class="row" style="justify-content:space-between">
        <h2>{MAIN_NAME[ch.chartType]}</h2>
        <div class="row" style="gap:8px" role="group" aria-label="Span of the chart">
          <button type="button" class="btn small" disabled={whole || (end ?? n) <= SPAN} onClick={() => setEnd(Math.max(SPAN, (end ?? n) - SPAN / 2))}>◀ Earlier</button>
          <button type="button" class="btn small" disabled={whole || end === null} onClick={() => setEnd(end !== null && end + SPAN / 2 < n ? end + SPAN / 2 : null)}>Later ▶</button>
          <button type="button" class="btn small" onClick={() => { setWhole(!whole); setEnd(null); }} aria-pressed={whole}>
            {whole ? `Latest ${SPAN}` : 'Whole history'}
          </button>
        </div>
      </div>
      <div class="chart-legend" aria-hidden="true">
        <span><i class="legend-centre" />centre line</span>
        <span><i class="legend-limit" />control limits</span>
        {ch.spec.lsl !== undefined || ch.spec.usl !== undefined ? <span><i class="legend-spec" />specification</span> : null}
        <span><i class="legend-flag" />run rule fired</span>
      </div>
      <ControlChart label={label} points={main} flags={flags} phaseStarts={phaseStarts} spec={spec} decimals={isCount ? 3 : ch.decimals + 1}
        height={320} showZones window={window} end={end} testId="main-chart" onPick={setSelected} selected={selected} />
      {!hasCompanion ? null : (
        <>
          <h3>{companionName}</h3>
          <ControlChart label={`${companionName} chart of ${ch.name}`} points={companion} flags={companionFlags} phaseStarts={phaseStarts}
            decimals={ch.decimals + 1} height={160} showZones={false} window={window} end={end} testId="companion-chart" onPick={setSelected} selected={selected} />
        </>
      )}
      <p class="chart-hint">Tap a point for its details · drag across the chart to zoom in, double-tap to zoom out · Earlier / Later move through the history.</p>
      {selected !== null ? <PointDetails view={view} index={selected} state={state} actions={actions} onClose={() => setSelected(null)} /> : null}
    </section>
  );
}
