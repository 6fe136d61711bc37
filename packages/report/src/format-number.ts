/**
 * Number formatting for tables: fixed decimals, a true minus sign, an en dash for a missing
 * value (null, NaN, ±Infinity). Locale-independent, so the same data gives the same page.
 */
export const MISSING = '–';

export function formatFixed(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return MISSING;
  const text = value.toFixed(decimals);
  // -0.0 reads as 0.0
  if (/^-0(\.0+)?$/.test(text)) return text.slice(1);
  return text.startsWith('-') ? `−${text.slice(1)}` : text;
}

/** A fraction as percent with the given decimals (0.0412 → "4.1 %"). */
export function formatPercent(fraction: number | null | undefined, decimals = 1): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return MISSING;
  return `${formatFixed(fraction * 100, decimals)} %`;
}

/** Significant digits, for p-values and statistics of unknown scale. */
export function formatSignificant(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return MISSING;
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude < 1e-3 || magnitude >= 1e6) {
    const [mantissa, exponent] = value.toExponential(digits - 1).split('e');
    return `${formatFixed(Number(mantissa), digits - 1)}×10^${Number(exponent)}`;
  }
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(magnitude)));
  return formatFixed(value, decimals);
}

/** Shortest text of the value to at most `digits` significant digits (830, 0.008, 8.4, 1.2×10^-5). */
export function formatShort(value: number | null | undefined, digits = 6): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return MISSING;
  const magnitude = Math.abs(value);
  if (magnitude !== 0 && (magnitude < 1e-4 || magnitude >= 1e9)) return formatSignificant(value, Math.min(digits, 4));
  const text = String(Number(value.toPrecision(digits)));
  return text.startsWith('-') ? `−${text.slice(1)}` : text;
}

export function formatInteger(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return MISSING;
  return formatFixed(Math.round(value), 0);
}
