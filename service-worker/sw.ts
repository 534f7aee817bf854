/// <reference lib="webworker" />
// Plumbline's service worker: precache the app shell so the tablet opens and works with no
// network, and answer every navigation with the cached index.html. It never touches
// IndexedDB (sync.md §2.3): the outbox belongs to the page.
import { cleanupOutdatedCaches, createHandlerBoundToURL, precacheAndRoute } from 'workbox-precaching';
import { NavigationRoute, registerRoute } from 'workbox-routing';
import { clientsClaim } from 'workbox-core';

declare const self: ServiceWorkerGlobalScope & {
  __WB_MANIFEST: Array<string | { url: string; revision: string | null }>;
};

// A waiting worker takes over only when the page asks (after its outbox is idle).
self.addEventListener('message', (event: ExtendableMessageEvent) => {
  if (event.data === 'plumbline:activate-update') void self.skipWaiting();
});
clientsClaim();
cleanupOutdatedCaches();
precacheAndRoute(self.__WB_MANIFEST);
registerRoute(new NavigationRoute(createHandlerBoundToURL('index.html'), { denylist: [/^\/api\//] }));

// Background Sync (Chromium only) is a wake-up call: the page owns the sender, so tell it to run.
self.addEventListener('sync', (event: Event) => {
  const e = event as ExtendableEvent & { tag?: string };
  if (e.tag !== 'plumbline-outbox') return;
  e.waitUntil(
    self.clients.matchAll({ type: 'window' }).then((clients) => {
      for (const c of clients) c.postMessage('plumbline:sync-now');
    }),
  );
});
