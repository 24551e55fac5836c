/**
 * Exact reading of decimal responses (CSV cells, typed values).
 *
 * The problem: values such as 1000000000000.4 have about 16 significant digits; the nearest double
 * is off by up to 6e-5 in the last place that matters, and the spread between runs (0.1) lives in
 * exactly those digits. NIST StRD SmLs07-09 shows that a double-based ANOVA then has ~4 correct
 * digits at best, however careful its arithmetic (shared/reference/README.md).
 *
 * The remedy: subtract a common decimal offset while the numbers are still decimal strings, with
 * exact integer (BigInt) arithmetic, and only then round the small differences to doubles. The
 * offset is the first value of the column. This is legitimate because every quantity of an ANOVA
 * (sums of squares, mean squares, F, p, residuals, SDs) is invariant under adding a constant to all
 * responses; only location statistics (means, fitted values, CI limits, min/max) need the offset added
 * back, and those are reported to double precision anyway.
 */
import { StatsInputError } from './errors.js';

/** Responses shifted by an exact decimal offset: value_i = offset + shifted[i] (up to one rounding). */
export interface ShiftedValues {
  /** the responses minus the offset, each rounded once to the nearest double */
  shifted: Float64Array;
  /** the offset as a double (for adding back to means and fitted values) */
  offset: number;
  /** the offset exactly as read */
  offsetText: string;
}

interface Decimal {
  /** signed integer mantissa */
  mantissa: bigint;
  /** power of ten: value = mantissa * 10^exponent */
  exponent: number;
}

const DECIMAL = /^([+-])?(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/;

/** Past this spread of decimal exponents the offset cannot help and BigInts would grow needlessly. */
const MAX_EXPONENT_SPREAD = 60;

/**
 * Parse one decimal string exactly.
 * @throws StatsInputError naming the text when it is not a finite decimal number
 */
export function parseDecimal(text: string, where = 'value'): Decimal {
  const t = text.trim();
  const m = DECIMAL.exec(t);
  const intPart = m?.[2] ?? '';
  const fracPart = m?.[3] ?? '';
  if (!m || intPart.length + fracPart.length === 0) {
    throw new StatsInputError(`${where}: '${text}' is not a finite decimal number`, text);
  }
  const exp10 = m[4] ? Number(m[4]) : 0;
  const digits = BigInt((intPart + fracPart).replace(/^0+(?=\d)/, ''));
  return { mantissa: m[1] === '-' ? -digits : digits, exponent: exp10 - fracPart.length };
}

function decimalToNumber(d: Decimal): number {
  // The string round trip is correctly rounded: exactly one rounding from the exact decimal.
  return Number(`${d.mantissa}e${d.exponent}`);
}

/**
 * Read decimal responses exactly relative to the first one.
 * @param values decimal strings or numbers; numbers are taken as their shortest round-trip decimal,
 *   which is what a person typed for any double that came from text
 * @param label how to name a value in error messages, given its index (default "run i")
 * @returns shifted doubles, the offset, and its text
 * @throws StatsInputError naming a value that is not a finite decimal (NaN, Infinity, '', 'abc')
 * @example readDecimalResponses(['1000000000000.4', '1000000000000.3']).shifted // [0, -0.1]
 */
export function readDecimalResponses(
  values: ReadonlyArray<string | number>,
  label: (i: number) => string = (i) => `run ${i + 1}`,
): ShiftedValues {
  if (values.length === 0) throw new StatsInputError('no response values', values.length);
  const parsed: Decimal[] = values.map((v, i) => {
    if (typeof v === 'number') {
      if (!Number.isFinite(v)) throw new StatsInputError(`${label(i)}: response ${v} is not a finite number`, v);
      return parseDecimal(String(v), label(i));
    }
    return parseDecimal(v, label(i));
  });
  let minExp = Infinity;
  let maxExp = -Infinity;
  for (const d of parsed) {
    if (d.mantissa === 0n) continue;
    minExp = Math.min(minExp, d.exponent);
    maxExp = Math.max(maxExp, d.exponent);
  }
  const offsetText = String(values[0]).trim();
  const shifted = new Float64Array(parsed.length);
  if (!Number.isFinite(minExp) || maxExp - minExp > MAX_EXPONENT_SPREAD) {
    // all zero, or magnitudes so far apart that the offset carries no shared digits: plain doubles
    parsed.forEach((d, i) => (shifted[i] = decimalToNumber(d)));
    return { shifted, offset: 0, offsetText: '0' };
  }
  const scaled = (d: Decimal): bigint => (d.mantissa === 0n ? 0n : d.mantissa * 10n ** BigInt(d.exponent - minExp));
  const base = scaled(parsed[0]);
  parsed.forEach((d, i) => {
    shifted[i] = decimalToNumber({ mantissa: scaled(d) - base, exponent: minExp });
  });
  return { shifted, offset: decimalToNumber(parsed[0]), offsetText };
}

/**
 * Below this ratio of magnitude to spread, doubles lose less than ~3 digits to shared leading digits
 * and are used as they are (rounding error relative to the spread < 1e3 * 2.2e-16).
 */
const SHARED_DIGITS_RATIO = 1e3;

/**
 * Responses as the engine analyses them: strings are always read exactly; numbers are read exactly,
 * as their shortest round-trip decimal, only when they share leading digits (|max| / spread >= 1e3),
 * because then the binary rounding of the inputs (not the arithmetic) would limit the accuracy — a
 * double such as 1000000.4 almost always stands for the decimal someone typed. Otherwise numbers are
 * used unchanged (no cost for ordinary data).
 * @throws StatsInputError naming a value that is not a finite decimal number
 */
export function readResponses(
  values: ReadonlyArray<string | number>,
  label: (i: number) => string = (i) => `run ${i + 1}`,
): ShiftedValues {
  if (values.length === 0) throw new StatsInputError('no response values', values.length);
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== 'number') return readDecimalResponses(values, label);
    if (!Number.isFinite(v)) throw new StatsInputError(`${label(i)}: response ${v} is not a finite number`, v);
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const spread = max - min;
  if (spread > 0 && Math.max(Math.abs(min), Math.abs(max)) >= SHARED_DIGITS_RATIO * spread) {
    return readDecimalResponses(values, label);
  }
  return { shifted: Float64Array.from(values as ReadonlyArray<number>), offset: 0, offsetText: '0' };
}
