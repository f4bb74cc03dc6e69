// Stub of node:os for the browser bundle (see unavailable.ts).
import { unavailable } from './unavailable.js';

export const availableParallelism = unavailable('os.availableParallelism');
export const cpus = unavailable('os.cpus');
export const hostname = unavailable('os.hostname');
export const loadavg = unavailable('os.loadavg');
export const tmpdir = unavailable('os.tmpdir');
export default { availableParallelism, cpus, hostname, loadavg, tmpdir };
