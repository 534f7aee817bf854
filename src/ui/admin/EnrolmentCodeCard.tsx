import { useState } from 'preact/hooks';
import type { AdminView } from '../../app/admin-controller';
import type { AppActions, AppState } from '../../app/app-state';
import { formatClock } from '../format-time';

const LIFETIMES: readonly (readonly [number, string])[] = [[15, '15 minutes'], [60, '1 hour'], [8 * 60, '8 hours']];

function inWords(minutes: number): string {
  if (minutes < 90) return `about ${minutes} min from now`;
  return `about ${Math.round(minutes / 60)} h from now`;
}

/** A one-time connection code for a new tablet, with when it stops working and what to do with it. */
export function EnrolmentCodeCard({ state, view, actions }: { state: AppState; view: AdminView; actions: AppActions }) {
  const [busy, setBusy] = useState(false);
  const [minutes, setMinutes] = useState(15);
  const code = view.code;
  const minutesLeft = code ? Math.round((Date.parse(code.expiresAt) - Math.max(state.now, view.codeIssuedAt ?? 0)) / 60_000) : 0;
  const live = code && minutesLeft > 0;
  const issue = async () => {
    setBusy(true);
    await actions.adminIssueCode(minutes);
    setBusy(false);
  };
  return (
    <section class="card stack" aria-labelledby="code-title" data-testid="code-card">
      <h2 id="code-title">Connect a new tablet</h2>
      {live ? (
        <>
          <p class="admin-code" data-testid="enrolment-code" aria-label={`Connection code ${code.code.split('').join(' ')}`}>{code.code}</p>
          <p data-testid="code-expiry">
            Works once, until <strong>{formatClock(code.expiresAt)}</strong> ({inWords(minutesLeft)}). After that, make a new one.
          </p>
          <ol class="admin-steps">
            <li>On the new tablet, open <strong>{location.origin}</strong> in the browser (add it to the home screen to install it).</li>
            <li>Type this code under “Connection code”, give the tablet a name people will recognise (e.g. the machine it stands at), and press “Connect tablet”.</li>
            <li>People then sign in on it with their own login and PIN.</li>
          </ol>
        </>
      ) : (
        <p class="hint">
          {code ? 'The last code has expired. ' : ''}A connection code lets one new tablet join this site. It works once and expires after the time you choose.
        </p>
      )}
      <div class="row">
        <label class="row admin-inline" style="gap:8px">
          <span>Valid for</span>
          <select class="text-input" value={String(minutes)} onChange={(e) => setMinutes(Number((e.target as HTMLSelectElement).value))}>
            {LIFETIMES.map(([m, label]) => <option key={m} value={String(m)}>{label}</option>)}
          </select>
        </label>
        <button type="button" class={`btn small${live ? '' : ' primary'}`} disabled={busy} onClick={() => void issue()} data-testid="issue-code">
          {busy ? 'Making a code…' : live ? 'Make another code' : 'Make a connection code'}
        </button>
      </div>
    </section>
  );
}
