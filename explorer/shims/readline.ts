// Stub of node:readline for the browser bundle (see unavailable.ts).
import { unavailable } from './unavailable.js';

export const createInterface = unavailable('readline.createInterface');
export default { createInterface };
