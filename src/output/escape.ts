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
 * Escape text for one Markdown table cell: HTML-significant characters become entities (Markdown
 * renderers pass raw HTML through), pipes and backslashes are backslash-escaped, line breaks become spaces.
 */
export function escapeMarkdownCell(value: unknown): string {
  return escapeMarkdownText(value).replace(/\|/g, '\\|');
}

/** Escape free Markdown text (headings, list items): HTML-significant characters and line breaks. */
export function escapeMarkdownText(value: unknown): string {
  const text = value === null || value === undefined ? '' : String(value);
  return stripControl(text)
    .replace(/\\/g, '\\\\')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/\r?\n|\r/g, ' ');
}

/**
 * Remove C0/C1 control characters (including ESC, so user text cannot inject terminal escape
 * sequences); tabs and line breaks become single spaces.
 */
export function stripControl(value: unknown): string {
  const text = value === null || value === undefined ? '' : String(value);
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\t\n\r]/g, ' ').replace(/[\u0000-\u001f\u007f-\u009f]/g, '');
}

/** A safe file base name: letters, digits, dot, dash, underscore; must not start with a dot. */
export function isSafeBaseName(name: string): boolean {
  return /^[A-Za-z0-9_-][A-Za-z0-9._-]{0,120}$/.test(name);
}

/** Lines for the terminal: control characters stripped from each, joined with newlines, ending in one. */
export function terminalLines(lines: readonly string[]): string {
  return `${lines.map(stripControl).join('\n')}\n`;
}
