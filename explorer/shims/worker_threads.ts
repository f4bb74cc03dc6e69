// Stub of node:worker_threads for the browser bundle (see unavailable.ts); the page uses a Web Worker instead.
import { unavailable } from './unavailable.js';

export const Worker = unavailable('worker_threads.Worker');
export const isMainThread = true;
export const parentPort = null;
export const workerData = undefined;
export default { Worker, isMainThread, parentPort, workerData };
