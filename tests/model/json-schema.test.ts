// The JSON Schemas come from the same zod schemas as the loader: same field names, strict objects,
// unit values as strings with a pattern.

import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { jsonSchemas } from '../../src/model/json-schema.js';

type Schema = Record<string, unknown> & {
  properties?: Record<string, Schema>;
  items?: Schema;
  anyOf?: Schema[];
  additionalProperties?: unknown;
  type?: string;
  pattern?: string;
  required?: string[];
};

/** Keys of `value` not allowed by `schema` (a small walker: properties, items, anyOf). */
function unknownKeys(value: unknown, schema: Schema, at = ''): string[] {
  if (schema.anyOf) {
    const results = schema.anyOf.map((s) => unknownKeys(value, s, at));
    return results.reduce((best, r) => (r.length < best.length ? r : best));
  }
  if (Array.isArray(value)) return schema.items ? value.flatMap((v, i) => unknownKeys(v, schema.items!, `${at}[${i}]`)) : [];
  if (value !== null && typeof value === 'object' && schema.properties) {
    return Object.entries(value).flatMap(([k, v]) =>
      schema.properties![k] ? unknownKeys(v, schema.properties![k]!, `${at}.${k}`) : [`${at}.${k}`],
    );
  }
  return [];
}

const good = (file: string): unknown => parse(readFileSync(path.resolve('tests/fixtures/model/good', file), 'utf8'));

describe('jsonSchemas', () => {
  const schemas = jsonSchemas() as Record<'project' | 'devices' | 'circuit', Schema>;

  it('are draft 2020-12 documents with a title', () => {
    for (const schema of Object.values(schemas)) {
      expect(schema.$schema).toBe('https://json-schema.org/draft/2020-12/schema');
      expect(typeof schema.title).toBe('string');
    }
  });

  it('accept every field of the good fixture project and nothing unknown', () => {
    expect(unknownKeys(good('project.yaml'), schemas.project)).toEqual([]);
    expect(unknownKeys(good('devices/breakers.yaml'), schemas.devices)).toEqual([]);
    expect(unknownKeys(good('circuits/msb-q4.yaml'), schemas.circuit)).toEqual([]);
    expect(unknownKeys(good('circuits/mcc/finals.yaml'), schemas.circuit)).toEqual([]);
    expect(unknownKeys({ cable: { lenght: '1 m' } }, schemas.circuit)).toEqual(['.cable.lenght']);
  });

  it('are strict and require what the loader requires', () => {
    expect(schemas.project.additionalProperties).toBe(false);
    expect(schemas.project.required).toEqual(['project', 'settings', 'supplies']);
    const cable = schemas.circuit.anyOf![0]!.properties!.cable!;
    expect(cable.additionalProperties).toBe(false);
    expect(cable.required).toEqual(['conductor', 'insulation', 'size', 'length']);
  });

  it('give unit values as strings with a pattern that wants the unit', () => {
    const length = schemas.circuit.anyOf![0]!.properties!.cable!.properties!.length!;
    expect(length.type).toBe('string');
    expect(String(length.description)).toContain('45 m');
    const pattern = new RegExp(length.pattern!);
    expect(pattern.test('45 m')).toBe(true);
    expect(pattern.test('45')).toBe(false);
    const impedance = schemas.project.properties!.supplies!.items!.properties!.transformer!.properties!.impedance!;
    expect(new RegExp(impedance.pattern!).test('5.75 %')).toBe(true);
    expect(new RegExp(impedance.pattern!).test('5.75')).toBe(false);
  });

  it('are the same on every call (deterministic output for the schema files)', () => {
    expect(JSON.stringify(jsonSchemas())).toBe(JSON.stringify(jsonSchemas()));
  });
});
