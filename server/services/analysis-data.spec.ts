import { describe, expect, it } from 'vitest';
import { canonicalJson, diffRows } from './analysis-data.js';

describe('canonicalJson', () => {
  it('sorts keys by UTF-16 code units as RFC 8785 prescribes', () => {
    // RFC 8785 section 3.2.3, the property-sorting example (from memory): the expected order is
    // \r, "1", \u0080, \u00f6, \u20ac, the emoji (surrogates D83D DE00), \ufb33 — the emoji sorts
    // before U+FB33 on code units although its code point is larger.
    const input = { '\u20ac': 'Euro Sign', '\r': 'Carriage Return', '\ufb33': 'Hebrew Letter Dalet With Dagesh', '1': 'One', '\ud83d\ude00': 'Emoji: Grinning Face', '\u0080': 'Control', '\u00f6': 'Latin Small Letter O With Diaeresis' };
    // Read the order off the serialised text: JSON.parse would list the integer-like key "1" first.
    const order = [...canonicalJson(input).matchAll(/"([^"]*)":"/g)].map((m) => JSON.parse(`"${m[1]}"`) as string);
    expect(order).toEqual(['\r', '1', '\u0080', '\u00f6', '\u20ac', '\ud83d\ude00', '\ufb33']);
  });

  it('has no whitespace, nests, and refuses numbers JSON cannot carry', () => {
    expect(canonicalJson({ b: [1, { d: null, c: true }], a: 'x y' })).toBe('{"a":"x y","b":[1,{"c":true,"d":null}]}');
    expect(() => canonicalJson({ v: Number.NaN })).toThrow(/NaN/);
  });
});

describe('diffRows', () => {
  const row = (runId: number, value: string, outcome: string | null = 'valid') => ({ runId, code: `R${runId}`, settings: { A: '1' }, value, outcome });
  it('lists added, removed (with why) and edited runs, old and new', () => {
    const changes = diffRows([row(1, '0.50'), row(2, '0.6'), row(3, '0.7')], [row(1, '0.5'), row(3, '0.7', 'valid, re-measured'), row(4, '0.8')], new Map([[2, 'run removed']]));
    expect(changes).toEqual({
      added: [{ runId: 4, code: 'R4', value: '0.8' }],
      removed: [{ runId: 2, code: 'R2', value: '0.6', why: 'run removed' }],
      edited: [
        { runId: 1, code: 'R1', field: 'value', oldValue: '0.50', newValue: '0.5' },
        { runId: 3, code: 'R3', field: 'outcome', oldValue: 'valid', newValue: 'valid, re-measured' },
      ],
    });
  });
});
