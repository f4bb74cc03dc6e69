// Stub of node:fs/promises for the browser bundle (see unavailable.ts).
import { unavailable } from './unavailable.js';

export const mkdir = unavailable('fs.promises.mkdir');
export const readFile = unavailable('fs.promises.readFile');
export const readdir = unavailable('fs.promises.readdir');
export const stat = unavailable('fs.promises.stat');
export const writeFile = unavailable('fs.promises.writeFile');
export default { mkdir, readFile, readdir, stat, writeFile };
