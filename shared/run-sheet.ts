/**
 * One run of the run sheet as the API sends it (GET /api/studies/:id/runs): read by the server's
 * run-sheet service and the client's grid alike.
 */

export interface CellValue {
  text: string;
  value: number;
}
export interface SheetValue extends CellValue {
  outOfRange: boolean;
}

export interface Run {
  id: number;
  code: string;
  standardOrder: number;
  runOrder: number;
  block: string;
  centrePoint: boolean;
  settings: Record<string, string>;
  measured: Record<string, CellValue>;
  values: Record<string, SheetValue>;
  outcomeId: number | null;
  outcomeReason: string;
  /** Not counted in the analysis: the outcome is marked not valid, or the run was removed. */
  excluded: boolean;
  operator: string;
  testedOn: string;
  notes: string;
  attachmentCount: number;
  removedAt: number | null;
  removedReason: string | null;
  version: number;
  updatedAt: number;
}

/**
 * The run sheet's runs in column layout (GET /api/studies/:id/runs?layout=columns), which the
 * grid asks for: one array per field instead of one object per run. Field names are sent once
 * instead of 10 000 times, so a 10 000-run sheet is ~5x smaller as JSON and ~2x smaller after Brotli.
 * `value` is not sent: the server stores Number(text) for every value (server/services/run-edits.ts),
 * so the client recomputes it; any value that differs is listed in `valueExceptions`.
 * `*Steps` columns are delta-coded (x[0] = steps[0], x[i] = x[i-1] + steps[i]): ids, run orders and
 * save times mostly climb by small steps, which pack far better than the numbers themselves (-17 %
 * after Brotli on a 10 000-run sheet).
 */
export interface RunColumns {
  layout: 'columns';
  count: number;
  idSteps: number[];
  code: string[];
  standardOrder: number[];
  runOrderSteps: number[];
  block: string[];
  centrePoint: (0 | 1)[];
  /** per factor symbol; null where a run has no setting for it */
  settings: Record<string, (string | null)[]>;
  measured: Record<string, (string | null)[]>;
  /** per response symbol: the text, and the indexes of the runs whose value is out of range */
  values: Record<string, { text: (string | null)[]; outOfRange: number[] }>;
  /** [kind, symbol, run index, value] where the stored number is not Number(text) */
  valueExceptions: ['measured' | 'values', string, number, number][];
  outcomeId: (number | null)[];
  outcomeReason: string[];
  excluded: (0 | 1)[];
  operator: string[];
  testedOn: string[];
  notes: string[];
  attachmentCount: number[];
  removedAt: (number | null)[];
  removedReason: (string | null)[];
  version: number[];
  updatedAtSteps: number[];
}

const PLAIN_KEYS = ['code', 'standardOrder', 'block', 'outcomeId', 'outcomeReason', 'operator', 'testedOn', 'notes', 'attachmentCount', 'removedAt', 'removedReason', 'version'] as const;

const steps = (xs: number[]): number[] => xs.map((x, i) => (i === 0 ? x : x - xs[i - 1]!));
function unstep(d: number[]): number[] {
  const out = new Array<number>(d.length);
  for (let i = 0; i < d.length; i++) out[i] = i === 0 ? d[0]! : out[i - 1]! + d[i]!;
  return out;
}

function symbolsOf(runs: Run[], pick: (r: Run) => Record<string, unknown>): string[] {
  const seen = new Set<string>();
  for (const r of runs) for (const k of Object.keys(pick(r))) seen.add(k);
  return [...seen];
}

export function encodeRunColumns(runs: Run[]): RunColumns {
  const n = runs.length;
  const plain = Object.fromEntries(PLAIN_KEYS.map((k) => [k, runs.map((r) => r[k])])) as Pick<RunColumns, (typeof PLAIN_KEYS)[number]>;
  const valueExceptions: RunColumns['valueExceptions'] = [];
  const settings: RunColumns['settings'] = {};
  for (const s of symbolsOf(runs, (r) => r.settings)) settings[s] = runs.map((r) => r.settings[s] ?? null);
  const measured: RunColumns['measured'] = {};
  for (const s of symbolsOf(runs, (r) => r.measured)) {
    measured[s] = runs.map((r, i) => {
      const c = r.measured[s];
      if (c && c.value !== numberOf(c.text)) valueExceptions.push(['measured', s, i, c.value]);
      return c ? c.text : null;
    });
  }
  const values: RunColumns['values'] = {};
  for (const s of symbolsOf(runs, (r) => r.values)) {
    const outOfRange: number[] = [];
    const text = runs.map((r, i) => {
      const c = r.values[s];
      if (!c) return null;
      if (c.outOfRange) outOfRange.push(i);
      if (c.value !== numberOf(c.text)) valueExceptions.push(['values', s, i, c.value]);
      return c.text;
    });
    values[s] = { text, outOfRange };
  }
  return {
    layout: 'columns',
    count: n,
    ...plain,
    idSteps: steps(runs.map((r) => r.id)),
    runOrderSteps: steps(runs.map((r) => r.runOrder)),
    updatedAtSteps: steps(runs.map((r) => r.updatedAt)),
    centrePoint: runs.map((r) => (r.centrePoint ? 1 : 0)),
    excluded: runs.map((r) => (r.excluded ? 1 : 0)),
    settings,
    measured,
    values,
    valueExceptions,
  };
}

/** Number(text), with -0 as 0: JSON has no -0, so the row layout never carries one either. */
const numberOf = (text: string): number => Number(text) + 0;

export function decodeRunColumns(c: RunColumns): Run[] {
  const out = new Array<Run>(c.count);
  const settingSyms = Object.keys(c.settings);
  const measuredSyms = Object.keys(c.measured);
  const valueSyms = Object.keys(c.values);
  const outOfRange = new Map(valueSyms.map((s) => [s, new Set(c.values[s]!.outOfRange)]));
  const id = unstep(c.idSteps);
  const runOrder = unstep(c.runOrderSteps);
  const updatedAt = unstep(c.updatedAtSteps);
  for (let i = 0; i < c.count; i++) {
    const settings: Record<string, string> = {};
    for (const s of settingSyms) {
      const v = c.settings[s]![i];
      if (v !== null && v !== undefined) settings[s] = v;
    }
    const measured: Record<string, CellValue> = {};
    for (const s of measuredSyms) {
      const t = c.measured[s]![i];
      if (t !== null && t !== undefined) measured[s] = { text: t, value: numberOf(t) };
    }
    const values: Record<string, SheetValue> = {};
    for (const s of valueSyms) {
      const t = c.values[s]!.text[i];
      if (t !== null && t !== undefined) values[s] = { text: t, value: numberOf(t), outOfRange: outOfRange.get(s)!.has(i) };
    }
    out[i] = {
      id: id[i]!,
      code: c.code[i]!,
      standardOrder: c.standardOrder[i]!,
      runOrder: runOrder[i]!,
      block: c.block[i]!,
      centrePoint: c.centrePoint[i] === 1,
      settings,
      measured,
      values,
      outcomeId: c.outcomeId[i] ?? null,
      outcomeReason: c.outcomeReason[i]!,
      excluded: c.excluded[i] === 1,
      operator: c.operator[i]!,
      testedOn: c.testedOn[i]!,
      notes: c.notes[i]!,
      attachmentCount: c.attachmentCount[i]!,
      removedAt: c.removedAt[i] ?? null,
      removedReason: c.removedReason[i] ?? null,
      version: c.version[i]!,
      updatedAt: updatedAt[i]!,
    };
  }
  for (const [kind, s, i, value] of c.valueExceptions) {
    const cell = kind === 'values' ? out[i]?.values[s] : out[i]?.measured[s];
    if (cell) cell.value = value;
  }
  return out;
}
