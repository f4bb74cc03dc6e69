// Number formatting for every text output (terminal, Markdown, HTML, CSV-free tables): one place, one style.

/**
 * Format a number with `sig` significant digits: plain notation for 1e-3 <= |v| < 1e5, otherwise
 * exponential ("1.23e18"). null/undefined give "n/a"; NaN and infinities are spelled out.
 */
export function formatNumber(value: number | null | undefined, sig = 3): string {
  if (value === null || value === undefined) return 'n/a';
  if (Number.isNaN(value)) return 'NaN';
  if (!Number.isFinite(value)) return value > 0 ? 'inf' : '-inf';
  if (value === 0) return '0';
  const abs = Math.abs(value);
  if (abs >= 1e5 || abs < 1e-3) {
    const [mantissa = '', exponent = ''] = value.toExponential(Math.max(0, sig - 1)).split('e');
    const trimmed = mantissa.includes('.') ? mantissa.replace(/0+$/, '').replace(/\.$/, '') : mantissa;
    return `${trimmed}e${exponent.replace('+', '')}`;
  }
  return String(Number(value.toPrecision(sig)));
}

/** Like formatNumber but with an explicit sign for positive values ("+0.42"). */
export function formatSigned(value: number | null | undefined, sig = 3): string {
  const text = formatNumber(value, sig);
  return value !== null && value !== undefined && value > 0 ? `+${text}` : text;
}

/** Number with a unit, or "n/a" without the unit. */
export function formatQuantity(value: number | null | undefined, unit: string, sig = 3): string {
  const text = formatNumber(value, sig);
  return text === 'n/a' || unit === '' ? text : `${text} ${unit}`;
}

/**
 * A quantity that may underflow or overflow a double, given with its log10: the plain value when it
 * is a positive finite number, otherwise "10^<log10>".
 */
export function formatLogQuantity(value: number | null, log10: number, unit: string, sig = 3): string {
  if (value !== null && Number.isFinite(value) && value > 0) return formatQuantity(value, unit, sig);
  if (!Number.isFinite(log10)) return formatQuantity(value, unit, sig);
  return `10^${formatNumber(log10, sig)}${unit ? ` ${unit}` : ''}`;
}

/** Fixed significant digits as JavaScript writes them ("12.0", "1.00e+12"); null -> "". For tables. */
export function formatPrecision(value: number | null, sig: number): string {
  return value === null ? '' : value.toPrecision(sig);
}

/** Table cell: plain for 1e-3 <= |v| < 1e4, exponential otherwise; null -> "". */
export function formatTableNumber(value: number | null, sig: number): string {
  if (value === null) return '';
  return Math.abs(value) >= 1e4 || (Math.abs(value) < 1e-3 && value !== 0) ? value.toExponential(sig - 1) : value.toPrecision(sig);
}
