// stableJson is the text every cache key is hashed from (cache.ts): it must be JSON.stringify's text
// wherever JSON can say the value, and tell apart what JSON cannot (facts of the ECMAScript JSON
// serialiser, ECMA-262 25.5.2, from memory: NaN and Infinity become null, a Map and a Set become {}).

import { describe, expect, it } from 'vitest';
import { stableJson } from '../../src/report/fingerprint.js';

describe('stableJson', () => {
  it('writes what JSON.stringify writes for plain data, key order and all', () => {
    const samples: unknown[] = [
      { b: 1, a: [1, 'two', { c: null, d: true }], e: -0, f: 1e21, g: 5e-7, h: 'quote " and \\ and \u2028' },
      [undefined, () => 1, 3],
      { skipped: undefined, fn: () => 2, kept: 'x', 2: 'integer keys first', 1: 'as JSON orders them' },
      { when: new Date(Date.UTC(2026, 0, 2)) },
      'text',
      12.5,
      null,
      [],
      {},
    ];
    for (const v of samples) expect(stableJson(v)).toBe(JSON.stringify(v));
  });

  it('tells apart what JSON writes alike: non-finite numbers and null, Maps and objects, Sets and arrays', () => {
    const texts = [null, NaN, Infinity, -Infinity].map((v) => stableJson({ v }));
    expect(new Set(texts).size).toBe(4);
    expect(stableJson(new Map([['a', 1]]))).not.toBe(stableJson({ a: 1 }));
    expect(stableJson(new Map([['a', 1]]))).not.toBe(stableJson(new Map([['a', 2]])));
    expect(stableJson(new Set([1, 2]))).not.toBe(stableJson([1, 2]));
    expect(stableJson(10n)).not.toBe(stableJson(10));
  });

  it('leaves out non-enumerable properties (the solver keeps its chart series behind one)', () => {
    const o = { a: 1 };
    Object.defineProperty(o, 'hidden', { enumerable: false, get: () => { throw new Error('read'); } });
    expect(stableJson(o)).toBe('{"a":1}');
  });
});
