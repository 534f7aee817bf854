import { useState } from 'preact/hooks';
import type { AppActions, AppState } from '../app/app-state';

/** First start on a tablet: exchange the one-time code from the site's admin for a device token. */
export function EnrolScreen({ state, actions }: { state: AppState; actions: AppActions }) {
  const [code, setCode] = useState('');
  const [name, setName] = useState('');
  const [busy, setBusy] = useState(false);
  const submit = async (e: Event) => {
    e.preventDefault();
    setBusy(true);
    await actions.enrol(code.trim(), name.trim());
    setBusy(false);
  };
  return (
    <main class="main">
      <form class="card stack centre-panel" onSubmit={submit} aria-labelledby="enrol-title">
        <h1 id="enrol-title">Connect this tablet to the site</h1>
        <p class="hint">
          Ask the site's administrator for a one-time connection code. It works once and expires. This is needed
          only the first time; afterwards the tablet works with or without a network.
        </p>
        <label class="stack" style="gap:6px">
          <span>Connection code</span>
          <input class="text-input" name="code" autocomplete="off" autocapitalize="characters" value={code}
            onInput={(e) => setCode((e.target as HTMLInputElement).value)} required />
        </label>
        <label class="stack" style="gap:6px">
          <span>Name of this tablet</span>
          <input class="text-input" name="deviceName" placeholder="e.g. Press 4 tablet" value={name}
            onInput={(e) => setName((e.target as HTMLInputElement).value)} required />
        </label>
        {state.error ? <p class="error-text" role="alert">{state.error}</p> : null}
        <button type="submit" class="btn primary" disabled={busy || !code.trim() || !name.trim()}>
          {busy ? 'Connecting…' : 'Connect tablet'}
        </button>
      </form>
    </main>
  );
}
