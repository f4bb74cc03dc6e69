// User text reaches the terminal and Markdown only through src/output/escape.ts (bandbend issue 13, item 6):
// end-to-end checks that the command line and the report writer use it. The escaping functions themselves are
// checked in test/hostile.test.ts against a CommonMark renderer (markdown-it 15, the reference here too).
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import MarkdownIt from 'markdown-it';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runBandbend } from './helpers.js';
import { solveContact } from '../src/contact.js';
import { contactReportMarkdown } from '../src/output/report.js';

let work: string;
let materialsFile: string;

// Hostile user text: a colour + clear-screen + window-title sequence, a bell, a C1 CSI, and Markdown that would
// be a javascript: link and a remote image if passed through.
const NASTY_NOTE = 'note \u001b[31mred\u001b[0m \u001b[2J\u001b]0;pwned\u0007 bell\u0007 c1\u009b1m [x](javascript:alert(1)) ![](http://tracker.example/p.png)';
const NASTY_TITLE = 'Ref \u001b[1mbold\u001b[22m [click](javascript:alert(2)) ![i](http://tracker.example/t.png)';

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'bandbend-escape-'));
  // Invented test oxide; numbers are not data (format: materials/README.md).
  const pv = (value: number) => ({ value, source: 'bandbend-escape-test', note: NASTY_NOTE });
  const file = {
    references: [{ id: 'bandbend-escape-test', type: 'report', title: NASTY_TITLE }],
    supports: [
      {
        name: 'Escapite',
        fullName: 'Escapite \u001b[5mblink\u001b[25m (invented)',
        formula: 'ZnO',
        electronAffinity_eV: pv(4.0),
        bandGap_eV: pv(3.0),
        staticPermittivity: pv(10),
        opticalPermittivity: pv(4),
        electronMass_me: pv(0.3),
        holeMass_me: pv(1),
        conductionType: 'n',
        typicalDensity_cm3: pv(1e18),
      },
    ],
  };
  materialsFile = join(work, 'nasty.json');
  writeFileSync(materialsFile, JSON.stringify(file));
});

afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

const bandbend = runBandbend; // test/helpers.ts: the built CLI from the package root

// C0 (except line feed), DEL, C1 and bidirectional controls
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/;

describe('terminal output of user text', () => {
  it('materials show: notes, full name and citation title print without ESC, BEL or C1', () => {
    const r = bandbend(['materials', 'show', 'Escapite', '--materials', materialsFile]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).not.toMatch(CONTROL);
    expect(r.stdout).toContain('note red'); // the visible text stays
    expect(r.stdout).toContain('bell');
    expect(r.stdout).toContain('Escapite blink (invented)');
  });

  it('contact summary of a user support prints without control characters', () => {
    const r = bandbend(['contact', '--metal', 'Pt', '--support', 'Escapite', '--materials', materialsFile]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).not.toMatch(CONTROL);
  });

  it('error messages quoting user text are one line without control characters (InputError and usage errors)', () => {
    for (const args of [
      ['contact', '--metal', '\u001b[31mPtx\u0007', '--support', 'ZnO'],
      ['contact', '--bogus\u001b]0;t\u0007'],
      ['contact', '--geometry', 'x\u001b[2J'],
      ['materials', 'show', '\u009b31mPt'],
    ]) {
      const r = bandbend(args);
      expect(r.code, r.stderr).toBe(2);
      const lines = r.stderr.trimEnd().split('\n');
      expect(lines, r.stderr).toHaveLength(1);
      expect(lines[0]).toMatch(/^bandbend: error: \S/);
      expect(lines[0]).not.toMatch(CONTROL);
    }
  });
});

describe('Markdown report (summary.md) of user text', () => {
  it('notes and citations from a user materials file stay literal: no link, no image, no control characters', () => {
    const result = solveContact({ metal: 'Pt', support: 'Escapite', materials: [materialsFile] });
    const markdown = contactReportMarkdown(result, { title: NASTY_TITLE }, []);
    expect(markdown).not.toMatch(CONTROL);
    const html = new MarkdownIt({ html: true, linkify: true }).render(markdown);
    expect(html).not.toMatch(/<a |<img |<script/);
    expect(html).toContain('javascript:alert(1)'); // still there, as text
    expect(html).toContain('tracker.example/p.png');
  });
});
