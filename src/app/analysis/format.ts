/**
 * Number formatting for result panels and chart labels. Four significant digits keep ANOVA tables
 * readable while still showing the size of small mean squares; p-values follow the engine's rule that
 * anything below 1e-16 is reported as a bound, because double precision cannot resolve it further.
 */

/** A finite number to `digits` significant digits without exponent noise for ordinary magnitudes. */
export function formatNumber(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const abs = Math.abs(value);
  if (abs >= 1e6 || abs < 1e-4) return value.toExponential(digits - 1);
  return Number(value.toPrecision(digits)).toString();
}

/** p-value as shown everywhere in the app: "< 1e-16", "< 0.0001", or three significant digits. */
export function formatP(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return '—';
  if (p < 1e-16) return '< 1e-16';
  if (p < 1e-4) return '< 0.0001';
  return Number(p.toPrecision(3)).toString();
}

/** "p = 0.0123" or "p < 0.0001", for captions and sentences. */
export function pPhrase(p: number | null | undefined): string {
  const text = formatP(p);
  return text.startsWith('<') ? `p ${text}` : `p = ${text}`;
}

/** A date from epoch milliseconds in the reader's locale, day and time. */
export function formatWhen(epochMs: number | null | undefined): string {
  if (epochMs === null || epochMs === undefined) return '—';
  return new Date(epochMs).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });
}
