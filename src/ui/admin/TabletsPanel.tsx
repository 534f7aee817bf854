import { useState } from 'preact/hooks';
import type { AdminView } from '../../app/admin-controller';
import type { AppActions, AppState } from '../../app/app-state';
import { coverageNote } from '../../app/record-coverage';
import type { AdminDevice } from '../../schema';
import { formatShortDateTime } from '../format-time';
import { EnrolmentCodeCard } from './EnrolmentCodeCard';

const when = (iso: string | null | undefined) => (iso ? formatShortDateTime(iso) : 'Not yet');

/** The site's tablets: when each was connected and last heard of; withdraw one or give a withdrawn one back; a code to connect a new one. */
export function TabletsPanel({ state, view, actions }: { state: AppState; view: AdminView; actions: AppActions }) {
  const [confirming, setConfirming] = useState<string | undefined>();
  const devices = view.devices ?? [];
  return (
    <div class="stack">
      <EnrolmentCodeCard state={state} view={view} actions={actions} />
      <section class="stack" aria-labelledby="tablets-title">
        <h2 id="tablets-title">Tablets of this site{view.devices ? ` (${devices.length})` : ''}</h2>
        <p class="hint">“Last sent records” and “Last sign-in” are what the server saw; a tablet that only received updates does not show there.</p>
        {view.devices ? (
          <table class="handover-table admin-table" data-testid="tablets-table">
            <thead>
              <tr><th scope="col">Tablet</th><th scope="col">Last sent records</th><th scope="col">Last sign-in</th><th scope="col">State</th><th scope="col"><span class="sr-only">Actions</span></th></tr>
            </thead>
            <tbody>
              {devices.map((d) => (
                <TabletRow key={d.id} device={d} isThis={d.id === state.device?.deviceId} actions={actions}
                  confirming={confirming === d.id} onConfirm={(on) => setConfirming(on ? d.id : undefined)} />
              ))}
            </tbody>
          </table>
        ) : view.loading ? <p class="hint">Loading the tablets of the site…</p> : null}
      </section>
    </div>
  );
}

function TabletRow({ device: d, isThis, actions, confirming, onConfirm }: { device: AdminDevice; isThis: boolean; actions: AppActions; confirming: boolean; onConfirm(on: boolean): void }) {
  const [busy, setBusy] = useState(false);
  const coverage = coverageNote(d.records);
  const withdraw = async () => {
    setBusy(true);
    await actions.adminRevokeTablet(d.id);
    setBusy(false);
    onConfirm(false);
  };
  const reinstate = async () => {
    setBusy(true);
    await actions.adminReinstateTablet(d.id);
    setBusy(false);
    onConfirm(false);
  };
  return (
    <>
      <tr data-testid={`tablet-${d.name}`}>
        <th scope="row">
          {d.name}{isThis ? <span class="hint"> (this tablet)</span> : null}
          <span class="admin-sub">Connected {formatShortDateTime(d.enrolledAt)}</span>
        </th>
        <td>
          {when(d.lastUploadAt)}
          {coverage ? <span class={coverage.missing ? 'admin-sub coverage-missing' : 'admin-sub'} data-testid="record-coverage">{coverage.text}</span> : null}
        </td>
        <td>{when(d.lastSignInAt)}</td>
        <td>
          {d.revokedAt ? (
            // The time under the chip, which does not wrap: the table then fits a portrait screen.
            <><span class="chip neutral">Withdrawn</span><span class="admin-sub">{formatShortDateTime(d.revokedAt)}</span></>
          ) : <span class="chip steady">In use</span>}
        </td>
        <td>
          {d.revokedAt ? (
            confirming ? null : (
              <button type="button" class="btn small" onClick={() => onConfirm(true)} aria-label={`Reinstate tablet ${d.name}`}>Reinstate</button>
            )
          ) : confirming ? (
            <div class="stack" style="gap:8px">
              <span class="hint">
                {isThis ? 'This is the tablet you are using: it will stop syncing at once. ' : ''}
                It can no longer send or receive; records it has not sent stay on it.
              </span>
              <div class="row" style="gap:8px">
                <button type="button" class="btn small warn" disabled={busy} onClick={() => void withdraw()}>Withdraw “{d.name}”</button>
                <button type="button" class="btn small" onClick={() => onConfirm(false)}>Keep</button>
              </div>
            </div>
          ) : (
            <button type="button" class="btn small" onClick={() => onConfirm(true)} aria-label={`Withdraw tablet ${d.name}`}>Withdraw</button>
          )}
        </td>
      </tr>
      {d.revokedAt && confirming ? (
        // Full width under the tablet's row, so that the explanation reads as a paragraph on a narrow screen.
        <tr class="confirm-row">
          <td colSpan={5}>
            <div class="stack" style="gap:8px" data-testid="reinstate-confirm">
              <span class="hint">
                “{d.name}” syncs again with the connection it already has (no new code needed): records it has not sent go to
                the server at its next sync, and it receives updates again. Reinstate it only if it is back in trusted hands.
              </span>
              <div class="row" style="gap:8px">
                <button type="button" class="btn small primary" disabled={busy} onClick={() => void reinstate()}>Reinstate “{d.name}”</button>
                <button type="button" class="btn small" onClick={() => onConfirm(false)}>Keep withdrawn</button>
              </div>
            </div>
          </td>
        </tr>
      ) : null}
    </>
  );
}
