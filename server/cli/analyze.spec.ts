import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

// End-to-end: spawn the command line on CSV files written from the reference data.
interface RRef {
  data: { rows: (string | number)[][] };
  twoWay: { table: { term: string; df: number; ss: number; f: number | null; p: number | null }[] };
  welchOneWayTension: { f: number; df2: number; p: number };
  kruskalTension: { statistic: number; p: number };
  tukeyHSDTension: { comparisons: { comparison: string; diff: number; pAdj: number }[] };
}
const ref = JSON.parse(
  fs.readFileSync(path.resolve(process.cwd(), '../shared/reference/r-datasets/warpbreaks.json'), 'utf8'),
) as RRef;

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'analyze-cli-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const csv = path.join(dir, 'warpbreaks.csv');
fs.writeFileSync(csv, ['breaks,wool,tension', ...ref.data.rows.map((r) => r.join(','))].join('\n'));

function run(args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/analyze.ts', ...args], { encoding: 'utf8' });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

const rel = (x: number, y: number): number => Math.abs(x - y) / Math.abs(y);

describe('analyze command line', () => {
  it('prints the two-way table of warpbreaks as R computes it', () => {
    // R 4.2.2 summary(aov(breaks ~ wool * tension)) (shared/reference/r-datasets/warpbreaks.json twoWay)
    const out = run([csv, '--response', 'breaks', '--factors', 'wool,tension']);
    expect(out.status).toBe(0);
    const json = JSON.parse(out.stdout) as { anova: Record<string, number | string>[]; notes: string[]; tests: object };
    expect(Object.keys(json)).toEqual(['anova', 'notes', 'tests']);
    expect(json.anova.map((r) => r.source)).toEqual(['wool', 'tension', 'wool:tension', 'Residual']);
    expect(Object.keys(json.anova[0])).toEqual(['source', 'df', 'ss', 'ms', 'f', 'p']);
    expect(Object.keys(json.anova[3])).toEqual(['source', 'df', 'ss', 'ms']);
    ref.twoWay.table.forEach((r, i) => {
      expect(json.anova[i].df).toBe(r.df);
      expect(rel(json.anova[i].ss as number, r.ss)).toBeLessThan(1e-11);
      if (r.p !== null) expect(rel(json.anova[i].p as number, r.p)).toBeLessThan(1e-11);
    });
    expect(json.tests).toEqual({});
  });

  it('runs one-factor tests over the cells of the given factor', () => {
    // R 4.2.2 oneway.test, kruskal.test and TukeyHSD on breaks ~ tension (warpbreaks.json)
    const out = run([csv, '--response', 'breaks', '--factors', 'tension', '--tests', 'welch,kruskal,tukey', '--ss', '1']);
    expect(out.status).toBe(0);
    const { tests } = JSON.parse(out.stdout) as {
      tests: { welch: { f: number; df2: number; p: number }; kruskal: { statistic: number; p: number }; tukey: { a: string; b: string; diff: number; p: number }[] };
    };
    expect(rel(tests.welch.f, ref.welchOneWayTension.f)).toBeLessThan(1e-11);
    expect(rel(tests.welch.p, ref.welchOneWayTension.p)).toBeLessThan(1e-11);
    expect(rel(tests.kruskal.statistic, ref.kruskalTension.statistic)).toBeLessThan(1e-11);
    const ml = tests.tukey.find((t) => t.a === 'L' && t.b === 'M');
    expect(ml && rel(ml.diff, ref.tukeyHSDTension.comparisons[0].diff)).toBeLessThan(1e-12);
    expect(Object.keys(tests.tukey[0])).toEqual(['a', 'b', 'diff', 'lower', 'upper', 'p']);
  });

  it('fails with a message on stderr and exit code 2', () => {
    const missing = run([csv, '--response', 'weight', '--factors', 'wool']);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/column 'weight' is not in/);
    expect(missing.stdout).toBe('');
    const bad = path.join(dir, 'bad.csv');
    fs.writeFileSync(bad, 'y,g\n1.5,a\nx,a\n2,b\n3,b\n');
    const badValue = run([bad, '--response', 'y', '--factors', 'g']);
    expect(badValue.status).toBe(2);
    expect(badValue.stderr).toMatch(/row 2: 'x' is not a finite decimal number/);
    expect(run([csv, '--response', 'breaks', '--ss', '4']).status).toBe(2);
    expect(run(['--response', 'breaks']).status).toBe(2);
  });
});
