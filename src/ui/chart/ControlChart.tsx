import { useEffect, useLayoutEffect, useRef } from 'preact/hooks';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';

/** One plotted point with the limits in force there (limits vary per point when the sample size does). */
export interface PlotPoint {
  readonly value: number | null;
  /** Limits are null where they cannot be computed (the engine says why in its warnings). */
  readonly centre: number | null;
  readonly ucl: number | null;
  readonly lcl: number | null;
  /** Zone width (sigma of the plotted statistic); null or 0 hides the zone lines. */
  readonly sigma: number | null;
}

export interface PlotFlag {
  readonly index: number;
  /** Short rule tag drawn beside the point, e.g. "WE1". */
  readonly tag: string;
  /** Answered flags are drawn hollow; open ones filled. */
  readonly open: boolean;
}

export interface ControlChartProps {
  /** Accessible name and summary of what the chart shows. */
  readonly label: string;
  readonly points: readonly PlotPoint[];
  readonly flags: readonly PlotFlag[];
  /** Points where a new phase starts (a boundary is drawn before the point), with the phase's name. */
  readonly phaseStarts: readonly { readonly index: number; readonly label: string }[];
  /** Index in the whole history of the first point given (the x axis counts from it). */
  readonly offset: number;
  readonly spec?: { readonly lsl?: number | undefined; readonly usl?: number | undefined };
  readonly decimals: number;
  readonly height: number;
  readonly showZones: boolean;
  readonly testId?: string;
  /** Called with the point's index when a point is tapped. */
  readonly onPick?: (index: number) => void;
  /** The point shown in the details panel: ringed on the chart. */
  readonly selected?: number | null;
}

function cssVar(el: Element, name: string, fallback: string): string {
  return getComputedStyle(el).getPropertyValue(name).trim() || fallback;
}

function buildData(p: ControlChartProps): uPlot.AlignedData {
  const n = p.points.length;
  const x = Array.from({ length: n }, (_, i) => p.offset + i + 1);
  const col = (f: (q: PlotPoint) => number | null) => p.points.map(f);
  const zone = (k: number) => col((q) => (p.showZones && q.sigma && q.centre !== null ? q.centre + k * q.sigma : null));
  const spec = (v: number | undefined) => x.map(() => (v === undefined ? null : v));
  return [
    x,
    col((q) => q.value),
    col((q) => q.ucl),
    col((q) => q.centre),
    col((q) => q.lcl),
    zone(2), zone(1), zone(-1), zone(-2),
    spec(p.spec?.usl),
    spec(p.spec?.lsl),
  ] as uPlot.AlignedData;
}

/** The control chart: points, centre line, control limits, zones, spec limits, phases and flags. Sole uPlot user. */
export function ControlChart(props: ControlChartProps) {
  const host = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const latest = useRef(props);
  latest.current = props;

  useEffect(() => {
    const el = host.current;
    if (!el) return;
    const colour = {
      line: cssVar(el, '--chart-line', '#3b4c56'),
      centre: cssVar(el, '--chart-centre', '#1d6b6b'),
      limit: cssVar(el, '--chart-limit', '#14232b'),
      zone: cssVar(el, '--chart-zone', 'rgba(0,0,0,.15)'),
      spec: cssVar(el, '--chart-spec', '#7a2e8e'),
      signal: cssVar(el, '--signal', '#a3221b'),
      ink: cssVar(el, '--ink', '#14232b'),
      soft: cssVar(el, '--ink-soft', '#3d4d56'),
      surface: cssVar(el, '--surface', '#fff'),
      focus: cssVar(el, '--focus', '#1f6feb'),
    };
    const stepped = uPlot.paths.stepped!({ align: 1 });
    const fmt = (v: number) => v.toFixed(latest.current.decimals);
    const drawOverlay = (u: uPlot) => {
      const p = latest.current;
      const ctx = u.ctx;
      const dpr = devicePixelRatio || 1;
      ctx.save();
      // Phase boundaries: a solid vertical rule half-way before the first point of the phase.
      ctx.strokeStyle = colour.soft;
      ctx.lineWidth = 2 * dpr;
      ctx.setLineDash([]);
      for (const { index: start, label } of p.phaseStarts) {
        if (start <= 0) continue;
        const px = u.valToPos(p.offset + start + 0.5, 'x', true);
        if (px < u.bbox.left || px > u.bbox.left + u.bbox.width) continue;
        ctx.beginPath();
        ctx.moveTo(px, u.bbox.top);
        ctx.lineTo(px, u.bbox.top + u.bbox.height);
        ctx.stroke();
        ctx.fillStyle = colour.soft;
        ctx.font = `${12 * dpr}px sans-serif`;
        ctx.fillText(label, px + 4 * dpr, u.bbox.top + 14 * dpr);
      }
      // The selected point: a ring in the focus colour.
      if (p.selected !== null && p.selected !== undefined) {
        const v = p.points[p.selected]?.value;
        if (v !== null && v !== undefined) {
          ctx.beginPath();
          ctx.arc(u.valToPos(p.offset + p.selected + 1, 'x', true), u.valToPos(v, 'y', true), 13 * dpr, 0, 2 * Math.PI);
          ctx.lineWidth = 3 * dpr;
          ctx.strokeStyle = colour.focus;
          ctx.stroke();
        }
      }
      // Flags: a diamond around each flagged point, filled while open, with the rule tag.
      ctx.font = `bold ${13 * dpr}px sans-serif`;
      for (const f of p.flags) {
        const v = p.points[f.index]?.value;
        if (v === null || v === undefined) continue;
        const cx = u.valToPos(p.offset + f.index + 1, 'x', true);
        const cy = u.valToPos(v, 'y', true);
        if (cx < u.bbox.left - 1 || cx > u.bbox.left + u.bbox.width + 1) continue;
        const r = 9 * dpr;
        ctx.beginPath();
        ctx.moveTo(cx, cy - r);
        ctx.lineTo(cx + r, cy);
        ctx.lineTo(cx, cy + r);
        ctx.lineTo(cx - r, cy);
        ctx.closePath();
        ctx.lineWidth = 3 * dpr;
        ctx.strokeStyle = colour.signal;
        ctx.stroke();
        if (f.open) {
          ctx.fillStyle = colour.signal;
          ctx.fill();
        }
        ctx.fillStyle = colour.signal;
        // The tag goes left of the point near the right edge, so it is never clipped.
        const w = ctx.measureText(f.tag).width;
        const right = cx + r + 3 * dpr + w < u.bbox.left + u.bbox.width;
        ctx.fillText(f.tag, right ? cx + r + 3 * dpr : cx - r - 3 * dpr - w, cy - r);
      }
      ctx.restore();
      // For the latency benchmark: when the chart has drawn, and whether its newest point is flagged.
      const n = p.points.length;
      performance.mark('plumbline:chart-drawn', { detail: { chart: p.testId ?? '', newest: p.offset + n, newestFlagged: p.flags.some((f) => f.index === n - 1) } });
    };
    const opts: uPlot.Options = {
      width: el.clientWidth || 600,
      height: latest.current.height,
      scales: {
        x: { time: false },
        // With nothing to plot yet (no samples, or limits not computed) uPlot has no y range and its
        // axis code fails: give it a neutral one until there is data.
        y: { range: (_u, min, max) => (min === null || max === null || !Number.isFinite(min) || !Number.isFinite(max) ? [0, 1] : uPlot.rangeNum(min, max, 0.1, true)) },
      },
      legend: { show: false },
      cursor: { drag: { x: true, y: false }, points: { size: 12 } },
      axes: [
        { stroke: colour.soft, grid: { stroke: colour.zone, width: 1 }, ticks: { stroke: colour.zone } },
        { stroke: colour.soft, grid: { stroke: colour.zone, width: 1 }, ticks: { stroke: colour.zone }, size: 70, values: (_u, vals) => vals.map((v) => fmt(v)) },
      ],
      series: [
        {},
        { label: 'value', stroke: colour.line, width: 2, points: { show: true, size: 8, fill: colour.surface, stroke: colour.line, width: 2 } },
        { label: 'UCL', stroke: colour.limit, width: 2, dash: [12, 6], paths: stepped, points: { show: false } },
        { label: 'centre', stroke: colour.centre, width: 2.5, paths: stepped, points: { show: false } },
        { label: 'LCL', stroke: colour.limit, width: 2, dash: [12, 6], paths: stepped, points: { show: false } },
        ...[0, 1, 2, 3].map(() => ({ stroke: colour.zone, width: 1, dash: [3, 5], paths: stepped, points: { show: false } })),
        { label: 'USL', stroke: colour.spec, width: 2.5, dash: [2, 5], points: { show: false } },
        { label: 'LSL', stroke: colour.spec, width: 2.5, dash: [2, 5], points: { show: false } },
      ],
      hooks: { draw: [drawOverlay] },
    };
    const u = new uPlot(opts, buildData(latest.current), el);
    plot.current = u;
    // A tap picks the nearest point, from where the tap landed (not from the cursor, which a tap
    // on the spot of the previous one does not move).
    const pick = (e: MouseEvent) => {
      const i = u.posToIdx(e.clientX - u.over.getBoundingClientRect().left);
      if (i >= 0 && i < latest.current.points.length) latest.current.onPick?.(i);
    };
    u.over.addEventListener('click', pick);
    const ro = new ResizeObserver(() => u.setSize({ width: el.clientWidth || 600, height: latest.current.height }));
    ro.observe(el);
    return () => {
      ro.disconnect();
      u.destroy();
      plot.current = null;
    };
  }, []);

  // New data: one setData per change, in a layout effect so the chart is redrawn in the same frame
  // as the render (a plain effect waits for the next paint: a frame later).
  useLayoutEffect(() => {
    const u = plot.current;
    if (!u) return;
    u.setData(buildData(props), false);
    const n = props.points.length;
    u.setScale('x', { min: props.offset + 0.5, max: props.offset + Math.max(n, 2) + 0.5 });
  }, [props.points, props.flags, props.offset, props.spec, props.showZones, props.phaseStarts]);

  useEffect(() => plot.current?.redraw(false), [props.selected]);

  return <div ref={host} class="chart-canvas" role="img" aria-label={props.label} data-testid={props.testId} />;
}
