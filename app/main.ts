/// <reference types="vite-plugin-pwa/client" />
import { registerSW } from 'virtual:pwa-register';
import { offerAppUpdate, type SeedfallApp } from './ui';

// Planning runs in a worker so dragging and typing never wait for the Monte Carlo.
const app = document.querySelector('seedfall-app') as SeedfallApp | null;
if (app) {
  app.store.startWorker(
    () => new Worker(new URL('./worker/plan-worker.ts', import.meta.url), { type: 'module' }),
  );
}

// Installable and offline: the service worker (vite.config.ts, docs/decisions/0009) keeps every
// file of the app after the first visit. A new version waits until the person clicks Reload in
// the status line; this tab never reloads by itself, not even when another tab let it take over.
const UPDATE_CHECK_MS = 60 * 60 * 1000;
let clicked = false;
const redraw = (): void => void app?.requestUpdate();
const updateSW = registerSW({
  onNeedRefresh() {
    offerAppUpdate(() => {
      clicked = true;
      app?.store.flush();
      void updateSW(true);
    }, redraw);
  },
  onNeedReload() {
    if (clicked) window.location.reload();
    else offerAppUpdate(() => (app?.store.flush(), window.location.reload()), redraw);
  },
  onRegisteredSW(_url, registration) {
    // A tab left open for days still hears of a new version.
    if (registration)
      setInterval(() => {
        if (navigator.onLine) void registration.update().catch(() => {});
      }, UPDATE_CHECK_MS);
  },
});
