import { useMemo, useState } from 'preact/hooks';
import type { AppActions, AppState, CharacteristicView } from '../../app/app-state';
import { ruleTag } from '../rule-text';
import { ControlChart, type PlotFlag, type PlotPoint } from './ControlChart';
import { PointDetails } from './PointDetails';

const COMPANION_NAME: Record<string, string> = { xmr: 'Moving range', 'xbar-r': 'Range', 'xbar-s': 'Standard deviation' };
const MAIN_NAME: Record<string, string> = {
  xmr: 'Individual values', 'xbar-r': 'Subgroup means', 'xbar-s': 'Subgroup means', p: 'Proportion nonconforming', np: 'Number nonconforming', c: 'Defects per sample', u: 'Defects per unit',
};

/** The main chart and its companion (range / moving range / s) for one characteristic. */
export function ChartPanel({ view, state, actions }: { view: CharacteristicView; state: AppState; actions: AppActions }) {
  const [whole, setWhole] = useState(false);
  const [selected, setSelected] = useState<number | null>(null);
  const { analysis, characteristic: ch } = view;
  const isAttribute = !(ch.chartType in COMPANION_NAME);
  const main = useMemo<PlotPoint[]>(
    () => analysis.points.map((p) => ({ value: p.value, centre: p.centre, ucl: p.ucl, lcl: p.lcl, sigma: p.sigma })),
    [analysis],
  );
  const companion = useMemo<PlotPoint[]>(
    () => analysis.points.map((p) => ({ value: p.companion?.value ?? null, centre: p.companion?.centre ?? null, ucl: p.companion?.ucl ?? null, lcl: p.companion?.lcl ?? null, sigma: null })),
    [analysis],
  );
  const openAt = new Set(view.groups.filter((g) => g.state === 'unanswered').map((g) => g.index));
  const flags = useMemo<PlotFlag[]>(() => {
    const byIndex = new Map<number, string[]>();
    for (const s of analysis.signals) {
      if (s.companion) continue;
      const tags = byIndex.get(s.index) ?? [];
      const tag = ruleTag(s.rule);
      if (!tags.includes(tag)) tags.push(tag);
      byIndex.set(s.index, tags);
    }
    return [...byIndex].map(([index, tags]) => ({ index, tag: tags.join(' '), open: openAt.has(index) }));
  }, [analysis, view.groups]);
  const companionFlags = useMemo<PlotFlag[]>(
    () => analysis.signals.filter((s) => s.companion).map((s) => ({ index: s.index, tag: ruleTag(s.rule), open: openAt.has(s.index) })),
    [analysis, view.groups],
  );
  const phaseStarts = useMemo(() => analysis.phases.map((p) => p.start), [analysis]);
  const spec = useMemo(() => ({ lsl: ch.spec.lsl, usl: ch.spec.usl }), [ch]);
  const window = whole ? Math.max(analysis.points.length, 1) : 40;
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
        <button type="button" class="btn small" onClick={() => setWhole(!whole)} aria-pressed={whole}>
          {whole ? 'Latest 40 points' : 'Whole history'}
        </button>
      </div>
      <div class="chart-legend" aria-hidden="true">
        <span><i class="legend-centre" />centre line</span>
        <span><i class="legend-limit" />control limits</span>
        {ch.spec.lsl !== undefined || ch.spec.usl !== undefined ? <span><i class="legend-spec" />specification</span> : null}
        <span><i class="legend-flag" />run rule fired</span>
      </div>
      <ControlChart label={label} points={main} flags={flags} phaseStarts={phaseStarts} spec={spec} decimals={ch.decimals + (isAttribute && ch.chartType !== 'c' && ch.chartType !== 'np' ? 3 : 1)}
        height={320} showZones window={window} testId="main-chart" onPick={setSelected} selected={selected} />
      {isAttribute ? null : (
        <>
          <h3>{COMPANION_NAME[ch.chartType]}</h3>
          <ControlChart label={`${COMPANION_NAME[ch.chartType]} chart of ${ch.name}`} points={companion} flags={companionFlags} phaseStarts={phaseStarts}
            decimals={ch.decimals + 1} height={160} showZones={false} window={window} testId="companion-chart" onPick={setSelected} selected={selected} />
        </>
      )}
      <p class="chart-hint">Tap a point for its details · drag across the chart to zoom · “{whole ? 'Latest 40 points' : 'Whole history'}” to change the span.</p>
      {selected !== null ? <PointDetails view={view} index={selected} state={state} actions={actions} onClose={() => setSelected(null)} /> : null}
    </section>
  );
}
