import { CalcInputError } from './errors';

/*
 * Argument checks shared by the calculator functions. Each one throws CalcInputError with a
 * message naming the field and its value, because a bare NaN deep inside a formula would
 * otherwise surface as a meaningless angle on screen.
 */

/**
 * Require a finite number.
 * @param value the value to check
 * @param name field name used in the message
 * @returns the value, typed as number
 * @throws {CalcInputError} if value is not a finite number
 * @example requireFinite(0.5, 'H') // 0.5
 */
export function requireFinite(value: unknown, name: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new CalcInputError(`${name} = ${String(value)} is not a finite number`, { field: name, value });
  }
  return value;
}

/**
 * Require a finite number strictly greater than zero.
 * @param value the value to check
 * @param name field name used in the message
 * @param meaning what a positive value stands for physically, appended to the message
 * @returns the value
 * @throws {CalcInputError} if value is not finite or not > 0
 * @example requirePositive(1.8, 'r0', 'a Lankford coefficient') // 1.8
 */
export function requirePositive(value: unknown, name: string, meaning = ''): number {
  const v = requireFinite(value, name);
  if (!(v > 0)) {
    const why = meaning ? ` (${meaning} must be > 0)` : ' (must be > 0)';
    throw new CalcInputError(`${name} = ${v} is not admissible${why}`, { field: name, value: v });
  }
  return v;
}

/**
 * Require an angle in degrees strictly inside an open interval.
 * @param value the angle in degrees
 * @param name field name used in the message
 * @param lo lower bound (exclusive), degrees
 * @param hi upper bound (exclusive), degrees
 * @param meaning why the interval is the admissible one
 * @returns the angle
 * @throws {CalcInputError} if the angle is not finite or outside (lo, hi)
 * @example requireAngleIn(54.7, 'neckAngleDeg', 0, 180, 'a neck line') // 54.7
 */
export function requireAngleIn(value: unknown, name: string, lo: number, hi: number, meaning: string): number {
  const v = requireFinite(value, name);
  if (!(v > lo && v < hi)) {
    throw new CalcInputError(`${name} = ${v}° is outside (${lo}°, ${hi}°): ${meaning}`, { field: name, value: v });
  }
  return v;
}

/**
 * Require a whole number not below a minimum.
 * @param value the value
 * @param name field name used in the message
 * @param min smallest admissible value
 * @returns the value
 * @throws {CalcInputError} if not an integer >= min
 * @example requireInteger(5, 'smoothingWindow', 1) // 5
 */
export function requireInteger(value: unknown, name: string, min: number): number {
  const v = requireFinite(value, name);
  if (!Number.isInteger(v) || v < min) {
    throw new CalcInputError(`${name} = ${v} must be a whole number >= ${min}`, { field: name, value: v });
  }
  return v;
}

/** Degrees to radians. */
export const toRad = (deg: number): number => (deg * Math.PI) / 180;
/** Radians to degrees. */
export const toDeg = (rad: number): number => (rad * 180) / Math.PI;
