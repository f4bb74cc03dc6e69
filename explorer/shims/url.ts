// Stub of node:url for the browser bundle (see unavailable.ts).
import { unavailable } from './unavailable.js';

export const fileURLToPath = unavailable('url.fileURLToPath');
export const pathToFileURL = unavailable('url.pathToFileURL');
export default { fileURLToPath, pathToFileURL };
