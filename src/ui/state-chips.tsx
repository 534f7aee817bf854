import type { CharacteristicView } from '../app/app-state';
import { formatSpan } from '../app/due-state';

/** The chips a characteristic shows: its signal state and its due state, in words and shapes. */
export function StateChips({ view }: { view: CharacteristicView }) {
  const unanswered = view.groups.filter((g) => g.state === 'unanswered').length;
  const answered = view.groups.filter((g) => g.state === 'answered').length;
  const due = view.due;
  return (
    <div class="row" style="gap:8px">
      {unanswered ? (
        <span class="chip signal" data-testid="chip-signal">{unanswered === 1 ? 'Signal needs an answer' : `${unanswered} signals need an answer`}</span>
      ) : answered ? (
        <span class="chip answered" data-testid="chip-answered">{answered} answered, awaiting sign-off</span>
      ) : view.analysis.points.length ? (
        <span class="chip steady" data-testid="chip-steady">No open signals</span>
      ) : null}
      {due.kind === 'late' ? (
        <span class="chip late" data-testid="chip-late">Late by {formatSpan(-due.minutes)}</span>
      ) : due.kind === 'due' ? (
        <span class="chip due" data-testid="chip-due">Sample due now</span>
      ) : due.kind === 'not-started' ? (
        <span class="chip due">No samples yet</span>
      ) : (
        <span class="chip neutral">Next in {formatSpan(due.minutes)}</span>
      )}
    </div>
  );
}
