/**
 * The app's Web Workers. Each `new Worker(new URL(…, import.meta.url))` is written out literally so Vite
 * bundles the worker entry (worker: { format: 'es' }); the CSP allows workers from 'self'.
 */
import { adaptWebWorker } from '../../core/parallel/webWorker.ts';
import type { WorkerFactory } from '../../core/parallel/protocol.ts';

export const footprintWorkerFactory: WorkerFactory = () =>
  adaptWebWorker(new Worker(new URL('../workers/footprint.worker.ts', import.meta.url), { type: 'module' }));

export const trajectoryWorkerFactory: WorkerFactory = () =>
  adaptWebWorker(new Worker(new URL('../workers/trajectory.worker.ts', import.meta.url), { type: 'module' }));

export const studyWorkerFactory: WorkerFactory = () =>
  adaptWebWorker(new Worker(new URL('../workers/study.worker.ts', import.meta.url), { type: 'module' }));

export const terrainWorkerFactory: WorkerFactory = () =>
  adaptWebWorker(new Worker(new URL('../workers/terrain.worker.ts', import.meta.url), { type: 'module' }));
