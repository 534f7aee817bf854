import type { AppActions, AppState, CharacteristicView } from '../app/app-state';
import type { SignalState } from '../app/signal-state';
import { ruleName } from './rule-text';

import { formatShortDateTime as when } from './format-time';

const CHIP: Record<SignalState, string> = { unanswered: 'signal', answered: 'answered', closed: 'steady', historical: 'neutral' };
const LABEL: Record<SignalState, string> = {
  unanswered: 'Needs an answer',
  answered: 'Awaiting sign-off',
  closed: 'Signed off',
  historical: 'In imported history',
};

/** Signals of one characteristic, newest first, with their answers and sign-off. */
export function SignalHistory({ view, state, actions }: { view: CharacteristicView; state: AppState; actions: AppActions }) {
  const canSignOff = state.person && (state.person.role === 'supervisor' || state.person.role === 'engineer' || state.person.role === 'admin');
  const people = new Map(state.setup.people.map((p) => [p.id, p.name]));
  const groups = view.groups.slice(0, 12);
  if (!groups.length) return <p class="hint">No run rule has fired in this history.</p>;
  return (
    <ul class="signal-list" data-testid="signal-history">
      {groups.map((g) => {
        const sample = view.series.samples[g.index];
        return (
          <li class="signal-item" key={g.sampleId}>
            <div class="row" style="justify-content:space-between">
              <strong>Point {g.index + 1}{sample ? ` · ${when(sample.takenAt)}` : ''}</strong>
              <span class={`chip ${CHIP[g.state]}`}>{LABEL[g.state]}</span>
            </div>
            {g.signals.map((s) => <span key={s.rule}>{s.explanation} <span class="hint">({ruleName(s.rule)})</span></span>)}
            {g.lastIndex > g.index ? <span class="hint">The pattern went on firing up to point {g.lastIndex + 1}.</span> : null}
            {g.response ? (
              <span class="hint">
                {g.response.whatHappened} · <strong>{g.response.causeCategory}</strong>{g.response.cause ? `: ${g.response.cause}` : ''} · Action: {g.response.action} ·{' '}
                {people.get(g.response.respondedBy) ?? g.response.respondedBy}, {when(g.response.respondedAt)}
              </span>
            ) : (
              <button type="button" class={g.state === 'historical' ? 'btn small' : 'btn small warn'} onClick={() => actions.reopenPrompt(view.characteristic.id, g.sampleId)}>
                {g.state === 'historical' ? 'Answer (cause known)' : 'Answer now'}
              </button>
            )}
            {g.response && !g.ack && canSignOff ? (
              <button type="button" class="btn small" onClick={() => void actions.acknowledge(view.characteristic.id, g.response!.id)}>Sign off</button>
            ) : null}
            {g.ack ? <span class="hint">Signed off by {people.get(g.ack.by) ?? g.ack.by}, {when(g.ack.at)}</span> : null}
          </li>
        );
      })}
    </ul>
  );
}
