// Stub of node:path for the browser bundle (see unavailable.ts).
import { unavailable } from './unavailable.js';

export const basename = unavailable('path.basename');
export const dirname = unavailable('path.dirname');
export const extname = unavailable('path.extname');
export const isAbsolute = unavailable('path.isAbsolute');
export const join = unavailable('path.join');
export const relative = unavailable('path.relative');
export const resolve = unavailable('path.resolve');
export const sep = '/';
export default { basename, dirname, extname, isAbsolute, join, relative, resolve, sep };
