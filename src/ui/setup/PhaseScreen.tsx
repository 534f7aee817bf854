import { useState } from 'preact/hooks';
import type { AppActions, AppState } from '../../app/app-state';
import { newPhaseForm, phaseEntriesFromForm, startChoices, type PhaseField, type PhaseForm } from '../../app/phase-form';
import { newPhaseConfirmation } from '../../app/phase-change';
import { isVariableChart, type Phase } from '../../schema';
import { formatShortDateTime } from '../format-time';
import { focusFirstProblem } from './focus-first-problem';
import { ConfirmChange } from './ConfirmChange';
import { OfflineNotice } from './OfflineNotice';
import { TextField } from './TextField';
import './setup.css';
import './phase-change.css';

const drafts = new Map<string, PhaseForm>();

/** Start a new phase after a documented process change: why, from when, and how its limits are set. */
export function PhaseScreen({ state, actions, characteristicId, fromSampleId }: {
  state: AppState; actions: AppActions; characteristicId: string; fromSampleId?: string | undefined;
}) {
  const ch = state.setup.characteristics.find((c) => c.id === characteristicId);
  const view = state.views[characteristicId];
  const [form, setFormState] = useState<PhaseForm | null>(() => {
    const start = ch ? drafts.get(characteristicId) ?? newPhaseForm(ch) : null;
    // Opened from a point on the chart: that point is where the phase starts.
    return start && fromSampleId ? { ...start, startMode: 'point', startSampleId: fromSampleId } : start;
  });
  const [touched, setTouched] = useState<ReadonlySet<string>>(new Set());
  const [tried, setTried] = useState(false);
  const [busy, setBusy] = useState(false);
  const [sendFailed, setSendFailed] = useState(false);
  /** The phase entries waiting for the engineer's confirmation (what changes on the chart is shown first). */
  const [pending, setPending] = useState<Phase[] | null>(null);
  if (state.person?.role !== 'engineer' && state.person?.role !== 'admin') return <main class="main"><p>Only a quality engineer or an admin can start a phase.</p></main>;
  if (!ch || !form) return <main class="main"><p>This characteristic is not set up on this tablet.</p></main>;
  if (!view) return <main class="main"><p class="hint">Loading chart…</p></main>;
  const setForm = (next: PhaseForm) => {
    drafts.set(characteristicId, next);
    setFormState(next);
    setPending(null);
  };
  const input = (field: keyof PhaseForm, value: string) => {
    setForm({ ...form, [field]: value });
    setTouched(new Set([...touched, field]));
  };
  const ctx = {
    characteristic: ch, phases: state.setup.phases, samples: view.series.samples,
    currentPhaseStart: view.analysis.phases[view.analysis.phases.length - 1]?.start ?? 0, now: state.now,
  };
  const result = phaseEntriesFromForm(form, ctx);
  const all = result.ok ? {} : result.errors;
  const errors: Partial<Record<PhaseField, string>> = Object.fromEntries(Object.entries(all).filter(([f]) => tried || touched.has(f)));
  const choices = startChoices(ctx);
  const d = ch.decimals + 1;
  const back = () => actions.open({ name: 'characteristic', characteristicId });
  const review = (e: Event) => {
    e.preventDefault();
    setTried(true);
    // Re-read "now" at the moment of saving: the phase starts with the next sample.
    const fresh = phaseEntriesFromForm(form, { ...ctx, now: Date.now() });
    if (!fresh.ok) return focusFirstProblem();
    setPending(fresh.value);
  };
  const save = async () => {
    if (!pending) return;
    setBusy(true);
    const ok = await actions.saveSetup(pending.map((p) => ({ kind: 'phase', id: p.id, body: p })), `The new phase of ${ch.name}`);
    setBusy(false);
    setSendFailed(!ok);
    if (ok) {
      drafts.delete(characteristicId);
      back();
    } else setPending(null);
  };
  return (
    <main class="main stack setup-screen">
      <button type="button" class="btn quiet small back-link" onClick={back}>← {ch.name}</button>
      <h1>Start a new phase of “{ch.name}”</h1>
      <p class="hint">Start a phase after a documented change to the process (new tool, new material, a method change), not to make a signal go away. The earlier phases keep their limits.</p>
      <OfflineNotice sync={state.sync} />
      <form class="stack" onSubmit={review} noValidate data-testid="phase-form">
        <section class="card stack">
          <TextField id="ph-reason" label="Reason: the documented process change" value={form.reason} onInput={(v) => input('reason', v)} error={errors.reason} multiline />
        </section>
        <section class="card stack">
          <fieldset>
            <legend>The phase starts</legend>
            <label class="check-row"><input type="radio" name="ph-start" checked={form.startMode === 'now'} onChange={() => setForm({ ...form, startMode: 'now' })} />
              <span>With the next sample (from now)</span></label>
            <label class="check-row"><input type="radio" name="ph-start" checked={form.startMode === 'point'} disabled={choices.length === 0}
              onChange={() => setForm({ ...form, startMode: 'point', startSampleId: form.startSampleId || (choices[0]?.id ?? '') })} data-testid="start-at-point" />
              <span>At a point already on the chart{choices.length === 0 ? ' (none after the current phase began)' : ''}</span></label>
          </fieldset>
          {form.startMode === 'point' ? (
            <div class="entry-field setup-field">
              <label for="ph-point">First point of the new phase</label>
              <select id="ph-point" class="text-input" value={form.startSampleId} onChange={(e) => input('startSampleId', (e.target as HTMLSelectElement).value)}
                aria-invalid={errors.startSampleId ? 'true' : undefined} aria-describedby={errors.startSampleId ? 'ph-point-error' : undefined} data-testid="start-point">
                {choices.map((c) => (
                  <option key={c.id} value={c.id}>Point {c.index + 1} · {formatShortDateTime(c.takenAt)} · {view.analysis.points[c.index]?.value.toFixed(d) ?? ''}</option>
                ))}
              </select>
              {errors.startSampleId ? <span id="ph-point-error" class="error-text field-error">{errors.startSampleId}</span> : null}
            </div>
          ) : null}
        </section>
        <section class="card stack">
          <fieldset>
            <legend>Limits of the new phase</legend>
            <label class="check-row"><input type="radio" name="ph-limits" checked={form.limitsMode === 'baseline'} onChange={() => setForm({ ...form, limitsMode: 'baseline' })} />
              <span>Computed from its first subgroups (baseline)</span></label>
            <label class="check-row"><input type="radio" name="ph-limits" checked={form.limitsMode === 'given'} onChange={() => setForm({ ...form, limitsMode: 'given' })} data-testid="limits-given" />
              <span>Given: from an earlier study or a standard</span></label>
          </fieldset>
          {form.limitsMode === 'baseline' ? (
            <TextField id="ph-k" label="Subgroups in the baseline" value={form.baselineCount} onInput={(v) => input('baselineCount', v)} error={errors.baselineCount} inputMode="numeric" width="320px"
              hint="Until this many are in, the limits are recomputed as points arrive; fewer than 20 makes them provisional." />
          ) : (
            <div class="setup-grid">
              <TextField id="ph-centre" label={isVariableChart(ch.chartType) ? `Centre (${ch.unit})` : ch.chartType === 'p' || ch.chartType === 'np' ? 'Proportion defective p̄' : 'Average count'}
                value={form.centre} onInput={(v) => input('centre', v)} error={errors.centre} inputMode="decimal" />
              {isVariableChart(ch.chartType) ? (
                <TextField id="ph-sigma" label={`Sigma of individual values (${ch.unit})`} value={form.sigma} onInput={(v) => input('sigma', v)} error={errors.sigma} inputMode="decimal" />
              ) : null}
            </div>
          )}
        </section>
        {tried && !result.ok ? <p class="error-text" role="alert">Some fields need attention (marked above); nothing was sent.</p> : null}
        {sendFailed && state.error ? <p class="error-text" role="status" data-testid="send-failed">{state.error}</p> : null}
        {pending ? (
          <ConfirmChange title={`Start phase ${pending[pending.length - 1]?.number ?? ''}?`} testId="confirm-phase" busy={busy} confirmLabel="Yes, start the new phase"
            lines={[newPhaseConfirmation(pending, { characteristic: ch, phases: state.setup.phases, samples: view.series.samples }), 'Earlier phases keep their limits. A phase started by mistake can be withdrawn later from the limits history.']}
            onConfirm={() => void save()} onBack={() => setPending(null)} />
        ) : (
          <div class="row">
            <button type="submit" class="btn primary" disabled={busy} data-testid="save-phase">Start the new phase…</button>
            <button type="button" class="btn" onClick={back}>Cancel</button>
          </div>
        )}
      </form>
    </main>
  );
}
