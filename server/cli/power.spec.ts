import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';

// Spawned the way a user runs it: `npm run --silent power -- ...` (package.json script -> tsx).
function runCli(args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync('npm', ['run', '--silent', 'power', '--', ...args], { encoding: 'utf8', cwd: process.cwd() });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('power command line', () => {
  it('prints {"power": …} matching the high-precision reference', () => {
    const r = runCli(['--groups', '3', '--replicates', '10', '--effect-f', '0.25']);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout) as { power: number };
    expect(Object.keys(out)).toEqual(['power']);
    // mpmath powerHighPrecision, k = 3, n = 10, f = 0.25 (shared/reference/r-datasets/power-oneway.json)
    expect(Math.abs(out.power - 0.1951400680194053) / 0.1951400680194053).toBeLessThan(1e-12);
  });

  it('honours --alpha', () => {
    const r = runCli(['--groups', '2', '--replicates', '20', '--effect-f', '0.4', '--alpha', '0.01']);
    expect(r.status).toBe(0);
    const at05 = JSON.parse(runCli(['--groups', '2', '--replicates', '20', '--effect-f', '0.4']).stdout) as { power: number };
    // mpmath, k = 2, n = 20, f = 0.4, alpha 0.05 (power-oneway.json); a stricter alpha must lower it
    expect(Math.abs(at05.power - 0.6934041966153822)).toBeLessThan(1e-12);
    expect((JSON.parse(r.stdout) as { power: number }).power).toBeLessThan(at05.power);
  });

  it('writes errors to stderr with exit code 2', () => {
    for (const args of [
      ['--groups', '3', '--replicates', 'ten', '--effect-f', '0.25'],
      ['--groups', '3', '--effect-f', '0.25'],
      ['--groups', '1', '--replicates', '5', '--effect-f', '0.25'],
      ['--groups', '3', '--replicates', '5', '--effect-f', '0.25', '--colour', 'red'],
    ]) {
      const r = runCli(args);
      expect(r.status).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(/^power: /);
    }
    expect(runCli(['--groups', '3', '--replicates', 'ten', '--effect-f', '0.25']).stderr).toMatch(/"ten"/);
  });
});
