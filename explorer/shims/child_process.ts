// Stub of node:child_process for the browser bundle (see unavailable.ts).
import { unavailable } from './unavailable.js';

export const spawn = unavailable('child_process.spawn');
export const spawnSync = unavailable('child_process.spawnSync');
export default { spawn, spawnSync };
