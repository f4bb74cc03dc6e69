// Stub of node:fs for the browser bundle (see unavailable.ts).
import { unavailable } from './unavailable.js';

export const accessSync = unavailable('fs.accessSync');
export const closeSync = unavailable('fs.closeSync');
export const createReadStream = unavailable('fs.createReadStream');
export const existsSync = unavailable('fs.existsSync');
export const fstatSync = unavailable('fs.fstatSync');
export const ftruncateSync = unavailable('fs.ftruncateSync');
export const lstatSync = unavailable('fs.lstatSync');
export const mkdirSync = unavailable('fs.mkdirSync');
export const mkdtempSync = unavailable('fs.mkdtempSync');
export const openSync = unavailable('fs.openSync');
export const readdirSync = unavailable('fs.readdirSync');
export const readFileSync = unavailable('fs.readFileSync');
export const readSync = unavailable('fs.readSync');
export const realpathSync = unavailable('fs.realpathSync');
export const renameSync = unavailable('fs.renameSync');
export const rmSync = unavailable('fs.rmSync');
export const statSync = unavailable('fs.statSync');
export const writeFileSync = unavailable('fs.writeFileSync');
export const writeSync = unavailable('fs.writeSync');
export const constants: Readonly<Record<string, number>> = {};
export default { closeSync, existsSync, openSync, readFileSync, readSync, statSync, writeFileSync, constants };
