import { RULE_PRESETS } from '../../app/characteristic-form';
import type { RuleId } from '../../schema';
import { ruleTag } from '../rule-text';

/** What each rule looks for, in our own words (σ: sigma of the plotted statistic). */
const RULES: readonly { readonly id: RuleId; readonly text: string }[] = [
  { id: 'we1', text: 'a point beyond 3σ' },
  { id: 'we2', text: '2 of 3 points beyond 2σ, same side' },
  { id: 'we3', text: '4 of 5 points beyond 1σ, same side' },
  { id: 'we4', text: '8 points in a row on one side' },
  { id: 'n1', text: 'a point beyond 3σ' },
  { id: 'n2', text: '9 points in a row on one side' },
  { id: 'n3', text: '6 points in a row rising or falling' },
  { id: 'n4', text: '14 points in a row alternating up and down' },
  { id: 'n5', text: '2 of 3 points beyond 2σ, same side' },
  { id: 'n6', text: '4 of 5 points beyond 1σ, same side' },
  { id: 'n7', text: '15 points in a row within 1σ' },
  { id: 'n8', text: '8 points in a row beyond 1σ, either side' },
];

const sameSet = (a: readonly RuleId[], b: readonly RuleId[]) => a.length === b.length && a.every((r) => b.includes(r));

/** Run rules of a characteristic: a preset with one press, or any subset. */
export function RulePicker({ rules, onChange, error }: { rules: readonly RuleId[]; onChange: (rules: RuleId[]) => void; error?: string | undefined }) {
  const toggle = (id: RuleId) => onChange(rules.includes(id) ? rules.filter((r) => r !== id) : RULES.map((r) => r.id).filter((r) => r === id || rules.includes(r)));
  return (
    <div class="stack" style="gap:10px">
      <div class="choice-grid" role="group" aria-label="Rule presets">
        {RULE_PRESETS.map((p) => (
          <button type="button" key={p.name} class="choice" aria-pressed={sameSet(p.rules, rules)} onClick={() => onChange([...p.rules])}>{p.name}</button>
        ))}
      </div>
      <div class="rule-columns">
        {(['we', 'n'] as const).map((family) => (
          <fieldset key={family}>
            <legend>{family === 'we' ? 'Western Electric rules' : 'Nelson rules'}</legend>
            {RULES.filter((r) => r.id.startsWith(family)).map((r) => (
              <label key={r.id} class="check-row">
                <input type="checkbox" checked={rules.includes(r.id)} onChange={() => toggle(r.id)} data-testid={`rule-${r.id}`} />
                <span><strong>{ruleTag(r.id)}</strong> {r.text}</span>
              </label>
            ))}
          </fieldset>
        ))}
      </div>
      {error ? <span class="error-text field-error" role="status">{error}</span> : null}
    </div>
  );
}
