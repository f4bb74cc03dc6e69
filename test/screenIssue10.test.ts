// Screens (issue 10 item 7): each support keeps its own library donor density unless the user gives one, the table
// says which, and shallow fully ionised donors forced into a wide-gap insulator are flagged.
import { describe, expect, it } from 'vitest';
import { runScreen, SCREEN_COLUMNS } from '../src/screen.js';
import { loadLibrary } from '../src/materials/load.js';

const library = loadLibrary();

describe('screen donor densities (issue 10 item 7)', () => {
  it('without --donors every row states where its donor density came from, and the column is in the table', () => {
    const rows = runScreen({ metals: ['Pt'], supports: ['ZnO', 'MgO'], conditions: { temperature: '473 K' }, materials: library });
    expect(SCREEN_COLUMNS).toContain('donorSource');
    for (const row of rows.filter((r) => r.error === '')) {
      expect(['library', 'default']).toContain(row.donorSource);
      // 'default' means none was found: the density is then 0, not a value shared with another support
      if (row.donorSource === 'default') expect(row.donorDensity_cm3).toBe(0);
    }
  });
  it('one donor density for all: rows say "user"; MgO keeps its deep library level (F centre) and is not flagged', () => {
    const rows = runScreen({ metals: ['Pt'], supports: ['ZnO', 'MgO'], conditions: { temperature: '473 K', donors: '1e18' }, materials: library });
    const mgo = rows.find((r) => r.support === 'MgO')!;
    expect(mgo.error).toBe('');
    expect(rows.every((r) => r.donorSource === 'user')).toBe(true);
    expect(mgo.warnings.map((w) => w.code)).not.toContain('shallow-donors-in-insulator');
  });
  it('shallow donors forced into MgO (gap ~7.8 eV) are flagged, in ZnO (3.3 eV) not', () => {
    // F centres in MgO absorb near 5 eV (Kappers, Kroes & Hensley, Phys. Rev. B 1, 4151 (1970)): donors there are eV deep
    const rows = runScreen({
      metals: ['Pt'],
      supports: ['ZnO', 'MgO'],
      conditions: { temperature: '473 K', donors: '1e18', donorLevel: '0.03 eV', donorType: 'single' },
      overrideMaterials: true,
      materials: library,
    });
    const zno = rows.find((r) => r.support === 'ZnO')!;
    const mgo = rows.find((r) => r.support === 'MgO')!;
    expect(mgo.error).toBe('');
    expect(mgo.warnings.map((w) => w.code)).toContain('shallow-donors-in-insulator');
    expect(zno.warnings.map((w) => w.code)).not.toContain('shallow-donors-in-insulator');
  });
});
