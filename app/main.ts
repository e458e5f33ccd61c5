import './ui';
import type { SeedfallApp } from './ui';

// Planning runs in a worker so dragging and typing never wait for the Monte Carlo.
const app = document.querySelector('seedfall-app') as SeedfallApp | null;
if (app) {
  app.store.startWorker(
    () => new Worker(new URL('./worker/plan-worker.ts', import.meta.url), { type: 'module' }),
  );
}
