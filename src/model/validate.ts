// Validation of one part of a file against its zod schema, with every zod issue turned into an
// Issue at the YAML position of the field it concerns.

import type * as z from 'zod';
import type { Issue } from './issues.js';
import { nearest, problem, type ProblemLocation } from './messages.js';
import { fieldSpecOf, type CustomIssueParams, type FieldSpec } from './schema.js';
import { formatPath, locate, valueAt, type PathSegment, type SourceFile } from './source.js';

/** Parses `value` (found at `prefix` in `file`); issues go to `issues`; undefined if any. */
export function validatePart<S extends z.ZodType>(
  schema: S,
  value: unknown,
  file: SourceFile,
  prefix: readonly PathSegment[],
  issues: Issue[],
): z.output<S> | undefined {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  for (const zodIssue of result.error.issues) issues.push(...translate(zodIssue, schema, value, file, prefix));
  return undefined;
}

export function locationOf(file: SourceFile, path: readonly PathSegment[], options: { key?: boolean } = {}): ProblemLocation {
  return { file: file.path, ...locate(file, path, options), path: formatPath(path) };
}

type AnySchema = z.core.$ZodType;

function innerOf(schema: AnySchema): AnySchema | undefined {
  const def = schema._zod.def as unknown as Record<string, unknown> & { type: string };
  switch (def.type) {
    case 'optional':
    case 'nullable':
    case 'default':
    case 'prefault':
    case 'nonoptional':
    case 'readonly':
    case 'catch':
      return def.innerType as AnySchema;
    case 'pipe':
      return def.in as AnySchema;
    case 'lazy':
      return (def.getter as () => AnySchema)();
    default:
      return undefined;
  }
}

/** The chain of wrappers from a schema down to its core type (optional -> pipe -> string). */
function unwrapChain(schema: AnySchema): AnySchema[] {
  const chain = [schema];
  let inner = innerOf(schema);
  while (inner !== undefined && chain.length < 20) {
    chain.push(inner);
    inner = innerOf(inner);
  }
  return chain;
}

function coreOf(schema: AnySchema): AnySchema {
  const chain = unwrapChain(schema);
  return chain[chain.length - 1]!;
}

/** The schema of the field at `path` below `schema`; undefined where it cannot be followed. */
export function schemaAt(schema: AnySchema, path: readonly PathSegment[]): AnySchema | undefined {
  let current: AnySchema | undefined = schema;
  for (const segment of path) {
    if (current === undefined) return undefined;
    const def = coreOf(current)._zod.def as unknown as Record<string, unknown> & { type: string };
    if (def.type === 'object') current = (def.shape as Record<string, AnySchema>)[String(segment)];
    else if (def.type === 'array') current = def.element as AnySchema;
    else if (def.type === 'tuple') current = (def.items as AnySchema[])[Number(segment)] ?? (def.rest as AnySchema | undefined);
    else return undefined;
  }
  return current;
}

function specAt(schema: AnySchema | undefined): FieldSpec | undefined {
  if (schema === undefined) return undefined;
  for (const link of unwrapChain(schema)) {
    const spec = fieldSpecOf(link);
    if (spec !== undefined) return spec;
  }
  return undefined;
}

function objectKeys(schema: AnySchema | undefined): string[] | undefined {
  if (schema === undefined) return undefined;
  const def = coreOf(schema)._zod.def as unknown as Record<string, unknown> & { type: string };
  return def.type === 'object' ? Object.keys(def.shape as object) : undefined;
}

function enumValues(schema: AnySchema | undefined): string[] | undefined {
  if (schema === undefined) return undefined;
  const def = coreOf(schema)._zod.def as unknown as Record<string, unknown> & { type: string };
  return def.type === 'enum' ? Object.values(def.entries as Record<string, string>) : undefined;
}

const TYPE_WORDS: Record<string, string> = {
  string: 'text',
  number: 'a number',
  int: 'a whole number',
  boolean: 'true or false',
  array: 'a list',
  object: 'a mapping of fields',
  tuple: 'a list',
};

/** A value as the author would recognise it in a message. */
export function describeValue(value: unknown): string {
  if (value === null) return 'an empty value';
  if (value instanceof Date) return `the date ${Number.isNaN(value.getTime()) ? '(invalid)' : value.toISOString().slice(0, 10)}`;
  if (typeof value === 'number' && !Number.isFinite(value)) return `the value ${yamlNumber(value)}`;
  if (Array.isArray(value)) return 'a list';
  if (typeof value === 'object') return 'a mapping';
  if (typeof value === 'string') return `the text ${JSON.stringify(value)}`;
  if (typeof value === 'number') return `the number ${value}`;
  if (typeof value === 'boolean') return `the value ${value}`;
  return String(value);
}

/** A number that is not finite as YAML writes it (.inf, -.inf, .nan), which is also what 1e999 reads as. */
function yamlNumber(value: number): string {
  return Number.isNaN(value) ? '.nan' : value > 0 ? '.inf' : '-.inf';
}

function valueText(value: unknown): string | undefined {
  if (value === undefined) return undefined;
  if (typeof value === 'string') return value;
  if (typeof value === 'number' && !Number.isFinite(value)) return yamlNumber(value);
  if (typeof value === 'number' || typeof value === 'boolean' || value === null) return String(value);
  return undefined;
}

function translate(
  zodIssue: z.core.$ZodIssue,
  schema: AnySchema,
  root: unknown,
  file: SourceFile,
  prefix: readonly PathSegment[],
): Issue[] {
  const relative = zodIssue.path.filter((s): s is PathSegment => typeof s === 'string' || typeof s === 'number');
  const path = [...prefix, ...relative];
  const raw = valueAt(root, relative);
  const fieldSchema = schemaAt(schema, relative);
  const spec = specAt(fieldSchema);
  const at = locationOf(file, path);
  const actual = valueText(raw);
  const expectedType = (zodIssue as { expected?: string }).expected;

  switch (zodIssue.code) {
    case 'unrecognized_keys': {
      const allowed = objectKeys(fieldSchema) ?? [];
      return zodIssue.keys.map((key) =>
        problem('unknown-field', locationOf(file, [...path, key], { key: true }), { key, allowed, suggestion: nearest(key, allowed) }),
      );
    }
    case 'invalid_type': {
      const expected = spec?.expected ?? (expectedType ? TYPE_WORDS[expectedType] ?? expectedType : undefined);
      if (raw === undefined) {
        const key = String(path[path.length - 1] ?? '');
        return [problem('missing-field', at, { key, expected })];
      }
      if (raw === null) return [problem('empty-value', at, { expected })];
      if (spec?.unitText && typeof raw === 'number') return [problem('missing-unit', at, { actual: String(raw), expected })];
      if (expectedType === 'int' && typeof raw === 'number') return [problem('not-integer', at, { actual: String(raw), expected })];
      return [problem('wrong-type', at, { actual, detail: describeValue(raw), expected })];
    }
    case 'too_small':
    case 'too_big': {
      if (zodIssue.origin === 'array' || zodIssue.origin === 'set') {
        const count = Array.isArray(raw) ? raw.length : 0;
        const limit = Number(zodIssue.code === 'too_small' ? zodIssue.minimum : zodIssue.maximum);
        return [problem(zodIssue.code === 'too_small' ? 'too-few' : 'too-many', at, { actual: String(count), limit })];
      }
      if (zodIssue.origin === 'string') return [problem('empty-text', at, {})];
      if (zodIssue.code === 'too_small' && Number(zodIssue.minimum) === 0 && !zodIssue.inclusive) {
        return [problem('not-positive', at, { actual, expected: spec?.expected })];
      }
      const bound = zodIssue.code === 'too_small' ? `at least ${zodIssue.minimum}` : `at most ${zodIssue.maximum}`;
      return [problem('out-of-range', at, { actual, expected: spec?.expected ?? `a number ${bound}` })];
    }
    case 'invalid_value': {
      const allowed = zodIssue.values.map(String);
      // A missing or empty enum field, or a list or mapping there, is not a misspelt value.
      const words = allowed.length === 1 ? JSON.stringify(allowed[0]) : `one of ${allowed.map((a) => JSON.stringify(a)).join(', ')}`;
      if (raw === undefined) return [problem('missing-field', at, { key: String(path[path.length - 1] ?? ''), expected: words })];
      if (raw === null) return [problem('empty-value', at, { expected: words })];
      if (actual === undefined) return [problem('wrong-type', at, { detail: describeValue(raw), expected: words })];
      return [problem('invalid-value', at, { actual: actual ?? describeValue(raw), allowed, suggestion: actual ? nearest(actual, allowed) : undefined })];
    }
    case 'custom': {
      const params = zodIssue.params as CustomIssueParams | undefined;
      if (params?.problem !== undefined) {
        const { problem: code, ...data } = params;
        const suggestion = code === 'invalid-value' && data.actual && data.allowed ? nearest(data.actual, data.allowed) : data.suggestion;
        return [problem(code, at, { ...data, suggestion })];
      }
      return [problem('wrong-type', at, { actual, detail: zodIssue.message, expected: spec?.expected })];
    }
    default: {
      const allowed = enumValues(fieldSchema);
      return [
        problem('wrong-type', at, {
          actual,
          detail: describeValue(raw),
          expected: spec?.expected ?? (allowed ? `one of ${allowed.join(', ')}` : undefined),
        }),
      ];
    }
  }
}
