import { useState } from 'preact/hooks';
import type { AppActions, AppState } from '../../app/app-state';
import { entityIdFor } from '../../app/characteristic-form';
import type { Line, Station } from '../../schema';
import { CHART_SHORT_NAME } from './chart-names';
import { NameForm } from './NameForm';
import { OfflineNotice } from './OfflineNotice';
import { SiteCausesEditor } from './SiteCausesEditor';
import './setup.css';

/** Lines, their stations and the characteristics measured there: add and rename, open a characteristic to change it. */
export function SetupScreen({ state, actions }: { state: AppState; actions: AppActions }) {
  const { setup } = state;
  const [renaming, setRenaming] = useState<string | null>(null);
  if (state.person?.role !== 'engineer' && state.person?.role !== 'admin') {
    return <main class="main"><p>Only a quality engineer or an admin can change set-up.</p></main>;
  }
  const siteId = state.device?.siteId ?? setup.sites[0]?.id ?? '';
  const lines = [...setup.lines].sort((a, b) => a.name.localeCompare(b.name));
  const saveLine = (line: Line, what: string) => actions.saveSetup([{ kind: 'line', id: line.id, body: line }], what);
  const saveStation = (st: Station, what: string) => actions.saveSetup([{ kind: 'station', id: st.id, body: st }], what);
  const done = (ok: boolean) => {
    if (ok) setRenaming(null);
    return ok;
  };
  return (
    <main class="main stack setup-screen">
      <button type="button" class="btn quiet small back-link" onClick={() => actions.open({ name: 'board' })}>← Station board</button>
      <h1>Set-up of lines, stations and characteristics</h1>
      <OfflineNotice sync={state.sync} />
      <ul class="setup-tree">
        {lines.map((line) => (
          <li key={line.id} class="card stack" data-testid={`setup-line-${line.id}`}>
            {renaming === line.id ? (
              <NameForm id={`rename-${line.id}`} label="New name of the line" initial={line.name} submitLabel="Rename"
                onSave={async (name) => done(await saveLine({ ...line, name }, `The new name of ${line.name}`))} onCancel={() => setRenaming(null)} />
            ) : (
              <div class="row" style="justify-content:space-between">
                <h2>{line.name}</h2>
                <button type="button" class="btn small" onClick={() => setRenaming(line.id)} aria-label={`Rename line ${line.name}`}>Rename</button>
              </div>
            )}
            {setup.stations.filter((s) => s.lineId === line.id).map((st) => (
              <div key={st.id} class="station stack" style="gap:8px">
                {renaming === st.id ? (
                  <NameForm id={`rename-${st.id}`} label="New name of the station" initial={st.name} submitLabel="Rename"
                    onSave={async (name) => done(await saveStation({ ...st, name }, `The new name of ${st.name}`))} onCancel={() => setRenaming(null)} />
                ) : (
                  <div class="row" style="justify-content:space-between">
                    <h3>{st.name}</h3>
                    <div class="row" style="gap:8px">
                      <button type="button" class="btn small" onClick={() => setRenaming(st.id)} aria-label={`Rename station ${st.name}`}>Rename</button>
                      <button type="button" class="btn small primary" onClick={() => actions.open({ name: 'edit-characteristic', stationId: st.id })}
                        data-testid={`new-characteristic-${st.id}`} aria-label={`New characteristic at ${st.name}`}>New characteristic</button>
                    </div>
                  </div>
                )}
                <ul class="char-list">
                  {setup.characteristics.filter((c) => c.stationId === st.id).map((c) => (
                    <li key={c.id} class="row" style="justify-content:space-between">
                      <span>{c.name} <span class="hint">· {c.unit} · {CHART_SHORT_NAME[c.chartType]}{c.safetyCritical ? ' · safety-critical' : ''}</span></span>
                      <button type="button" class="btn small" onClick={() => actions.open({ name: 'edit-characteristic', characteristicId: c.id })}
                        aria-label={`Change ${c.name}`}>Change</button>
                    </li>
                  ))}
                </ul>
              </div>
            ))}
            <NameForm id={`new-station-${line.id}`} label={`New station on ${line.name}`} submitLabel="Add station"
              onSave={(name) => {
                const id = entityIdFor(name, new Set(setup.stations.map((s) => s.id)), 'st');
                return saveStation({ id, lineId: line.id, name }, `The new station ${name}`);
              }} />
          </li>
        ))}
      </ul>
      <section class="card stack" aria-labelledby="new-line-title">
        <h2 id="new-line-title">Add a line</h2>
        <NameForm id="new-line" label="Name of the new line" submitLabel="Add line"
          onSave={(name) => saveLine({ id: entityIdFor(name, new Set(setup.lines.map((l) => l.id)), 'ln'), siteId, name }, `The new line ${name}`)} />
      </section>
      <SiteCausesEditor state={state} actions={actions} />
    </main>
  );
}
