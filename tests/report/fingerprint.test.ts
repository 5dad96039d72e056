// stableJson is the text every cache key is hashed from (cache.ts): it must be JSON.stringify's text
// wherever JSON can say the value, and tell apart what JSON cannot (facts of the ECMAScript JSON
// serialiser, ECMA-262 25.5.2, from memory: NaN and Infinity become null, a Map and a Set become {}).

import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { byHandJson, stableJson } from '../../src/report/fingerprint.js';

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

  it('tells them apart however deep they lie (plain data is written by JSON.stringify, the rest by hand)', () => {
    const pairs: Array<[unknown, unknown]> = [
      [{ a: [{ b: NaN }] }, { a: [{ b: null }] }],
      [{ a: { b: [1, Infinity] } }, { a: { b: [1, null] } }],
      [{ a: [{ m: new Map([['k', 1]]) }] }, { a: [{ m: {} }] }],
      [[[new Set([1])]], [[{}]]],
    ];
    for (const [special, plainTwin] of pairs) {
      expect(JSON.stringify(special)).toBe(JSON.stringify(plainTwin)); // what JSON alone would hash alike
      expect(stableJson(special)).not.toBe(stableJson(plainTwin));
      expect(stableJson(special)).toBe(byHandJson(special));
    }
    expect(stableJson({ a: { n: 3n } })).not.toBe(stableJson({ a: { n: 3 } })); // (JSON.stringify throws on a bigint)
    // toJSON is honoured wherever it is, as JSON.stringify honours it (an array's own is not: by hand, the elements)
    expect(stableJson({ a: [{ when: new Date(0) }] })).toBe(JSON.stringify({ a: [{ when: new Date(0) }] }));
    const odd = Object.assign([1, 2], { toJSON: () => 'x' });
    expect(stableJson({ odd })).toBe(byHandJson({ odd }));
  });

  it('gives the by-hand text for any value (property test over generated values with Maps, Sets, dates, bigints, holes)', () => {
    const anything = fc.anything({ withBigInt: true, withBoxedValues: true, withDate: true, withMap: true, withSet: true, withNullPrototype: true, withSparseArray: true, withTypedArray: true, maxDepth: 4 });
    fc.assert(fc.property(anything, (v) => stableJson(v) === byHandJson(v)), { numRuns: 2000 });
    // and on plain JSON data, that text is JSON.stringify's
    fc.assert(fc.property(fc.jsonValue(), (v) => stableJson(v) === JSON.stringify(v)), { numRuns: 1000 });
  });
});
