// Web Worker entries run planDrop and the safety checks, altitude sweeps and forecast timelines,
// and large imports off the main thread; each is started by URL (new Worker(new URL(...))).
// The public face of app/worker/: the messages the page and the workers exchange (types only).
export type { ImportReply, ImportRequest } from './import-worker';
export type { WorkerReply, WorkerRequest } from './protocol';
export type { SweepReply, SweepRequest } from './sweep-worker';
export type { DemReply, DemRequest } from './dem-worker';
