// Hostile input at the command line: strings that an expression evaluator would run, files that are not files,
// huge data. Every case where the input is at fault exits 2 with one line; each run gets a 256 MB heap
// (--max-old-space-size), so anything that tried to allocate in proportion to the hostile input would crash
// instead (exit 134), and a 60 s timeout, so a hang fails the test rather than the suite.
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import MarkdownIt from 'markdown-it';
import { parseCapacitanceCsv, fitMottSchottky } from '../src/derived/mottSchottky.js';
import { escapeMarkdownCell, escapeMarkdownText, stripControl, stripTerminalControl } from '../src/output/escape.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
let work: string;

beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'bandbend-hostile-'));
});

afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

interface Run {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

function bandbend(args: string[]): Run {
  const env: NodeJS.ProcessEnv = { ...process.env, NO_COLOR: '1' };
  delete env['BANDBEND_DEBUG'];
  const r = spawnSync(process.execPath, ['--max-old-space-size=256', 'bin/bandbend.js', ...args], {
    cwd: ROOT,
    encoding: 'utf8',
    env,
    timeout: 60_000,
    maxBuffer: 16 * 1024 * 1024,
  });
  if (r.error) throw r.error;
  return { code: r.status, signal: r.signal, stdout: r.stdout, stderr: r.stderr };
}

function show(r: Run): string {
  return `exit ${String(r.code)} signal ${String(r.signal)}\n--- stderr\n${r.stderr.slice(0, 2000)}`;
}

/** Exit 2, nothing on stdout, one line on stderr without control characters, mentioning each string given. */
function expectBadInput(r: Run, ...mentions: string[]): string {
  expect(r.code, show(r)).toBe(2);
  expect(r.stdout, show(r)).toBe('');
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines, show(r)).toHaveLength(1);
  const line = lines[0]!;
  expect(line, show(r)).toMatch(/^bandbend: error: \S/);
  // eslint-disable-next-line no-control-regex
  expect(line, show(r)).not.toMatch(/[\u0000-\u0008\u000b-\u001f\u007f-\u009f]/);
  for (const m of mentions) expect(line, show(r)).toContain(m);
  return line;
}

const PAIR = ['contact', '--metal', 'Pt', '--support', 'ZnO'];

describe('unit strings are never evaluated (CLI exit 2)', () => {
  it.each([
    ['--temperature', 'ones(3000,3000) K'],
    ['--donors', 'zeros(20000,20000)'],
    ['--donors', '1e18 cm^-3 * ones(3000,3000)'],
    ['--work-function', '1 eV + 2 eV'],
    ['--particle-diameter', '1e999999999 nm'],
    ['--temperature', '300 K\u001b[2J\u0007'],
    ['--donors', '1'.repeat(100_000)],
  ].map(([flag, value]) => [flag, value.length > 60 ? `${value.slice(0, 20)}... (${value.length} characters)` : value, value] as const))(
    '%s %j',
    (flag, _title, value) => {
      const line = expectBadInput(bandbend([...PAIR, flag, value]), flag);
      expect(line.length, line).toBeLessThan(400);
    },
  );

  it('a study axis unit goes through the same grammar', () => {
    const study = join(work, 'axis.json');
    writeFileSync(
      study,
      JSON.stringify({
        name: 'hostile-axis',
        base: { metal: 'Pt', support: 'ZnO' },
        sweep: { axes: [{ field: 'donors', values: [1e17, 1e18], unit: 'cm^-3 * ones(3000,3000)' }] },
      }),
    );
    expectBadInput(bandbend(['study', study, '--out', join(work, 'axis-out')]), 'axis.json', 'sweep.axes[0].unit', 'not a unit of a volume density');
  });
});

describe('empty strings name their field (CLI exit 2, one line)', () => {
  it('an empty --materials path, list entry, study file, shard folder or numeric study option', () => {
    const study = join(ROOT, 'examples', 'study-support-reduction.yaml');
    const out = join(work, 'empty-strings');
    expectBadInput(bandbend([...PAIR, '--materials', '']), '--materials', 'missing path');
    expectBadInput(bandbend(['materials', 'list', '--materials', '']), '--materials', 'missing path');
    expectBadInput(bandbend(['screen', '--metals', 'Pt,,Au', '--supports', 'ZnO']), '--metals', 'empty name');
    expectBadInput(bandbend(['screen', '--metals', 'Pt', '--supports', 'ZnO,']), '--supports', 'empty name');
    expectBadInput(bandbend(['study', '', '--out', out]), 'study FILE', 'missing path');
    expectBadInput(bandbend(['study', 'merge', '', '--out', out]), 'study merge', 'missing path');
    expectBadInput(bandbend(['study', study, '--out', out, '--jobs', '']), '--jobs', 'missing value');
    expectBadInput(bandbend(['study', study, '--out', out, '--point-timeout', ' ']), '--point-timeout', 'missing value');
  });
});

describe('files that are not regular files (CLI exit 2, one line, no file bytes echoed)', () => {
  it('--materials /dev/zero, a symbolic link to it, a FIFO, a folder, a missing file', () => {
    expectBadInput(bandbend([...PAIR, '--materials', '/dev/zero']), '/dev/zero', 'only regular files are read');
    const link = join(work, 'zero.json');
    symlinkSync('/dev/zero', link);
    expectBadInput(bandbend([...PAIR, '--materials', link]), link, 'only regular files are read');
    const fifo = join(work, 'fifo.json');
    expect(spawnSync('mkfifo', [fifo]).status).toBe(0);
    expectBadInput(bandbend([...PAIR, '--materials', fifo]), fifo, 'pipe (FIFO)');
    const folder = join(work, 'folder.json');
    mkdirSync(folder);
    expectBadInput(bandbend([...PAIR, '--materials', folder]), folder, 'is a folder');
    const missing = join(work, 'missing.json');
    expectBadInput(bandbend([...PAIR, '--materials', missing]), missing, 'file not found');
  });

  it('a binary materials file is refused without echoing its bytes', () => {
    const binary = join(work, 'binary.json');
    writeFileSync(binary, Buffer.concat([Buffer.from('SECRET-BYTES\u001b]0;title\u0007'), Buffer.alloc(64)]));
    const line = expectBadInput(bandbend([...PAIR, '--materials', binary]), binary, 'NUL bytes');
    expect(line).not.toContain('SECRET');
  });

  it('mott-schottky on /dev/zero, a FIFO and a missing file', () => {
    expectBadInput(bandbend(['mott-schottky', '/dev/zero', '--permittivity', '31']), '/dev/zero');
    const fifo = join(work, 'fifo.csv');
    expect(spawnSync('mkfifo', [fifo]).status).toBe(0);
    expectBadInput(bandbend(['mott-schottky', fifo, '--permittivity', '31']), fifo, 'pipe (FIFO)');
    expectBadInput(bandbend(['mott-schottky', join(work, 'none.csv'), '--permittivity', '31']), 'none.csv', 'file not found');
  });

  it('a study file that is /dev/zero or a folder', () => {
    expectBadInput(bandbend(['study', '/dev/zero', '--out', join(work, 'o1')]), '/dev/zero');
    expectBadInput(bandbend(['study', work, '--out', join(work, 'o2')]), 'is a folder');
  });
});

describe('output folders and files at bad paths (CLI exit 2, one line; folders made by createFolder)', () => {
  const STUDY = 'examples/study-support-reduction.yaml';
  const MS = ['mott-schottky', 'examples/mott-schottky-sample.csv', '--permittivity', '31'];
  it.each([
    [['demo', '--out', '/dev/null'], '/dev'],
    [['demo', '--out', '/proc/bandbend-demo'], '/proc'],
    [['demo', '--out', ''], 'missing path'],
    [[...PAIR, '--report', '/proc/bandbend-report'], '/proc'],
    [[...PAIR, '--report', ''], 'missing path'],
    [[...PAIR, '--report', '/dev/null/sub'], 'not a folder'],
    [['screen', '--metals', 'Pt', '--supports', 'ZnO', '--csv', '/nonexistent-bandbend/x.csv'], 'folder does not exist'],
    [['screen', '--metals', 'Pt', '--supports', 'ZnO', '--report', '/sys/bandbend'], '/sys'],
    [['validate', '--report', '/proc/bandbend-validate'], '/proc'],
    [['study', STUDY, '--out', '/proc/bandbend-study'], '/proc'],
    [['study', 'merge', 'a', 'b', '--out', '/sys/bandbend-merge'], '/sys'],
    [[...MS, '--plot', '/nonexistent-bandbend/ms.svg'], 'folder does not exist'],
  ])('%j exits 2 naming the problem', (args, mention) => {
    expectBadInput(bandbend(args), mention);
  });

  it('a folder deeper than the creation bound, and a file in the way, exit 2', () => {
    const deep = join(work, ...Array.from({ length: 20 }, (_, i) => `d${i}`));
    expectBadInput(bandbend(['demo', '--out', deep]), 'new folder levels');
    const file = join(work, 'plain-file');
    writeFileSync(file, 'x');
    expectBadInput(bandbend([...PAIR, '--report', join(file, 'sub')]), 'not a folder');
  });
});

describe('a 130k-row Mott–Schottky CSV (no spread of rows into function calls)', () => {
  // Exact synthetic data from the Mott–Schottky relation for an n-type electrode,
  //   1/C^2 = 2 (V - V_fb - kT/q) / (q eps eps0 N_D)
  // (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 3; kT/q term as in A. W. Bott, Current Separations
  // 17, 87 (1998)); the fit must return N_D and V_fb (CODATA 2018 constants, exact in the SI).
  const Q = 1.602176634e-19;
  const K_B = 1.380649e-23;
  const EPS0 = 8.8541878128e-12;
  const ND_CM3 = 2e18;
  const EPS_R = 10;
  const VFB = -0.4;
  const T = 298.15;
  const ROWS = 130_000;

  function csv(): string {
    const kTq = (K_B * T) / Q;
    const lines = ['potential_V,capacitance_F_per_cm2'];
    for (let i = 0; i < ROWS; i++) {
      const V = -0.3 + (1.5 * i) / (ROWS - 1);
      const invC2 = (2 * (V - VFB - kTq)) / (Q * EPS_R * EPS0 * ND_CM3 * 1e6); // m^4/F^2
      lines.push(`${V.toPrecision(12)},${((1 / Math.sqrt(invC2)) * 1e-4).toPrecision(12)}`);
    }
    return `${lines.join('\n')}\n`;
  }

  it('parses and fits in-process', () => {
    const parsed = parseCapacitanceCsv(csv(), 'big.csv');
    expect(parsed.rows).toHaveLength(ROWS);
    const fit = fitMottSchottky({ rows: parsed.rows, permittivityRelative: EPS_R, temperature_K: T, reference: 'SHE' });
    expect(fit.points).toBe(ROWS);
    expect(Math.abs(fit.dopantDensity_cm3 / ND_CM3 - 1)).toBeLessThan(1e-6);
    expect(fit.flatBandPotential_V).toBeCloseTo(VFB, 6);
  });

  it('through the CLI (file under the 5 MB limit) with a 256 MB heap', () => {
    const text = csv();
    expect(text.length).toBeLessThan(5_000_000);
    const file = join(work, 'big.csv');
    writeFileSync(file, text);
    const r = bandbend(['mott-schottky', file, '--permittivity', String(EPS_R), '--temperature', String(T), '--json']);
    expect(r.code, show(r)).toBe(0);
    const fit = JSON.parse(r.stdout) as { points: number; dopantDensity_cm3: number };
    expect(fit.points).toBe(ROWS);
    expect(Math.abs(fit.dopantDensity_cm3 / ND_CM3 - 1)).toBeLessThan(1e-6);
  });
});

describe('user text on a terminal and in Markdown', () => {
  it('terminal: ESC sequences (colour, clear screen, window title), BEL, C1 and bidi controls are removed', () => {
    expect(stripControl('\u001b[31mPt\u001b[0m\u0007 on \u001b[2J\u001b]0;pwned\u0007ZnO')).toBe('Pt on ZnO');
    expect(stripControl('a\u009b31mb\u0085c\u007fd')).toBe('abcd');
    expect(stripControl('abc\u202edcba')).toBe('abcdcba'); // right-to-left override (CVE-2021-42574, "Trojan Source")
    expect(stripControl('line1\r\nline2\tend')).toBe('line1 line2 end');
    expect(stripTerminalControl('line1\r\nline2\rline3\u2028x\u001b[1m', true)).toBe('line1\nline2\nline3\nx');
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 80 }), fc.boolean(), (text, keep) => {
        // eslint-disable-next-line no-control-regex
        expect(stripTerminalControl(text, keep)).not.toMatch(keep ? /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/ : /[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/);
      }),
      { numRuns: 1000 },
    );
  });

  // A CommonMark renderer (markdown-it 15, with raw HTML allowed and bare URLs linkified: the most permissive
  // settings) is the reference: escaped user text must come back as the same literal text in one paragraph.
  const md = new MarkdownIt({ html: true, linkify: true });
  const decode = (html: string): string =>
    html.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
  function expectLiteral(text: string): void {
    const html = md.render(escapeMarkdownText(text));
    const expected = stripControl(text).trim();
    if (expected === '') return;
    const m = /^<p>([\s\S]*)<\/p>\n$/.exec(html);
    expect(m, `${JSON.stringify(text)} rendered as ${html}`).not.toBeNull();
    expect(m![1], html).not.toMatch(/<[a-z]/i); // no element inside: no link, image, emphasis, code, HTML
    expect(decode(m![1]!).replace(/ +/g, ' '), html).toBe(expected.replace(/ +/g, ' '));
  }

  it.each([
    '[x](javascript:alert(1))',
    '![img](http://tracker.example/pixel.png)',
    '[ref]: javascript:alert(1)',
    '<img src=x onerror=alert(1)>',
    '<script>alert(1)</script>',
    'see https://tracker.example and www.tracker.example and //tracker.example',
    'mail me: someone@mail.example',
    '<https://tracker.example>',
    '*bold* _it_ `code` ~~gone~~ a_b_c',
    '# heading',
    '- item',
    '+ item',
    '1. first',
    '---',
    '> quote',
    'back\\slash \\[x](y)',
    '&amp; &#x3C;script&#x3E;',
    'Pt | ZnO',
  ])('Markdown: %j stays literal text', (text) => {
    expectLiteral(text);
  });

  it('Markdown: any string over a Markdown-heavy alphabet stays literal text (property)', () => {
    const alphabet = '[]()!<>`*_~#-+=.:/@&;|\\ ahjtwx1\n\u001b'.split('');
    fc.assert(
      fc.property(fc.string({ unit: fc.constantFrom(...alphabet), maxLength: 40 }), (text) => expectLiteral(text)),
      { numRuns: 1500 },
    );
  });

  it('Markdown table cell: a pipe or a link in user text stays inside its cell', () => {
    const cell = escapeMarkdownCell('a | b [x](javascript:alert(1)) ![i](http://t.example/p.png)');
    const html = md.render(`| name | note |\n| --- | --- |\n| Pt | ${cell} |\n`);
    expect(html.match(/<td>/g)).toHaveLength(2);
    expect(html).not.toMatch(/<a |<img /);
  });
});
