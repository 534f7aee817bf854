import { useState } from 'preact/hooks';
import type { AppActions, AppState } from '../../app/app-state';
import {
  canChangePhases, isChangeablePhase, moveChoices, phaseChangeConfirmation, phaseChangeForm, phaseChangeFromForm, phaseSpans, phaseWithdrawal,
  type PhaseChangeField, type PhaseChangeForm,
} from '../../app/phase-change';
import { isVariableChart, type Phase } from '../../schema';
import { formatShortDateTime } from '../format-time';
import { ConfirmChange } from './ConfirmChange';
import { focusFirstProblem } from './focus-first-problem';
import { OfflineNotice } from './OfflineNotice';
import { TextField } from './TextField';
import './setup.css';
import './phase-change.css';

type Pending = { readonly kind: 'change' | 'withdraw'; readonly phase: Phase; readonly lines: readonly string[] };

/**
 * Correct a phase already started (its reason, start point or limits) or withdraw it. Either is saved as
 * a new version of the phase with who, when and why; the limits history keeps showing what happened.
 */
export function PhaseChangeScreen({ state, actions, characteristicId, phaseId }: {
  state: AppState; actions: AppActions; characteristicId: string; phaseId: string;
}) {
  const ch = state.setup.characteristics.find((c) => c.id === characteristicId);
  const phase = state.setup.phases.find((p) => p.id === phaseId && p.characteristicId === characteristicId);
  const view = state.views[characteristicId];
  const [form, setFormState] = useState<PhaseChangeForm | null>(() => (ch && phase ? phaseChangeForm(phase, ch) : null));
  const [touched, setTouched] = useState<ReadonlySet<string>>(new Set());
  const [tried, setTried] = useState(false);
  const [withdrawNote, setWithdrawNote] = useState('');
  const [withdrawTried, setWithdrawTried] = useState(false);
  const [pending, setPending] = useState<Pending | null>(null);
  const [busy, setBusy] = useState(false);
  const [sendFailed, setSendFailed] = useState(false);
  const back = () => actions.open({ name: 'limits-history', characteristicId });
  if (!canChangePhases(state.person?.role)) return <main class="main"><p>Only a quality engineer or an admin can correct or withdraw a phase.</p></main>;
  if (!ch || !phase || !form) return <main class="main"><p>This phase is not set up on this tablet.</p></main>;
  if (!view) return <main class="main"><p class="hint">Loading chart…</p></main>;
  if (!isChangeablePhase(phase)) {
    return (
      <main class="main stack setup-screen">
        <button type="button" class="btn quiet small back-link" onClick={back}>← Limits by phase</button>
        <p>{phase.withdrawn ? `Phase ${phase.number} is withdrawn; it stays in the limits history as it is.` : 'Phase 1 holds the limits as first set up and cannot be corrected here.'}</p>
      </main>
    );
  }
  const ctx = { characteristic: ch, phases: state.setup.phases, samples: view.series.samples, now: state.now, by: state.person!.id };
  const setForm = (next: PhaseChangeForm) => {
    setFormState(next);
    setPending(null);
  };
  const input = (field: keyof PhaseChangeForm, value: string) => {
    setForm({ ...form, [field]: value });
    setTouched(new Set([...touched, field]));
  };
  const result = phaseChangeFromForm(form, phase, ctx);
  const all = result.ok ? {} : result.errors;
  const errors: Partial<Record<PhaseChangeField, string>> = Object.fromEntries(Object.entries(all).filter(([f]) => tried || touched.has(f)));
  const withdrawal = phaseWithdrawal(phase, withdrawNote, ctx);
  const withdrawError = withdrawTried && !withdrawal.ok ? withdrawal.errors.note : undefined;
  const span = phaseSpans(ch, state.setup.phases, view.series.samples).find((s) => s.phase.id === phase.id);
  const choices = moveChoices(phase, ctx);
  const d = ch.decimals + 1;
  const pointLabel = (index: number, takenAt: string) => `Point ${index + 1} · ${formatShortDateTime(takenAt)} · ${view.analysis.points[index]?.value.toFixed(d) ?? ''}`;
  const starts = span && span.start < span.end ? `point ${span.start + 1} (${formatShortDateTime(view.series.samples[span.start]!.takenAt)})` : `${formatShortDateTime(phase.startsAt)} (no points yet)`;

  const reviewChange = (e: Event) => {
    e.preventDefault();
    setTried(true);
    const fresh = phaseChangeFromForm(form, phase, { ...ctx, now: Date.now() });
    if (!fresh.ok) return focusFirstProblem();
    setPending({ kind: 'change', phase: fresh.value, lines: phaseChangeConfirmation(phase, fresh.value, ctx) });
  };
  const reviewWithdrawal = (e: Event) => {
    e.preventDefault();
    setWithdrawTried(true);
    const fresh = phaseWithdrawal(phase, withdrawNote, { ...ctx, now: Date.now() });
    if (!fresh.ok) return setTimeout(() => document.getElementById('pc-withdraw-note')?.focus(), 0);
    setPending({ kind: 'withdraw', phase: fresh.value, lines: phaseChangeConfirmation(phase, fresh.value, ctx) });
  };
  const save = async () => {
    if (!pending) return;
    setBusy(true);
    const what = pending.kind === 'withdraw' ? `The withdrawal of phase ${phase.number} of ${ch.name}` : `The correction of phase ${phase.number} of ${ch.name}`;
    const ok = await actions.saveSetup([{ kind: 'phase', id: pending.phase.id, body: pending.phase }], what);
    setBusy(false);
    setSendFailed(!ok);
    if (ok) back();
    else setPending(null);
  };
  const confirm = (kind: Pending['kind']) => pending?.kind === kind ? (
    <ConfirmChange title={kind === 'withdraw' ? `Withdraw phase ${phase.number}?` : `Save the correction of phase ${phase.number}?`}
      testId={kind === 'withdraw' ? 'confirm-withdraw' : 'confirm-change'} busy={busy}
      confirmLabel={kind === 'withdraw' ? `Yes, withdraw phase ${phase.number}` : 'Yes, save the correction'}
      lines={[...pending.lines, 'The earlier version stays on the site server, and your note shows in the limits history.']}
      onConfirm={() => void save()} onBack={() => setPending(null)} />
  ) : null;

  return (
    <main class="main stack setup-screen">
      <button type="button" class="btn quiet small back-link" onClick={back}>← Limits by phase</button>
      <h1>Correct phase {phase.number} of “{ch.name}”</h1>
      <p class="hint" data-testid="phase-now">
        Now: starts at {starts}; reason “{phase.reason}”; limits {phase.given ? `given (centre ${phase.given.centre}, sigma ${phase.given.sigma})` : `from its first ${phase.baselineCount ?? ch.baselineSize} subgroups`}.
      </p>
      <OfflineNotice sync={state.sync} />
      {sendFailed && state.error ? <p class="error-text" role="status" data-testid="send-failed">{state.error}</p> : null}
      <form class="stack" onSubmit={reviewChange} noValidate data-testid="phase-change-form" aria-labelledby="pc-correct-title">
        <h2 id="pc-correct-title">Correct the phase</h2>
        <section class="card stack">
          <TextField id="pc-reason" label="Reason: the documented process change" value={form.reason} onInput={(v) => input('reason', v)} error={errors.reason} multiline />
          <div class="entry-field setup-field">
            <label for="pc-point">First point of the phase</label>
            <select id="pc-point" class="text-input" value={form.startSampleId} onChange={(e) => input('startSampleId', (e.target as HTMLSelectElement).value)}
              aria-invalid={errors.startSampleId ? 'true' : undefined} aria-describedby={errors.startSampleId ? 'pc-point-error' : undefined} data-testid="change-start">
              <option value="">As now: {starts}</option>
              {choices.map((c) => <option key={c.id} value={c.id}>{pointLabel(c.index, c.takenAt)}</option>)}
            </select>
            {errors.startSampleId ? <span id="pc-point-error" class="error-text field-error">{errors.startSampleId}</span> : null}
          </div>
          <fieldset>
            <legend>Limits of the phase</legend>
            <label class="check-row"><input type="radio" name="pc-limits" checked={form.limitsMode === 'baseline'} onChange={() => setForm({ ...form, limitsMode: 'baseline' })} />
              <span>Computed from its first subgroups (baseline)</span></label>
            <label class="check-row"><input type="radio" name="pc-limits" checked={form.limitsMode === 'given'} onChange={() => setForm({ ...form, limitsMode: 'given' })} />
              <span>Given: from an earlier study or a standard</span></label>
          </fieldset>
          {form.limitsMode === 'baseline' ? (
            <TextField id="pc-k" label="Subgroups in the baseline" value={form.baselineCount} onInput={(v) => input('baselineCount', v)} error={errors.baselineCount} inputMode="numeric" width="320px" />
          ) : (
            <div class="setup-grid">
              <TextField id="pc-centre" label={isVariableChart(ch.chartType) ? `Centre (${ch.unit})` : ch.chartType === 'p' || ch.chartType === 'np' ? 'Proportion defective p̄' : 'Average count'}
                value={form.centre} onInput={(v) => input('centre', v)} error={errors.centre} inputMode="decimal" />
              {isVariableChart(ch.chartType) ? (
                <TextField id="pc-sigma" label={`Sigma of individual values (${ch.unit})`} value={form.sigma} onInput={(v) => input('sigma', v)} error={errors.sigma} inputMode="decimal" />
              ) : null}
            </div>
          )}
          <TextField id="pc-note" label="Why this correction" value={form.note} onInput={(v) => input('note', v)} error={errors.note} testId="change-note"
            hint="Kept with the phase and shown in the limits history." />
        </section>
        {confirm('change') ?? (
          <div class="row">
            <button type="submit" class="btn primary" disabled={busy || pending !== null} data-testid="save-change">Save the correction…</button>
            <button type="button" class="btn" onClick={back}>Cancel</button>
          </div>
        )}
      </form>
      <form class="stack" onSubmit={reviewWithdrawal} noValidate data-testid="phase-withdraw-form" aria-labelledby="pc-withdraw-title">
        <h2 id="pc-withdraw-title">Withdraw the phase</h2>
        <section class="card stack">
          <p class="hint">For a phase started by mistake: the chart then shows the limits as if it had never started. It stays in the limits history, marked withdrawn, with your note.</p>
          <TextField id="pc-withdraw-note" label="Why it is withdrawn" value={withdrawNote} error={withdrawError} testId="withdraw-note" multiline
            onInput={(v) => { setWithdrawNote(v); if (pending?.kind === 'withdraw') setPending(null); }} />
        </section>
        {confirm('withdraw') ?? (
          <div class="row">
            <button type="submit" class="btn" disabled={busy || pending !== null} data-testid="withdraw-phase">Withdraw phase {phase.number}…</button>
          </div>
        )}
      </form>
    </main>
  );
}
