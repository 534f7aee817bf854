import { useState } from 'preact/hooks';
import type { AppActions, AppState } from '../../app/app-state';
import {
  changeNeedsNewPhase, characteristicFromForm, historyConflict, entityIdFor, formFromCharacteristic, newCharacteristicForm, withChartType,
  type CharacteristicField, type CharacteristicForm,
} from '../../app/characteristic-form';
import { DEFAULT_CAUSE_CATEGORIES, type SetupRecord } from '../../schema';
import { SafetyCaution } from '../SafetyCaution';
import { ChartDesignFields } from './ChartDesignFields';
import { ListEditor } from './ListEditor';
import { focusFirstProblem } from './focus-first-problem';
import { OfflineNotice } from './OfflineNotice';
import { RulePicker } from './RulePicker';
import { TextField } from './TextField';
import './setup.css';

/** Unsaved forms, by characteristic (or 'new:<station>'): kept while the engineer looks elsewhere or waits for a connection. */
const drafts = new Map<string, CharacteristicForm>();

/** Create a characteristic at a station, or change one (a new version on the site server). Engineer and admin only. */
export function CharacteristicEditor({ state, actions, characteristicId, stationId }: {
  state: AppState; actions: AppActions; characteristicId?: string | undefined; stationId?: string | undefined;
}) {
  const { setup } = state;
  const existing = characteristicId ? setup.characteristics.find((c) => c.id === characteristicId) : undefined;
  const key = existing ? existing.id : `new:${stationId ?? state.stationId ?? ''}`;
  const [form, setFormState] = useState<CharacteristicForm>(() => drafts.get(key) ?? (existing ? formFromCharacteristic(existing) : newCharacteristicForm('', stationId ?? state.stationId ?? '')));
  const [touched, setTouched] = useState<ReadonlySet<string>>(new Set());
  const [tried, setTried] = useState(false);
  const [busy, setBusy] = useState(false);
  const [sendFailed, setSendFailed] = useState(false);
  const setForm = (next: CharacteristicForm) => {
    drafts.set(key, next);
    setFormState(next);
  };
  const touch = (field: CharacteristicField) => setTouched(new Set([...touched, field]));
  const input = (field: CharacteristicField, value: string) => {
    setForm({ ...form, [field]: value });
    touch(field);
  };
  if (state.person?.role !== 'engineer' && state.person?.role !== 'admin') {
    return <main class="main"><p>Only a quality engineer or an admin can change set-up.</p></main>;
  }
  const taken = new Set(setup.characteristics.map((c) => c.id));
  const withId = existing ? form : { ...form, id: entityIdFor(form.name, taken) };
  const result = characteristicFromForm(withId);
  const all = result.ok ? {} : result.errors;
  const errors = Object.fromEntries(Object.entries(all).filter(([f]) => tried || touched.has(f))) as typeof all;
  const points = existing ? state.views[existing.id]?.analysis.points.length ?? 0 : 0;
  const conflict = historyConflict(existing, form.chartType, existing ? state.views[existing.id]?.series.samples ?? [] : []);
  const phaseNotice = conflict ? undefined : changeNeedsNewPhase(existing, form, points);
  const siteCauses = setup.causeLists.find((c) => c.siteId === state.device?.siteId)?.categories ?? [...DEFAULT_CAUSE_CATEGORIES];
  const ownCauses = form.causeCategories.length > 0;
  const back = () => actions.open(existing ? { name: 'characteristic', characteristicId: existing.id } : { name: 'setup' });

  const save = async (e: Event) => {
    e.preventDefault();
    setTried(true);
    if (!result.ok || conflict) return focusFirstProblem();
    const ch = result.value;
    const entries: SetupRecord[] = [{ kind: 'characteristic', id: ch.id, body: ch }];
    setBusy(true);
    const ok = await actions.saveSetup(entries, existing ? `The change to “${ch.name}”` : `The new characteristic “${ch.name}”`);
    setBusy(false);
    setSendFailed(!ok);
    if (ok) {
      drafts.delete(key);
      // A change the old limits do not fit: go straight on to record the new phase.
      actions.open(phaseNotice ? { name: 'new-phase', characteristicId: ch.id } : { name: 'characteristic', characteristicId: ch.id });
    }
  };

  return (
    <main class="main stack setup-screen">
      <button type="button" class="btn quiet small back-link" onClick={back}>{existing ? `← ${existing.name}` : '← Set-up'}</button>
      <h1>{existing ? `Change “${existing.name}”` : 'New characteristic'}</h1>
      <OfflineNotice sync={state.sync} />
      {phaseNotice ? <p class="caution" role="status" data-testid="phase-notice">{phaseNotice}</p> : null}
      <form class="stack" onSubmit={save} noValidate data-testid="characteristic-editor">
        <section class="card stack" aria-labelledby="sec-what">
          <h2 id="sec-what">What is measured</h2>
          <div class="setup-grid">
            <TextField id="ch-name" label="Name" value={form.name} onInput={(v) => input('name', v)} error={errors.name} />
            <TextField id="ch-unit" label="Unit (or what is counted)" value={form.unit} onInput={(v) => input('unit', v)} error={errors.unit} hint="mm, N·m, blemishes…" />
            <div class="entry-field setup-field">
              <label for="ch-decimals">Gauge reads to (decimals)</label>
              <select id="ch-decimals" class="text-input" value={form.decimals} onChange={(e) => input('decimals', (e.target as HTMLSelectElement).value)}>
                {[0, 1, 2, 3, 4, 5, 6].map((d) => <option key={d} value={String(d)}>{d === 0 ? 'whole numbers' : (0).toFixed(d).replace(/0$/, '1')}</option>)}
              </select>
            </div>
            <div class="entry-field setup-field wide-field">
              <label for="ch-station">Station</label>
              <select id="ch-station" class="text-input" value={form.stationId} onChange={(e) => input('stationId', (e.target as HTMLSelectElement).value)}
                aria-invalid={errors.stationId ? 'true' : undefined} aria-describedby={errors.stationId ? 'ch-station-error' : undefined}>
                <option value="">Choose a station</option>
                {setup.stations.map((s) => <option key={s.id} value={s.id}>{setup.lines.find((l) => l.id === s.lineId)?.name ?? ''} · {s.name}</option>)}
              </select>
              {errors.stationId ? <span id="ch-station-error" class="error-text field-error">{errors.stationId}</span> : null}
            </div>
          </div>
        </section>
        <section class="card stack" aria-labelledby="sec-chart">
          <h2 id="sec-chart">Chart and sampling</h2>
          <ChartDesignFields form={form} errors={errors} onInput={input} onChartType={(t) => { setForm(withChartType(form, t)); touch('subgroupSize'); }} />
          {conflict ? <p class="caution" role="alert" data-testid="history-conflict">{conflict}</p> : null}
        </section>
        <section class="card stack" aria-labelledby="sec-spec">
          <h2 id="sec-spec">Specification</h2>
          <p class="hint">The customer's limits, drawn on the chart but never used to compute control limits. Leave a side empty for a one-sided specification.</p>
          <div class="setup-grid">
            <TextField id="ch-lsl" label="Lower limit (LSL)" value={form.lsl} onInput={(v) => input('lsl', v)} error={errors.lsl} inputMode="decimal" />
            <TextField id="ch-target" label="Target" value={form.target} onInput={(v) => input('target', v)} error={errors.target} inputMode="decimal" />
            <TextField id="ch-usl" label="Upper limit (USL)" value={form.usl} onInput={(v) => input('usl', v)} error={errors.usl} inputMode="decimal" />
          </div>
        </section>
        {form.chartType !== 'ewma' && form.chartType !== 'cusum' ? (
          <section class="card stack" aria-labelledby="sec-rules">
            <h2 id="sec-rules">Run rules</h2>
            <RulePicker rules={form.rules} onChange={(rules) => { setForm({ ...form, rules }); touch('rules'); }} error={errors.rules} />
          </section>
        ) : null}
        <section class="card stack" aria-labelledby="sec-plan">
          <h2 id="sec-plan">Reaction plan</h2>
          <p class="hint">The steps offered as “action taken” when a rule fires, in the order to follow them.</p>
          <ListEditor idPrefix="ch-step" itemLabel="Step" items={form.reactionPlan} addLabel="Add a step"
            onChange={(reactionPlan) => { setForm({ ...form, reactionPlan }); touch('reactionPlan'); }} error={errors.reactionPlan} />
        </section>
        <section class="card stack" aria-labelledby="sec-causes">
          <h2 id="sec-causes">Cause categories</h2>
          <label class="check-row">
            <input type="checkbox" checked={!ownCauses} onChange={() => setForm({ ...form, causeCategories: ownCauses ? [] : [...siteCauses] })} data-testid="site-causes" />
            <span>Use the site's list: {siteCauses.join(', ')}</span>
          </label>
          {ownCauses ? (
            <ListEditor idPrefix="ch-cause" itemLabel="Category" items={form.causeCategories} addLabel="Add a category"
              onChange={(causeCategories) => { setForm({ ...form, causeCategories }); touch('causeCategories'); }} error={errors.causeCategories} />
          ) : null}
        </section>
        <section class="card stack" aria-labelledby="sec-safety">
          <h2 id="sec-safety">Safety</h2>
          <label class="check-row">
            <input type="checkbox" checked={form.safetyCritical} onChange={() => setForm({ ...form, safetyCritical: !form.safetyCritical })} data-testid="safety-critical" />
            <span>Safety-critical characteristic</span>
          </label>
          {form.safetyCritical ? <SafetyCaution /> : null}
        </section>
        {tried && (!result.ok || conflict) ? <p class="error-text" role="alert">Some fields need attention (marked above); nothing was sent.</p> : null}
        {sendFailed && state.error ? <p class="error-text" role="status" data-testid="send-failed">{state.error}</p> : null}
        <div class="row">
          <button type="submit" class="btn primary" disabled={busy} data-testid="save-characteristic">{busy ? 'Saving…' : existing ? 'Save the change' : 'Create characteristic'}</button>
          <button type="button" class="btn" onClick={back}>Cancel</button>
        </div>
      </form>
    </main>
  );
}
