import { useEffect, useMemo, useRef, useState } from 'preact/hooks';
import type { AppActions, CharacteristicView, EntryInput } from '../app/app-state';
import { formatValue, looksLikeTypo, parseEntry } from '../app/number-entry';
import { isVariableChart } from '../schema';
import { applyKey, Keypad, type KeypadKey } from './Keypad';

interface Field { readonly key: string; readonly label: string; readonly decimals: number; readonly allowMinus: boolean }

function fieldsFor(view: CharacteristicView): Field[] {
  const ch = view.characteristic;
  if (isVariableChart(ch.chartType)) {
    const n = ch.chartType === 'xmr' ? 1 : ch.subgroupSize;
    return Array.from({ length: n }, (_, i) => ({ key: `v${i}`, label: n === 1 ? `Value (${ch.unit})` : `Value ${i + 1}`, decimals: ch.decimals, allowMinus: true }));
  }
  const counted = ch.chartType === 'p' || ch.chartType === 'np' ? 'Nonconforming items' : 'Defects found';
  const fields: Field[] = [{ key: 'count', label: counted, decimals: 0, allowMinus: false }];
  if (ch.chartType !== 'c') fields.push({ key: 'inspected', label: ch.chartType === 'u' ? 'Units inspected' : 'Items inspected', decimals: ch.chartType === 'u' ? 2 : 0, allowMinus: false });
  return fields;
}

/** Subgroup entry: one field per value, the keypad, lot and comment, a typo guard, Save. */
export function EntryPanel({ view, actions, separator }: { view: CharacteristicView; actions: AppActions; separator: ',' | '.' }) {
  const ch = view.characteristic;
  const fields = useMemo(() => fieldsFor(view), [ch]);
  const initial = () => Object.fromEntries(fields.map((f) => [f.key, f.key === 'inspected' ? String(ch.subgroupSize) : '']));
  const [texts, setTexts] = useState<Record<string, string>>(initial);
  const [active, setActive] = useState(0);
  const [lot, setLot] = useState('');
  const [comment, setComment] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [confirmTypo, setConfirmTypo] = useState<string | null>(null);
  /** Saves under way (a gauge or a quick hand can send the next reading before the last is on disk). */
  const [saving, setSaving] = useState(0);
  const inputs = useRef<(HTMLInputElement | null)[]>([]);
  useEffect(() => { setTexts(initial()); setActive(0); setConfirmTypo(null); setProblem(null); }, [ch.id]);

  const field = fields[active];
  const parsed = fields.map((f) => parseEntry(texts[f.key] ?? '', f.decimals));
  const phase = view.analysis.phases[view.analysis.phases.length - 1];

  const save = async (confirmed: boolean) => {
    const bad = parsed.findIndex((p) => !p.ok);
    if (bad >= 0) {
      const p = parsed[bad]!;
      setProblem(`${fields[bad]!.label}: ${p.ok ? '' : p.message}`);
      setActive(bad);
      inputs.current[bad]?.focus();
      return;
    }
    const values = parsed.map((p) => (p.ok ? p.value : 0));
    let entry: EntryInput;
    if (isVariableChart(ch.chartType)) {
      if (!confirmed && phase && phase.centre !== null && phase.sigmaWithin !== null) {
        const { centre, sigmaWithin } = phase;
        const odd = values.filter((v) => looksLikeTypo(v, centre, sigmaWithin));
        if (odd.length) {
          setConfirmTypo(`${odd.map((v) => formatValue(v, ch.decimals, separator)).join(', ')} ${ch.unit} is far from the usual values (around ${formatValue(centre, ch.decimals, separator)}). Check the reading.`);
          return;
        }
      }
      entry = { values };
    } else {
      const [count, inspected] = values;
      if (inspected !== undefined && count! > inspected && ch.chartType !== 'u') {
        setProblem('More nonconforming items than items inspected.');
        return;
      }
      entry = inspected !== undefined ? { count: count!, inspected } : { count: count! };
    }
    // The fields are emptied at once, not when the save is done: the next reading can be typed (or
    // sent by a gauge, value and Enter) while this one is written, and a second tap on Save finds
    // nothing to save twice. If the save fails, what was typed comes back — unless a new reading
    // has been typed meanwhile — and the app's error says why.
    const typed = texts;
    const typedComment = comment;
    setTexts(initial());
    setComment('');
    setActive(0);
    setProblem(null);
    setConfirmTypo(null);
    inputs.current[0]?.focus();
    setSaving((n) => n + 1);
    const ok = await actions.record(ch.id, { ...entry, ...(lot.trim() ? { lot: lot.trim() } : {}), ...(typedComment.trim() ? { comment: typedComment.trim() } : {}) })
      .catch(() => false);
    setSaving((n) => n - 1);
    if (!ok) {
      const empty = initial();
      setTexts((now) => (fields.every((f) => (now[f.key] ?? '') === empty[f.key]) ? typed : now));
      setComment((now) => now || typedComment);
    }
  };

  const advance = () => {
    if (active < fields.length - 1) {
      setActive(active + 1);
      inputs.current[active + 1]?.focus();
    } else void save(false);
  };
  const onKey = (k: KeypadKey) => {
    setProblem(null);
    setConfirmTypo(null);
    if (k === 'next') return advance();
    if (!field) return;
    setTexts({ ...texts, [field.key]: applyKey(texts[field.key] ?? '', k, separator) });
  };

  return (
    <section class="card stack" aria-labelledby="entry-title" data-testid="entry-panel">
      <h2 id="entry-title">Record a sample</h2>
      <div class="entry-fields">
        {fields.map((f, i) => (
          <div class="entry-field" key={f.key}>
            <label for={`entry-${f.key}`}>{f.label}</label>
            <input id={`entry-${f.key}`} ref={(el) => { inputs.current[i] = el; }} class={i === active ? 'active' : ''}
              inputMode="decimal" autocomplete="off" value={texts[f.key]} aria-invalid={problem?.startsWith(f.label) ? 'true' : 'false'}
              onFocus={() => setActive(i)}
              onInput={(e) => { setProblem(null); setConfirmTypo(null); setTexts({ ...texts, [f.key]: (e.target as HTMLInputElement).value }); }}
              onKeyDown={(e) => { if (e.key === 'Enter') { e.preventDefault(); advance(); } }} />
          </div>
        ))}
      </div>
      <Keypad separator={separator} allowDecimal={(field?.decimals ?? 0) > 0} allowMinus={field?.allowMinus ?? false} onKey={onKey}
        nextLabel={active < fields.length - 1 ? 'Next value' : saving > 0 ? 'Saving…' : 'Save sample'} />
      {problem ? <p class="error-text" role="alert">{problem}</p> : null}
      {confirmTypo ? (
        <div class="caution stack" role="alert" style="gap:10px">
          <span>{confirmTypo}</span>
          <div class="row">
            <button type="button" class="btn warn" onClick={() => void save(true)}>It is correct — save</button>
            <button type="button" class="btn" onClick={() => { setConfirmTypo(null); inputs.current[0]?.focus(); }}>Let me fix it</button>
          </div>
        </div>
      ) : null}
      <details>
        <summary class="hint" style="min-height:48px;display:flex;align-items:center;cursor:pointer">Lot and comment (optional)</summary>
        <div class="stack" style="gap:8px">
          <label class="stack" style="gap:4px"><span class="hint">Lot or batch</span>
            <input class="text-input" value={lot} onInput={(e) => setLot((e.target as HTMLInputElement).value)} maxLength={60} /></label>
          <label class="stack" style="gap:4px"><span class="hint">Comment</span>
            <textarea class="text-input" value={comment} onInput={(e) => setComment((e.target as HTMLTextAreaElement).value)} maxLength={400} /></label>
        </div>
      </details>
    </section>
  );
}
