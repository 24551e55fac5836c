/**
 * Test-only loader for the external reference data in ../shared/reference (see its README): the
 * R data sets as coded factors, and the NIST StRD ANOVA files.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { CodedFactor } from './cell-stats.js';

export interface RTableRow {
  term: string;
  df: number | null;
  ss: number | null;
  ms?: number | null;
  f: number | null;
  p: number | null;
}

export interface RDataset {
  data: { columns: string[]; factorLevels?: Record<string, string[]>; rows: (string | number)[][] };
  [block: string]: unknown;
}

export function loadReference<T>(relative: string): T {
  return JSON.parse(fs.readFileSync(path.resolve(process.cwd(), '../shared/reference', relative), 'utf8')) as T;
}

/** Response and factors of an R data set; level order from factorLevels, else first appearance. */
export function coded(d: RDataset, factorNames: string[], response: string): { y: Float64Array; factors: CodedFactor[] } {
  const cols = d.data.columns;
  const ri = cols.indexOf(response);
  const y = Float64Array.from(d.data.rows.map((r) => Number(r[ri])));
  const factors = factorNames.map((name): CodedFactor => {
    const i = cols.indexOf(name);
    const levels = d.data.factorLevels?.[name] ?? [...new Set(d.data.rows.map((r) => String(r[i])))];
    return { name, levels, codes: Int32Array.from(d.data.rows.map((r) => levels.indexOf(String(r[i])))) };
  });
  return { y, factors };
}

export function relErr(x: number, ref: number): number {
  return ref === 0 ? Math.abs(x) : Math.abs(x - ref) / Math.abs(ref);
}

/** Log relative error (number of correct significant digits), capped at 15 when exact. */
export function lre(x: number, certified: number): number {
  if (x === certified) return 15;
  return Math.min(15, -Math.log10(Math.abs(x - certified) / Math.abs(certified)));
}

export interface NistSet {
  difficulty: 'lower' | 'average' | 'higher';
  groups: number[][];
  groupsAsPrinted: string[][];
  certified: { between: { df: number; ss: number; ms: number; f: number }; within: { df: number; ss: number; ms: number } };
  exactFromBinary64Inputs: { between: { ss: number; ms: number; f: number }; within: { ss: number; ms: number } };
}

export const NIST_SETS = ['SiRstv', 'SmLs01', 'SmLs02', 'SmLs03', 'SmLs04', 'SmLs05', 'SmLs06', 'SmLs07', 'SmLs08', 'SmLs09', 'AtmWtAg'];
