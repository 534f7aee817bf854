import { useEffect, useRef, useState } from 'preact/hooks';
import type { AppActions, AppState, SyncDetails } from '../app/app-state';
import { formatDateTime } from './format-time';

const KIND: Record<string, string> = { sample: 'Sample', response: 'Answer to a signal', ack: 'Sign-off' };

function megabytes(bytes: number): string {
  return bytes < 1e6 ? `${Math.round(bytes / 1e3)} kB` : bytes < 1e9 ? `${(bytes / 1e6).toFixed(1)} MB` : `${(bytes / 1e9).toFixed(1)} GB`;
}

/** Sending and receiving, in plain words: what waits, what the server refused, when it last worked, storage. */
export function SyncSheet({ state, details, actions }: { state: AppState; details: SyncDetails; actions: AppActions }) {
  const [busy, setBusy] = useState(false);
  const close = useRef<HTMLButtonElement>(null);
  useEffect(() => close.current?.focus(), []);
  const s = state.sync;
  const syncNow = async () => {
    setBusy(true);
    await actions.syncNow();
    setBusy(false);
  };
  const offset = s.clockOffsetMs !== undefined ? Math.round(Math.abs(s.clockOffsetMs) / 60_000) : 0;
  return (
    <div class="sheet-backdrop" role="dialog" aria-modal="true" aria-labelledby="sync-title" onKeyDown={(e) => { if (e.key === 'Escape') actions.closeSyncDetails(); }}>
      <div class="sheet sheet-calm stack" data-testid="sync-sheet">
        <h2 id="sync-title">Sending and receiving</h2>
        <p data-testid="sync-summary">
          {s.pending === 0
            ? 'Everything recorded on this tablet has reached the site server.'
            : `${s.pending} record${s.pending === 1 ? ' is' : 's are'} saved on this tablet and waiting to be sent.`}{' '}
          {s.lastSuccessAt ? `Last successful sync: ${formatDateTime(s.lastSuccessAt)}.` : 'This tablet has not synced yet.'}
        </p>
        {s.state === 'syncing' && s.progress ? (
          <div class="stack" style="gap:6px">
            <progress max={Math.max(1, s.progress.toPush)} value={s.progress.pushed} aria-label="Records sent" />
            <span class="hint">Sent {s.progress.pushed} of {s.progress.toPush} · received {s.progress.pulled} from the server</span>
          </div>
        ) : null}
        {s.lastError && s.state !== 'idle' ? <p class="caution" role="status">Last attempt: {s.lastError}</p> : null}
        {s.clockSkewed ? (
          <p class="caution">This tablet's clock is about {offset} min off the server's. Readings keep the tablet's time; ask for the clock to be set.</p>
        ) : null}
        {details.problems.length ? (
          <section class="stack" style="gap:8px" aria-labelledby="refused-title">
            <h3 id="refused-title">Refused by the server ({details.problems.length})</h3>
            <p class="hint">These stay on this tablet with the server's reason; they are not sent again. Tell the supervisor.</p>
            <ul class="signal-list">
              {details.problems.map((p) => (
                <li class="signal-item" key={p.id}>
                  <strong>{KIND[p.kind] ?? p.kind} #{p.deviceSeq} — {p.state === 'conflict' ? 'conflicts with a different record under the same id' : 'refused'}</strong>
                  <span class="hint">{p.reason}</span>
                </li>
              ))}
            </ul>
          </section>
        ) : null}
        <dl class="details-grid">
          <dt>Protected from clean-up</dt>
          <dd>{details.persisted === null ? 'The browser does not say' : details.persisted ? 'Yes — the browser keeps this data' : 'No — sync often; install the app to the home screen'}</dd>
          {details.usage !== undefined && details.quota ? (<><dt>Space used</dt><dd>{megabytes(details.usage)} of {megabytes(details.quota)}</dd></>) : null}
        </dl>
        <div class="row">
          <button type="button" class="btn primary" onClick={() => void syncNow()} disabled={busy} data-testid="sync-now">
            {busy ? 'Syncing…' : 'Sync now'}
          </button>
          <button type="button" class="btn" ref={close} onClick={() => actions.closeSyncDetails()}>Close</button>
        </div>
      </div>
    </div>
  );
}
