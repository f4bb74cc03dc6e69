// Messages between the page (main.ts) and the solver worker (worker.ts).
import type { ContactResult } from '../src/types.js';

/** Inputs as the user typed them: option name -> text (a number in the display unit, or with its own unit). */
export type InputValues = Record<string, string>;

/** What the page shows beside one control. */
export interface RowInfo {
  option: string;
  /** false when the input is not used with the other inputs (giving it would be refused) */
  applicable: boolean;
  /** the value the solve used, in the display unit (absent when the row was not used) */
  used?: { value: number; unit: string; origin: string; citation?: string; fromMemory?: boolean };
  /** the library value for the chosen metal/support, with its citation */
  library?: { value: number; unit: string; min?: number; max?: number; citation: string; fromMemory: boolean };
}

export interface MaterialName {
  name: string;
  fullName: string;
}

export interface Catalog {
  type: 'catalog';
  metals: MaterialName[];
  supports: MaterialName[];
  /** numeric scalar outputs (study output paths) a sweep may plot */
  outputs: string[];
}

export interface SolveRequest {
  type: 'solve';
  id: number;
  inputs: InputValues;
}

export interface Solved {
  type: 'solved';
  id: number;
  result: ContactResult;
  rows: RowInfo[];
  /** solver time in the worker, ms */
  solve_ms: number;
}

export interface Failed {
  type: 'failed';
  id: number;
  /** the flag or field named by the error */
  field: string;
  message: string;
  rows: RowInfo[];
}

export interface SweepAxis {
  option: string;
  from: number;
  to: number;
  points: number;
  log: boolean;
}

export interface SweepRequest {
  type: 'sweep';
  id: number;
  inputs: InputValues;
  axis: SweepAxis;
  output: string;
}

export interface Swept {
  type: 'swept';
  id: number;
  xs: number[];
  /** null where the point failed or the output is not a finite number */
  ys: (number | null)[];
  /** first failure message, if any point failed */
  failure: string | null;
  failed: number;
  sweep_ms: number;
}

export type ToWorker = SolveRequest | SweepRequest;
export type FromWorker = Catalog | Solved | Failed | Swept;
