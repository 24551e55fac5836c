/**
 * Command line for scripted batches: the same engine as the API.
 *
 *   npm run --silent analyze -- <file.csv> --response <column> [--factors A,B,...]
 *       [--terms A,B,A:B,...] [--ss 1|2|3] [--tests tukey,welch,levene,brown-forsythe,bartlett,kruskal,shapiro]
 *
 * Reads a CSV with a header row; factor columns are categorical whatever they look like; the response
 * is read as exact decimals. Default terms: all main effects and interactions of the factors; default
 * SS type 2. Prints one JSON object on stdout:
 *   {"anova":[{source,df,ss,ms,f,p},...,{"source":"Residual",df,ss,ms}],"notes":[...],"tests":{...}}
 * On any error: the message on stderr and exit code 2.
 */
import fs from 'node:fs';
import { parseArgs } from 'node:util';
import Papa from 'papaparse';
import type { AnalysisRow } from '../stats/analysis-input.js';
import { analyse } from '../stats/analyse.js';
import { StatsInputError } from '../stats/errors.js';
import type { AnalysisTests, SsType } from '../stats/types.js';

const USAGE =
  'usage: analyze <file.csv> --response <column> [--factors A,B] [--terms A,B,A:B] [--ss 1|2|3] [--tests tukey,welch,levene,brown-forsythe,bartlett,kruskal,shapiro]';

function list(value: string | undefined): string[] | undefined {
  if (value === undefined) return undefined;
  return value
    .split(',')
    .map((s) => s.trim())
    .filter((s) => s.length > 0);
}

function readCsv(file: string): Record<string, string>[] {
  const text = fs.readFileSync(file, 'utf8');
  const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: 'greedy', dynamicTyping: false });
  const err = parsed.errors[0];
  if (err) throw new StatsInputError(`${file}: CSV error at data row ${(err.row ?? 0) + 1}: ${err.message}`, err.row);
  return parsed.data;
}

/** The CLI's output contract: exactly these keys, in this order. */
function shapeTests(t: AnalysisTests): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  if (t.tukey) out.tukey = t.tukey.map(({ a, b, diff, lower, upper, p }) => ({ a, b, diff, lower, upper, p }));
  if (t.welch) out.welch = { f: t.welch.f, df1: t.welch.df1, df2: t.welch.df2, p: t.welch.p };
  if (t.levene) out.levene = { f: t.levene.f, df1: t.levene.df1, df2: t.levene.df2, p: t.levene.p };
  if (t.brownForsythe) {
    const b = t.brownForsythe;
    out.brownForsythe = { f: b.f, df1: b.df1, df2: b.df2, p: b.p };
  }
  if (t.bartlett) out.bartlett = { statistic: t.bartlett.statistic, df: t.bartlett.df, p: t.bartlett.p };
  if (t.kruskal) out.kruskal = { statistic: t.kruskal.statistic, df: t.kruskal.df, p: t.kruskal.p };
  if (t.shapiro) out.shapiro = { w: t.shapiro.w, p: t.shapiro.p };
  return out;
}

function runAnalyzeCli(argv: string[]): string {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    strict: true,
    options: {
      response: { type: 'string' },
      factors: { type: 'string' },
      terms: { type: 'string' },
      ss: { type: 'string' },
      tests: { type: 'string' },
    },
  });
  if (positionals.length !== 1) throw new StatsInputError(`expected exactly one CSV file, got ${positionals.length}. ${USAGE}`, positionals);
  if (!values.response) throw new StatsInputError(`--response is required. ${USAGE}`, 'response');
  const ssText = values.ss ?? '2';
  if (!['1', '2', '3'].includes(ssText)) throw new StatsInputError(`--ss must be 1, 2 or 3, got '${ssText}'`, ssText);
  const file = positionals[0];
  const records = readCsv(file);
  const response = values.response;
  const factors = list(values.factors) ?? [];
  const columns = new Set(Object.keys(records[0] ?? {}));
  for (const col of [response, ...factors]) {
    if (!columns.has(col)) throw new StatsInputError(`column '${col}' is not in ${file} (columns: ${[...columns].join(', ')})`, col);
  }
  const rows: AnalysisRow[] = records.map((r) => ({
    factors: Object.fromEntries(factors.map((f) => [f, r[f]])),
    value: r[response] ?? '',
  }));
  const result = analyse({
    rows,
    response,
    factors,
    terms: list(values.terms),
    ssType: Number(ssText) as SsType,
    tests: list(values.tests) ?? [],
  });
  const anova = result.anova.map((row) =>
    'f' in row
      ? { source: row.source, df: row.df, ss: row.ss, ms: row.ms, f: row.f, p: row.p }
      : { source: row.source, df: row.df, ss: row.ss, ms: row.ms },
  );
  return JSON.stringify({ anova, notes: [...result.notes, ...result.cautions], tests: shapeTests(result.tests) });
}

function main(): void {
  try {
    process.stdout.write(`${runAnalyzeCli(process.argv.slice(2))}\n`);
  } catch (err) {
    // Expected: bad arguments, an unreadable file, bad CSV or bad data (StatsInputError and node's
    // argument/file errors). The contract is one line on stderr and exit code 2, whatever the cause.
    process.stderr.write(`analyze: ${err instanceof Error ? err.message : String(err)}\n`);
    process.exitCode = 2;
  }
}

main();
