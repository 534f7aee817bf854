import { useMemo, useState } from 'preact/hooks';
import type { AppState } from '../app/app-state';
import { paretoOfCauses } from '../app/pareto';

const DAYS = [7, 30, 90] as const;

/** Pareto of the cause categories named in answers to signals, across the site. */
export function CausesPanel({ state }: { state: AppState }) {
  const [days, setDays] = useState<(typeof DAYS)[number]>(30);
  const responses = useMemo(() => Object.values(state.views).flatMap((v) => v.responses), [state.views]);
  const bars = useMemo(() => paretoOfCauses(responses, state.now - days * 86_400_000, state.now + 1), [responses, days, state.now]);
  const total = bars.reduce((n, b) => n + b.count, 0);
  const top = Math.max(1, ...bars.map((b) => b.count));
  return (
    <section class="card stack" aria-labelledby="causes-title" data-testid="causes-panel">
      <div class="row" style="justify-content:space-between">
        <h2 id="causes-title">Causes named in answers (Pareto)</h2>
        <div class="row" style="gap:8px" role="group" aria-label="Period">
          {DAYS.map((d) => (
            <button type="button" key={d} class={`btn small${d === days ? ' primary' : ''}`} aria-pressed={d === days} onClick={() => setDays(d)}>
              {d} days
            </button>
          ))}
        </div>
      </div>
      {total === 0 ? (
        <p class="hint">No signal was answered in this period.</p>
      ) : (
        <table class="pareto">
          <caption class="sr-only">Cause categories, most frequent first, with the running share of all {total} answers</caption>
          <thead><tr><th scope="col">Category</th><th scope="col">Answers</th><th scope="col">Running share</th><th scope="col">Most named causes</th></tr></thead>
          <tbody>
            {bars.map((b) => (
              <tr key={b.category}>
                <th scope="row">{b.category}</th>
                <td>
                  <span class="pareto-bar" style={`width:${Math.round((b.count / top) * 160)}px`} aria-hidden="true" />
                  {b.count}
                </td>
                <td>{Math.round(b.cumulative * 100)} %</td>
                <td class="hint">{b.causes.slice(0, 3).map((c) => `${c.cause} (${c.count})`).join(' · ') || '—'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
