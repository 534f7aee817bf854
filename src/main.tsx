import { render } from 'preact';
import { createPlumblineApp } from './app/create-app';
import { estimateStorage, openAppDb, requestPersistentStorage } from './store';
import { createAdminApi } from './sync/admin-api';
import { createApiClient } from './sync/api-client';
import { newRecordId } from './sync/ids';
import { createSyncEngine } from './sync/sync-engine';
import { App } from './ui/App';
import './ui/styles.css';

async function boot() {
  const db = await openAppDb(undefined, {
    onVersionChange: () => location.reload(),
    onTerminated: () => location.reload(),
  });
  const api = createApiClient({ baseUrl: `${location.origin}/api/v1` });
  const adminApi = createAdminApi({ baseUrl: `${location.origin}/api/v1` });
  const app = createPlumblineApp({
    db,
    api,
    createSync: () => createSyncEngine({ db, api }),
    now: () => Date.now(),
    newId: newRecordId,
    session: sessionStorage,
    prefs: localStorage,
    channel: 'BroadcastChannel' in window ? new BroadcastChannel('plumbline-records') : undefined,
    requestBackgroundSync: () => {
      // Chromium only; elsewhere the foreground sender (online event, timer, app start) does the work.
      void navigator.serviceWorker?.ready
        .then((r) => (r as ServiceWorkerRegistration & { sync?: { register(tag: string): Promise<void> } }).sync?.register('plumbline-outbox'))
        .catch(() => undefined); // not granted or not supported: the foreground sender still runs
    },
    storage: { persist: () => requestPersistentStorage(), estimate: () => estimateStorage() },
    adminApi,
    defaultTheme: matchMedia('(prefers-color-scheme: dark)').matches ? 'dark' : 'light',
  });
  render(<App app={app} locale={navigator.language} />, document.getElementById('app')!);
  await app.start();
  // Background Sync wakes the page's sender (Chromium only); every browser also retries in the foreground.
  navigator.serviceWorker?.addEventListener('message', (e) => {
    if (e.data === 'plumbline:sync-now') void app.actions.syncNow();
  });
  (window as unknown as { plumbline?: unknown }).plumbline = app;
}

if ('serviceWorker' in navigator && import.meta.env.PROD) {
  void navigator.serviceWorker.register('/sw.js');
}
void boot();
