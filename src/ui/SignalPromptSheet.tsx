import { useEffect, useRef, useState } from 'preact/hooks';
import type { AppActions, SignalPrompt } from '../app/app-state';
import { DEFAULT_CAUSE_CATEGORIES, type Characteristic } from '../schema';
import { ruleName } from './rule-text';

/** Asked the moment a save makes a rule fire: what happened, the suspected cause, the action taken. */
export function SignalPromptSheet({ prompt, characteristic, siteCauses, actions }: {
  prompt: SignalPrompt; characteristic: Characteristic; siteCauses: readonly string[]; actions: AppActions;
}) {
  const categories = characteristic.causeCategories.length ? characteristic.causeCategories : siteCauses.length ? siteCauses : DEFAULT_CAUSE_CATEGORIES;
  const [what, setWhat] = useState('');
  const [category, setCategory] = useState('');
  const [cause, setCause] = useState('');
  const [step, setStep] = useState('');
  const [other, setOther] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const first = useRef<HTMLTextAreaElement>(null);
  useEffect(() => first.current?.focus(), []);

  const action = [step, other.trim()].filter(Boolean).join(' — ');
  const submit = async (e: Event) => {
    e.preventDefault();
    if (!what.trim()) return setProblem('Say briefly what happened (or what you saw) at the machine.');
    if (!category) return setProblem('Choose a cause category.');
    if (!action) return setProblem('Choose the action taken from the reaction plan, or describe it.');
    setBusy(true);
    const ok = await actions.answer(prompt, { whatHappened: what.trim(), causeCategory: category, ...(cause.trim() ? { cause: cause.trim() } : {}), action });
    setBusy(false);
    if (!ok) setProblem('The answer could not be saved; see the message above.');
  };

  return (
    <div class="sheet-backdrop" role="dialog" aria-modal="true" aria-labelledby="prompt-title">
      <form class="sheet" onSubmit={submit} data-testid="signal-prompt">
        <h2 id="prompt-title">Signal on {characteristic.name}: what happened?</h2>
        <ul class="signal-list">
          {prompt.signals.map((s) => (
            <li class="signal-item" key={s.rule + s.index}>
              <strong>{s.explanation}</strong>
              <span class="hint">{ruleName(s.rule)}{s.companion ? ' (on the range chart)' : ''}</span>
            </li>
          ))}
        </ul>
        <label class="stack" style="gap:6px">
          <strong>What happened at the machine?</strong>
          <textarea ref={first} class="text-input" name="whatHappened" value={what} maxLength={400}
            onInput={(e) => setWhat((e.target as HTMLTextAreaElement).value)} />
        </label>
        <fieldset>
          <legend>Cause category</legend>
          <div class="choice-grid">
            {categories.map((c) => (
              <button type="button" class="choice" key={c} aria-pressed={category === c} onClick={() => setCategory(c)}>{c}</button>
            ))}
          </div>
        </fieldset>
        <label class="stack" style="gap:6px">
          <strong>Suspected cause <span class="hint">(optional)</span></strong>
          <input class="text-input" name="cause" value={cause} maxLength={200} onInput={(e) => setCause((e.target as HTMLInputElement).value)} />
        </label>
        <fieldset>
          <legend>Action taken (reaction plan)</legend>
          <div class="choice-grid">
            {characteristic.reactionPlan.map((p) => (
              <button type="button" class="choice" key={p} aria-pressed={step === p} onClick={() => setStep(step === p ? '' : p)}>{p}</button>
            ))}
          </div>
          <input class="text-input" name="otherAction" placeholder="Other action or detail" value={other} maxLength={190}
            onInput={(e) => setOther((e.target as HTMLInputElement).value)} aria-label="Other action or detail" />
        </fieldset>
        {problem ? <p class="error-text" role="alert">{problem}</p> : null}
        <div class="row">
          <button type="submit" class="btn primary" disabled={busy}>{busy ? 'Saving…' : 'Save answer'}</button>
          <button type="button" class="btn" onClick={() => actions.postpone()}>Answer later</button>
        </div>
        <p class="hint">Answering later keeps the signal open on the station board until it is answered and signed off by a supervisor.</p>
      </form>
    </div>
  );
}
