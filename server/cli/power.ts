/**
 * Command line: power of the one-way ANOVA F test for a planned study.
 *
 *   npm run --silent power -- --groups K --replicates N --effect-f F [--alpha 0.05]
 *
 * prints one JSON object `{"power": …}` to stdout. K groups of N runs each, Cohen's f = F, level alpha.
 * Bad or missing arguments: a message on stderr and exit code 2.
 */
import { parseArgs } from 'node:util';
import { StatsInputError } from '../stats/errors.js';
import { oneWayPower } from '../stats/power.js';

/** Thrown for command-line mistakes (unknown option, missing value, not a number). */
class UsageError extends Error {}

const USAGE = 'usage: power --groups K --replicates N --effect-f F [--alpha 0.05]';

function numberOption(values: Record<string, string | undefined>, name: string, fallback?: number): number {
  const raw = values[name];
  if (raw === undefined) {
    if (fallback !== undefined) return fallback;
    throw new UsageError(`missing --${name}\n${USAGE}`);
  }
  // Number('') is 0 and Number(' 3 ') is 3: insist on a plain decimal so typos are caught.
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(raw.trim())) {
    throw new UsageError(`--${name} must be a number, got "${raw}"`);
  }
  return Number(raw);
}

/**
 * Parse arguments and compute the power; returns the JSON text to print.
 * @throws UsageError or StatsInputError with a message naming the bad value
 */
function runPowerCli(argv: string[]): string {
  let values: Record<string, string | undefined>;
  try {
    ({ values } = parseArgs({
      args: argv,
      options: {
        groups: { type: 'string' },
        replicates: { type: 'string' },
        'effect-f': { type: 'string' },
        alpha: { type: 'string' },
      },
      strict: true,
      allowPositionals: false,
    }));
  } catch (err) {
    // Expected: node's parseArgs rejects unknown options and options without a value.
    throw new UsageError(`${(err as Error).message}\n${USAGE}`);
  }
  const groups = numberOption(values, 'groups');
  const replicates = numberOption(values, 'replicates');
  const f = numberOption(values, 'effect-f');
  const alpha = numberOption(values, 'alpha', 0.05);
  return JSON.stringify({ power: oneWayPower(groups, replicates, f, alpha) });
}

function main(): void {
  try {
    process.stdout.write(`${runPowerCli(process.argv.slice(2))}\n`);
  } catch (err) {
    // Expected: usage mistakes and bad values; anything else is a bug and keeps its stack trace.
    if (err instanceof UsageError || err instanceof StatsInputError) {
      process.stderr.write(`power: ${err.message}\n`);
      process.exitCode = 2;
      return;
    }
    throw err;
  }
}

main();
