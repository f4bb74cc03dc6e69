// The screen table for the terminal.
import type { ScreenRow } from '../screen.js';
import { formatTableNumber as num } from './format.js';
import { terminalLines } from './escape.js';

/** Rows as an aligned text table (failed rows show their error). */
export function formatScreenTable(rows: ScreenRow[]): string {
  const header = ['metal', 'support', 'direction', 'barrier eV', 'bending eV', 'e-/particle', 'W_Q nm', 'P(s->m)', 'note'];
  const body = rows.map((r) => [
    r.metal,
    r.support,
    r.direction ?? 'failed',
    num(r.barrierHeight_eV, 3),
    num(r.bandBending_eV, 3),
    num(r.electronsPerParticle, 3),
    num(r.chargeEquivalentWidth_nm, 3),
    r.probabilitySupportToMetal === null ? '' : r.probabilitySupportToMetal.toFixed(2),
    r.error !== '' ? r.error.slice(0, 60) : r.warnings.map((w) => w.code).join(' '),
  ]);
  const widths = header.map((h, i) => Math.max(h.length, ...body.map((b) => b[i]!.length)));
  const line = (cells: string[]): string => cells.map((c, i) => c.padEnd(widths[i]!)).join('  ').trimEnd();
  return terminalLines([line(header), line(widths.map((w) => '-'.repeat(w))), ...body.map(line)]);
}

