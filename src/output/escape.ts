// Escaping for every place user-provided text (sample names, notes, citations, titles) ends up:
// HTML/SVG text and attributes, Markdown table cells, and the terminal.

const HTML_ENTITIES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
  '`': '&#96;',
};

/** Escape text for HTML element content and (quoted) attribute values. Non-strings are stringified first. */
export function escapeHtml(value: unknown): string {
  const text = value === null || value === undefined ? '' : String(value);
  return text.replace(/[&<>"'`]/g, (ch) => HTML_ENTITIES[ch] ?? ch);
}

/**
 * Escape text for one Markdown table cell: everything escapeMarkdownText does except the line-start rules (a cell
 * never starts a block), pipes included.
 */
export function escapeMarkdownCell(value: unknown): string {
  return escapeMarkdownInline(value);
}

/**
 * Escape user text for Markdown (headings, list items, paragraphs) so that it renders as the same literal text:
 * no HTML (entities for & < >), no links or images ([ ] escaped, so "[x](javascript:...)" and "![img](http://...)"
 * stay text), no bare-URL autolinks ("://", "//", "www." and "@" escaped), no emphasis, code or strike-through, no table
 * cell breaks, and no block markers at the start (#, -, +, *, "1." followed by a space, "---"). Control characters and
 * terminal escape sequences are removed; line breaks become spaces. Backslash escapes of ASCII punctuation are
 * CommonMark (spec 0.31, section 2.4); GitHub-flavoured autolinks are those of the GFM spec, section 6.9.
 */
export function escapeMarkdownText(value: unknown): string {
  return escapeMarkdownInline(value)
    .replace(/^\s+/, '') // up to 3 leading spaces still start a block, 4 start a code block
    .replace(/^(#{1,6}|[-+*]|\d{1,9}[.)])(?= |$)/, (marker) => (/\d/.test(marker) ? marker.replace(/[.)]$/, '\\$&') : `\\${marker}`))
    .replace(/^-(?= *-)/, '\\-'); // "---": a thematic break
}

function escapeMarkdownInline(value: unknown): string {
  const text = stripControl(value === null || value === undefined ? '' : String(value));
  return text
    .replace(/[\\`*[\]~|]/g, '\\$&')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/(?<![A-Za-z0-9])_|_(?![A-Za-z0-9])/g, '\\_')
    .replace(/:(?=\/\/)/g, '\\:')
    .replace(/\/(?=\/)/g, '\\/')
    .replace(/\b(www)\./gi, '$1\\.')
    .replace(/@/g, '\\@');
}

/** ANSI/ECMA-48 escape sequences: CSI (ESC [ or 0x9B) ... final byte, OSC (ESC ]) ... BEL or ST, and two-byte ESC x. */
// eslint-disable-next-line no-control-regex
const ESCAPE_SEQUENCES = /(?:\u001b\[|\u009b)[0-?]*[ -/]*[@-~]|\u001b\][^\u0007\u001b]*(?:\u0007|\u001b\\)?|\u001b[ -~]/g;
/** Bidirectional overrides and isolates (they reorder what the reader sees: "Trojan Source", CVE-2021-42574). */
const BIDI_CONTROLS = /[\u202a-\u202e\u2066-\u2069\u200e\u200f\u061c]/g;

/**
 * Text safe to print on a terminal: escape sequences (colours, cursor moves, window titles) removed whole, other
 * C0/C1 control characters, DEL and bidirectional controls removed, tabs and line breaks (also U+2028/U+2029)
 * become single spaces unless keepNewlines, when LF is kept and CR LF / CR become LF.
 */
export function stripTerminalControl(value: unknown, keepNewlines = false): string {
  let text = value === null || value === undefined ? '' : String(value);
  text = text.replace(ESCAPE_SEQUENCES, '').replace(BIDI_CONTROLS, '');
  text = keepNewlines ? text.replace(/\r\n?|[\u2028\u2029]/g, '\n').replace(/\t/g, ' ') : text.replace(/\r\n|[\t\n\r\u2028\u2029]/g, ' ');
  // eslint-disable-next-line no-control-regex
  return keepNewlines ? text.replace(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/g, '') : text.replace(/[\u0000-\u001f\u007f-\u009f]/g, '');
}

/**
 * Remove C0/C1 control characters (including whole ESC sequences, so user text cannot inject terminal escape
 * sequences) and bidirectional controls; tabs and line breaks become single spaces.
 */
export function stripControl(value: unknown): string {
  return stripTerminalControl(value, false);
}

/** A safe file base name: letters, digits, dot, dash, underscore; must not start with a dot. */
export function isSafeBaseName(name: string): boolean {
  return /^[A-Za-z0-9_-][A-Za-z0-9._-]{0,120}$/.test(name);
}

/** Lines for the terminal: control characters stripped from each, joined with newlines, ending in one. */
export function terminalLines(lines: readonly string[]): string {
  return `${lines.map(stripControl).join('\n')}\n`;
}
