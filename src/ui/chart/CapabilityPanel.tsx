import type { ComponentChildren } from 'preact';
import { useMemo } from 'preact/hooks';
import type { CharacteristicView } from '../../app/app-state';
import { capabilityUnavailable, studyCapability } from '../../app/capability-study';

const W = 640;
const H = 244;
/** The top band holds the labels of the vertical lines in two rows, clear of the bars. */
const PAD = { left: 40, right: 12, top: 40, bottom: 28 };

/**
 * Capability study of the current phase: histogram against the specification, indices with intervals,
 * cautions. `lead` goes first, before the engine's cautions (the printed report's stability caution).
 */
export function CapabilityPanel({ view, lead }: { view: CharacteristicView; lead?: ComponentChildren }) {
  const why = capabilityUnavailable(view);
  const study = useMemo(() => (why ? undefined : studyCapability(view)), [view]);
  const ch = view.characteristic;
  if (why || !study) return <section class="card stack" data-testid="capability-panel"><h2>Capability</h2><p class="hint">{why ?? 'No capability study is possible yet.'}</p></section>;
  const c = study.capability;
  const d = (x: number | null, digits = 2) => (x === null ? '—' : x.toFixed(digits));
  const ci = (i: { lower: number; upper: number } | null) => (i ? ` (${d(i.lower)}–${d(i.upper)})` : '');
  const bins = study.bins;
  const lo = bins[0]?.from ?? 0;
  const hi = bins[bins.length - 1]?.to ?? 1;
  const top = Math.max(1, ...bins.map((b) => b.count));
  const x = (v: number) => PAD.left + ((v - lo) / (hi - lo)) * (W - PAD.left - PAD.right);
  const y = (n: number) => H - PAD.bottom - (n / top) * (H - PAD.top - PAD.bottom);
  const line = (v: number | undefined, label: string, cls: string, low = false) =>
    v === undefined ? null : (
      <g class={cls}>
        <line x1={x(v)} x2={x(v)} y1={low ? 22 : 4} y2={H - PAD.bottom} />
        <text x={x(v) > W - 60 ? x(v) - 4 : x(v) + 4} text-anchor={x(v) > W - 60 ? 'end' : 'start'} y={low ? 32 : 14}>{label}</text>
      </g>
    );
  return (
    <section class="card stack" aria-labelledby="cap-title" data-testid="capability-panel">
      <h2 id="cap-title">Capability of phase {c.phase + 1} ({c.n} values)</h2>
      {lead}
      {c.cautions.map((t) => <p class="caution" key={t}>{t}</p>)}
      <svg class="histogram" viewBox={`0 0 ${W} ${H}`} role="img"
        aria-label={`Histogram of ${c.n} values of ${ch.name} against the specification limits${ch.spec.lsl !== undefined ? ` ${ch.spec.lsl}` : ''}${ch.spec.usl !== undefined ? ` to ${ch.spec.usl}` : ''}`}>
        {bins.map((b) => (
          <rect key={b.from} x={x(b.from) + 1} width={Math.max(0, x(b.to) - x(b.from) - 2)} y={y(b.count)} height={H - PAD.bottom - y(b.count)} />
        ))}
        <line class="axis" x1={PAD.left} x2={W - PAD.right} y1={H - PAD.bottom} y2={H - PAD.bottom} />
        <text x={PAD.left} y={H - 8}>{lo.toFixed(ch.decimals)}</text>
        <text x={W - PAD.right} y={H - 8} text-anchor="end">{hi.toFixed(ch.decimals)}</text>
        {line(ch.spec.lsl, 'LSL', 'spec')}
        {line(ch.spec.usl, 'USL', 'spec')}
        {line(ch.spec.target, 'target', 'target')}
        {line(c.mean, 'mean', 'mean', true)}
      </svg>
      <div class="figures figures-plain" aria-label="Capability indices">
        <div class="figure"><div class="k">Cp</div><div class="v">{d(c.cp)}<span class="hint">{ci(c.cpInterval)}</span></div></div>
        <div class="figure"><div class="k">Cpk</div><div class="v">{d(c.cpk)}<span class="hint">{ci(c.cpkInterval)}</span></div></div>
        <div class="figure"><div class="k">Pp</div><div class="v">{d(c.pp)}<span class="hint">{ci(c.ppInterval)}</span></div></div>
        <div class="figure"><div class="k">Ppk</div><div class="v">{d(c.ppk)}<span class="hint">{ci(c.ppkInterval)}</span></div></div>
        <div class="figure"><div class="k">Cpm</div><div class="v">{d(c.cpm)}</div></div>
        <div class="figure"><div class="k">Expected ppm (within)</div><div class="v">{c.ppmWithin ? Math.round(c.ppmWithin.total).toLocaleString() : '—'}</div></div>
        <div class="figure"><div class="k">Normality p</div><div class="v">{c.normality ? d(c.normality.pValue, 3) : '—'}</div></div>
      </div>
      <p class="hint">
        Mean {d(c.mean, ch.decimals + 1)} · σ within {d(c.sigmaWithin, ch.decimals + 2)} ({c.sigmaWithinMethod}) · σ overall {d(c.sigmaOverall, ch.decimals + 2)}.
        Intervals at {Math.round(c.confidence * 100)} %: chi-square for Cp and Pp, Bissell's approximation for Cpk and Ppk.
        Capability describes a stable process only.
      </p>
    </section>
  );
}
