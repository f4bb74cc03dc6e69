// Stub of node:module for the browser bundle. src/materials/estimate.ts reads the `periodic-table` package with
// createRequire when it loads; here that package is rebuilt from its data file, bundled (its index.js needs
// __dirname), in the shape estimate.ts reads (`symbols`, plus `elements` and `numbers` like the package), so that
// --support-formula estimates work on the page too; zod likewise for the materials schemas. Any other require throws.
import data from 'periodic-table/data.json' with { type: 'json' };
import { z } from 'zod';
import { unavailable } from './unavailable.js';

interface Element {
  symbol: string;
  name: string;
  atomicNumber: number | string;
}

const list = data as unknown as Element[];
const periodicTable = {
  all: () => list,
  elements: Object.fromEntries(list.map((e) => [e.name, e])),
  symbols: Object.fromEntries(list.map((e) => [e.symbol, e])),
  numbers: Object.fromEntries(list.map((e) => [String(e.atomicNumber), e])),
};

// src/materials/schema.ts requires zod on first use (the CLI loads it only for user files): bundled here.
const BUNDLED: Readonly<Record<string, unknown>> = { 'periodic-table': periodicTable, zod: { z } };

export function createRequire(_from: string | URL): (id: string) => unknown {
  return (id: string) => {
    if (Object.hasOwn(BUNDLED, id)) return BUNDLED[id];
    return unavailable(`require('${id}')`)();
  };
}
export default { createRequire };
