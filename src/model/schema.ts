// The input format of FORMAT.md as zod schemas: the one source of the author-side types (z.input:
// what a YAML file may say) and of the parsed values the normaliser turns into a Project (z.output:
// units resolved to SI, defaults not yet applied). Objects are strict: an unknown field is an error.

import * as z from 'zod';
import type { ProblemCode, ProblemData } from './messages.js';
import { parseConductorSize } from './sizes.js';
import type { CurvePoint, MinFaultTemperature } from './types.js';
import {
  DIMENSIONS,
  formatNumber,
  inRange,
  isMultipleOfRatingUnit,
  parseMultipleOfRating,
  parsePercent,
  parseQuantity,
  parseUnitFactor,
  type Dimension,
} from './units.js';

/** What a field wants, in words, for messages about it ("a length such as \"45 m\""). */
export interface FieldSpec {
  expected: string;
  unitText: boolean; // a string with a unit: a bare YAML number there is a missing unit
}

const fieldSpecs = new WeakMap<z.core.$ZodType, FieldSpec>();

export function fieldSpecOf(schema: z.core.$ZodType): FieldSpec | undefined {
  return fieldSpecs.get(schema);
}

/** Registers what the field wants; a schema without a description gets the same words as one. */
function withSpec<T extends z.ZodType>(schema: T, spec: FieldSpec): T {
  const described = z.globalRegistry.has(schema) ? schema : (schema.meta({ description: spec.expected }) as T);
  fieldSpecs.set(described, spec);
  return described;
}

/** Parameters of a custom issue: the problem found and its data; the words come from messages.ts. */
export type CustomIssueParams = ProblemData & { problem: ProblemCode };

function fail(ctx: z.core.$RefinementCtx, problem: ProblemCode, data: ProblemData, path?: PropertyKey[]): never {
  const params: CustomIssueParams = { problem, ...data };
  ctx.addIssue({ code: 'custom', message: problem, params, ...(path ? { path } : {}) });
  return z.NEVER;
}

const quote = (text: string): string => JSON.stringify(text);

// A number, optional space, then a unit (not starting with a digit). A hint for JSON Schema users;
// the loader itself parses with mathjs.
const QUANTITY_PATTERN = '^\\s*[+-]?(\\d+(\\.\\d*)?|\\.\\d+)([eE][+-]?\\d+)?\\s*[^\\s\\d.,+-].*$';
const PERCENT_PATTERN = '^\\s*[+-]?(\\d+(\\.\\d*)?|\\.\\d+)([eE][+-]?\\d+)?\\s*(%|percent)\\s*$';

type Sign = 'positive' | 'non-negative' | 'any';

/** A dimensional value: text with a unit, converted to SI (temperatures to degC). */
function quantity(dimension: Dimension, options: { example?: string; sign?: Sign } = {}) {
  const info = DIMENSIONS[dimension];
  const example = options.example ?? info.example;
  const sign = options.sign ?? 'positive';
  const expected = `${info.noun} such as ${quote(example)}`;
  const schema = z
    .string()
    .transform((text, ctx) => {
      const parsed = parseQuantity(text, dimension);
      if (!parsed.ok) return fail(ctx, parsed.problem, { actual: text, expected, detail: parsed.detail });
      if (sign === 'positive' && !(parsed.value > 0)) return fail(ctx, 'not-positive', { actual: text, expected });
      if (sign === 'non-negative' && parsed.value < 0) return fail(ctx, 'negative', { actual: text, expected });
      if (!inRange(dimension, parsed.value)) return fail(ctx, 'out-of-range', { actual: text, expected: `${info.noun} from ${info.range.text}, such as ${quote(example)}` });
      return parsed.value;
    })
    .meta({ description: `${info.noun} with its unit, such as ${quote(example)}`, examples: [example], pattern: QUANTITY_PATTERN });
  return withSpec(schema, { expected, unitText: true });
}

/** A percentage written with "%": `scale` 0.01 gives a fraction (5.75 % -> 0.0575), 1 the percent. */
function percentage(example: string, scale: number) {
  const expected = `a percentage such as ${quote(example)}`;
  const schema = z
    .string()
    .transform((text, ctx) => {
      const parsed = parsePercent(text);
      if (!parsed.ok) return fail(ctx, parsed.problem, { actual: text, expected, detail: parsed.detail });
      if (!(parsed.value > 0)) return fail(ctx, 'not-positive', { actual: text, expected });
      if (parsed.value > 100) return fail(ctx, 'out-of-range', { actual: text, expected: `a percentage greater than 0 and at most 100 %, such as ${quote(example)}` });
      return parsed.value * scale;
    })
    .meta({ description: `a percentage, such as ${quote(example)}`, examples: [example], pattern: PERCENT_PATTERN });
  return withSpec(schema, { expected, unitText: true });
}

/** Plain numbers (ratios, factors, curve points): far beyond any real value, short of overflowing the solve. */
const PLAIN_NUMBER_MAX = 1e12;

function positiveNumber(expected: string, max = PLAIN_NUMBER_MAX) {
  return withSpec(z.number().positive().max(max), { expected, unitText: false });
}

/** A ratio that may be zero (X/R = 0: a purely resistive source). */
function nonNegativeNumber(expected: string, max = PLAIN_NUMBER_MAX) {
  return withSpec(z.number().min(0).max(max), { expected, unitText: false });
}

const text = withSpec(z.string().min(1), { expected: 'some text', unitText: false });
const id = withSpec(z.string().min(1), { expected: 'an id (text)', unitText: false });
const boardId = withSpec(z.string().min(1), { expected: 'a board id (text)', unitText: false });
const optionalText = z.string();

const isoDate = withSpec(
  z
    .string()
    .transform((value, ctx) => {
      const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
      const date = match ? new Date(Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3]))) : undefined;
      if (match === null || date === undefined || date.toISOString().slice(0, 10) !== value) {
        return fail(ctx, 'invalid-date', { actual: value });
      }
      return value;
    })
    .meta({ description: 'a date, YYYY-MM-DD', pattern: '^\\d{4}-\\d{2}-\\d{2}$', format: 'date' }),
  { expected: 'a date written YYYY-MM-DD, such as 2026-11-20', unitText: false },
);

const conductor = z
  .enum(['copper', 'aluminium', 'aluminum'])
  .transform((value) => (value === 'aluminum' ? 'aluminium' : value));

const insulation = z.enum(['PVC', 'XLPE', 'EPR', 'rubber-60', 'mineral-pvc', 'mineral-bare']);

const conductorSize = withSpec(
  z
    .string()
    .transform((value, ctx) => {
      const parsed = parseConductorSize(value);
      if (parsed.ok) return parsed.size;
      const expected = 'a conductor size such as "95 mm2", "4/0 AWG" or "250 kcmil"';
      return fail(ctx, parsed.problem, { actual: value, expected: parsed.problem === 'out-of-range' ? `a conductor size from ${DIMENSIONS.area.range.text}, such as "95 mm2"` : expected });
    })
    .meta({ description: 'a conductor size: "95 mm2", "2 AWG", "4/0 AWG" or "250 kcmil"', examples: ['95 mm2', '4/0 AWG', '250 kcmil'] }),
  { expected: 'a conductor size such as "95 mm2", "4/0 AWG" or "250 kcmil"', unitText: true },
);

/** Conductors in parallel per phase: more than 100 is a slip, not a cable. */
export const MAX_PARALLEL = 100;
const parallelCount = withSpec(z.number().int().min(1).max(MAX_PARALLEL), { expected: `a whole number of conductors from 1 to ${MAX_PARALLEL}`, unitText: false });

// ---------------------------------------------------------------------------------------------
// project.yaml

export const projectMetaSchema = z.strictObject({
  name: text,
  number: text,
  revision: text,
  date: isoDate,
  client: optionalText.optional(),
});

const minFaultTemperature = withSpec(
  z
    .string()
    .transform((value, ctx): MinFaultTemperature => {
      if (value === 'final' || value === 'operating') return { mode: value };
      const expected = '"final", "operating" or a temperature such as "160 degC"';
      const parsed = parseQuantity(value, 'temperature');
      if (!parsed.ok) return fail(ctx, parsed.problem === 'not-a-number' ? 'invalid-value' : parsed.problem, { actual: value, expected, detail: parsed.detail, allowed: ['final', 'operating', '160 degC'] });
      // R = R_20 [1 + 0.004 (theta - 20)] reaches zero at -230 degC: below it a conductor would have negative resistance.
      if (!(parsed.value > -230 && parsed.value <= 1000)) return fail(ctx, 'out-of-range', { actual: value, expected: 'a conductor temperature above -230 degC (where the resistance law reaches zero) and at most 1000 degC' });
      return { mode: 'fixed', celsius: parsed.value };
    })
    .meta({ description: '"final", "operating", or a conductor temperature such as "160 degC"', examples: ['final', 'operating', '160 degC'] }),
  { expected: '"final", "operating" or a temperature such as "160 degC"', unitText: true },
);

export const settingsSchema = z.strictObject({
  system_voltage: quantity('voltage', { example: '400 V' }),
  frequency: quantity('frequency').optional(),
  earthing: z.enum(['TN-S', 'TN-C-S', 'TN-C', 'TT', 'IT']).optional(),
  voltage_factor_max: positiveNumber('a voltage factor greater than 0 and at most 2, such as 1.05', 2).optional(),
  voltage_factor_min: positiveNumber('a voltage factor greater than 0 and at most 2, such as 0.95', 2).optional(),
  min_fault_conductor_temperature: minFaultTemperature.optional(),
  withstand_criterion: z.enum(['any-point', 'through-fault']).optional(),
});

export const networkSchema = z.strictObject({
  voltage: quantity('voltage', { example: '11 kV' }),
  fault_level: quantity('apparent-power', { example: '250 MVA' }).optional(),
  fault_current: quantity('current', { example: '13 kA' }).optional(),
  fault_level_min: quantity('apparent-power', { example: '150 MVA' }).optional(),
  fault_current_min: quantity('current', { example: '8 kA' }).optional(),
  x_over_r: nonNegativeNumber('a ratio X/R of 0 or more such as 10').optional(),
  voltage_factor: positiveNumber('a voltage factor greater than 0 and at most 2, such as 1.10', 2).optional(),
});

export const transformerSchema = z.strictObject({
  rating: quantity('apparent-power', { example: '1000 kVA' }),
  primary_voltage: quantity('voltage', { example: '11 kV' }),
  secondary_voltage: quantity('voltage', { example: '400 V' }),
  impedance: percentage('5.75 %', 0.01),
  load_losses: quantity('power', { example: '10.5 kW' }).optional(),
  x_over_r: nonNegativeNumber('a ratio X/R of 0 or more such as 6').optional(),
  vector_group: text.optional(),
  zero_sequence_ratio: positiveNumber('a ratio Z0/Z1 greater than 0 and at most 1000, such as 1.0', 1000).optional(),
});

export const serviceSchema = z.strictObject({
  fault_current: quantity('current', { example: '16 kA' }),
  x_over_r: nonNegativeNumber('a ratio X/R of 0 or more such as 2').optional(),
  earth_loop_impedance: quantity('impedance', { example: '0.35 ohm' }).optional(),
});

export const supplySchema = z.strictObject({
  id,
  feeds: boardId,
  network: networkSchema.optional(),
  transformer: transformerSchema.optional(),
  service: serviceSchema.optional(),
});

const person = z.strictObject({ name: text, role: text });

export const signoffSchema = z.strictObject({
  prepared_by: person.optional(),
  checked_by: person.optional(),
  approved_by: person.optional(),
});

const assumptionList = z.array(text);

export const projectFileSchema = z.strictObject({
  project: projectMetaSchema,
  settings: settingsSchema,
  supplies: z.array(supplySchema).min(1),
  assumptions: assumptionList.optional(),
  signoff: signoffSchema.optional(),
});

// ---------------------------------------------------------------------------------------------
// devices/*.yaml

/** A curve's current axis: amperes (factor to A) or multiples of the device rating. */
export type CurrentScale = { kind: 'amperes'; factor: number } | { kind: 'multiple-of-rating' };

const curveCurrentUnit = withSpec(
  z
    .string()
    .transform((value, ctx): CurrentScale => {
      if (isMultipleOfRatingUnit(value)) return { kind: 'multiple-of-rating' };
      const parsed = parseUnitFactor(value, 'current');
      if (!parsed.ok) return fail(ctx, parsed.problem, { actual: value, expected: '"A", "kA" or "x In"', detail: parsed.detail });
      return { kind: 'amperes', factor: parsed.value };
    })
    .meta({ description: 'unit of the points\' currents: "A", "kA" or "x In" (multiples of the rating)', examples: ['A', 'kA', 'x In'] }),
  { expected: '"A", "kA" or "x In"', unitText: true },
);

function unitOf(dimension: Dimension, expected: string, examples: string[]) {
  return withSpec(
    z
      .string()
      .transform((value, ctx) => {
        const parsed = parseUnitFactor(value, dimension);
        if (!parsed.ok) return fail(ctx, parsed.problem, { actual: value, expected, detail: parsed.detail });
        return parsed.value;
      })
      .meta({ description: `unit of the points' values: ${expected}`, examples }),
    { expected, unitText: true },
  );
}

const curvePoints = withSpec(
  z.array(z.tuple([positiveNumber('a positive current'), positiveNumber('a positive value')])).min(2),
  { expected: 'at least two [current, value] pairs of positive numbers', unitText: false },
);

type Trend = 'non-increasing' | 'non-decreasing';

/** Currents strictly increasing; values following the curve's physical trend. */
function checkCurve(points: ReadonlyArray<readonly [number, number]>, trend: Trend, ctx: z.core.$RefinementCtx): void {
  for (let i = 1; i < points.length; i++) {
    const [current, value] = points[i]!;
    const [previousCurrent, previousValue] = points[i - 1]!;
    if (!(current > previousCurrent)) {
      fail(ctx, 'curve-current-not-increasing', { index: i, actual: formatNumber(current), detail: formatNumber(previousCurrent) }, ['points', i, 0]);
    } else if (trend === 'non-increasing' && value > previousValue) {
      fail(ctx, 'curve-time-increasing', { index: i, actual: formatNumber(value), detail: formatNumber(previousValue) }, ['points', i, 1]);
    } else if (trend === 'non-decreasing' && value < previousValue) {
      fail(ctx, 'curve-energy-decreasing', { index: i, actual: formatNumber(value), detail: formatNumber(previousValue) }, ['points', i, 1]);
    }
  }
}

/** The parsed curve: values in SI; currents in A, or in multiples of the rating (resolved later). */
export interface ParsedCurve {
  scale: CurrentScale;
  points: CurvePoint[];
}

function toParsedCurve(
  scale: CurrentScale,
  valueFactor: number,
  valueDimension: Dimension,
  points: ReadonlyArray<readonly [number, number]>,
  ctx: z.core.$RefinementCtx,
): ParsedCurve {
  const currentFactor = scale.kind === 'amperes' ? scale.factor : 1;
  const out = points.map(([current, value]) => ({ current: current * currentFactor, value: value * valueFactor }));
  // In SI the points must lie in the ranges a written quantity may take (a point of 1e12 in "YA" would not).
  out.forEach((p, i) => {
    if (scale.kind === 'amperes' && !inRange('current', p.current)) {
      fail(ctx, 'out-of-range', { actual: formatNumber(points[i]![0]), expected: `a current from ${DIMENSIONS.current.range.text} in the curve's unit` }, ['points', i, 0]);
    } else if (!inRange(valueDimension, p.value)) {
      const info = DIMENSIONS[valueDimension];
      fail(ctx, 'out-of-range', { actual: formatNumber(points[i]![1]), expected: `${info.noun} from ${info.range.text} in the curve's unit` }, ['points', i, 1]);
    }
  });
  return { scale, points: out };
}

export const tripCurveSchema = z
  .strictObject({
    current_unit: curveCurrentUnit,
    time_unit: unitOf('time', '"s" or "ms"', ['s', 'ms']),
    points: curvePoints,
  })
  .superRefine((curve, ctx) => checkCurve(curve.points, 'non-increasing', ctx))
  .transform((curve, ctx) => toParsedCurve(curve.current_unit, curve.time_unit, 'time', curve.points, ctx));

export const letThroughSchema = z
  .strictObject({
    current_unit: curveCurrentUnit,
    energy_unit: unitOf('joule-integral', '"A^2 s" or "kA^2 s"', ['A^2 s', 'kA^2 s']),
    points: curvePoints,
  })
  .superRefine((curve, ctx) => checkCurve(curve.points, 'non-decreasing', ctx))
  .transform((curve, ctx) => toParsedCurve(curve.current_unit, curve.energy_unit, 'joule-integral', curve.points, ctx));

/** Instantaneous pickup: a multiple of the rating ("10 x In") or a current ("2.5 kA"). */
export type Pickup = { kind: 'multiple-of-rating'; multiple: number } | { kind: 'amperes'; current: number };

/** An instantaneous pickup of more than a million times the rating is a slip. */
const MAX_MULTIPLE = 1e6;
const pickupExpected = 'a multiple of the rating such as "10 x In" or a current such as "2.5 kA"';
const pickup = withSpec(
  z
    .string()
    .transform((value, ctx): Pickup => {
      const multiple = parseMultipleOfRating(value);
      if (multiple !== undefined) {
        if (!(multiple > 0)) return fail(ctx, 'not-positive', { actual: value, expected: pickupExpected });
        if (multiple > MAX_MULTIPLE) return fail(ctx, 'out-of-range', { actual: value, expected: `a multiple of the rating at most ${MAX_MULTIPLE} x In, or a current` });
        return { kind: 'multiple-of-rating', multiple };
      }
      const parsed = parseQuantity(value, 'current');
      if (!parsed.ok) return fail(ctx, parsed.problem, { actual: value, expected: pickupExpected, detail: parsed.detail });
      if (!(parsed.value > 0)) return fail(ctx, 'not-positive', { actual: value, expected: pickupExpected });
      if (!inRange('current', parsed.value)) return fail(ctx, 'out-of-range', { actual: value, expected: `a current from ${DIMENSIONS.current.range.text}, or a multiple of the rating` });
      return { kind: 'amperes', current: parsed.value };
    })
    .meta({ description: pickupExpected, examples: ['10 x In', '2.5 kA'] }),
  { expected: pickupExpected, unitText: true },
);

export const deviceSchema = z.strictObject({
  id,
  kind: z.enum(['mcb', 'mccb', 'acb', 'fuse', 'relay']),
  rating: quantity('current', { example: '250 A' }),
  breaking_capacity: quantity('current', { example: '50 kA' }).optional(),
  clearing_time: quantity('time', { example: '0.2 s' }).optional(),
  instantaneous: z
    .strictObject({
      pickup,
      clearing_time: quantity('time', { example: '10 ms' }).optional(),
    })
    .optional(),
  trip_curve: tripCurveSchema.optional(),
  let_through: letThroughSchema.optional(),
  description: optionalText.optional(),
  illustrative: withSpec(z.boolean(), { expected: 'true or false', unitText: false }).optional(),
});

export const devicesFileSchema = z.strictObject({ devices: z.array(deviceSchema) });

// ---------------------------------------------------------------------------------------------
// circuits/**/*.yaml

export const protectiveConductorSchema = z.strictObject({
  size: conductorSize.optional(),
  conductor: conductor.optional(),
  arrangement: z.enum(['in-cable', 'separate']).optional(),
  parallel: parallelCount.optional(),
  resistance: quantity('impedance-per-length', { example: '0.387 ohm/km' }).optional(),
});

export const cableSchema = z.strictObject({
  conductor,
  insulation,
  size: conductorSize,
  parallel: parallelCount.optional(),
  length: quantity('length', { example: '45 m' }),
  resistance: quantity('impedance-per-length', { example: '0.193 ohm/km' }).optional(),
  reactance: quantity('impedance-per-length', { example: '0.08 ohm/km', sign: 'non-negative' }).optional(),
  protective_conductor: protectiveConductorSchema.optional(),
});

export const circuitSchema = z.strictObject({
  id,
  description: optionalText.optional(),
  from: boardId,
  to: boardId.optional(),
  device: id,
  clearing_time: quantity('time', { example: '0.3 s' }).optional(),
  load: z
    .strictObject({
      current: quantity('current', { example: '180 A' }),
      power_factor: withSpec(z.number().gt(0).lte(1), { expected: 'a power factor greater than 0 and at most 1, such as 0.85', unitText: false }).optional(),
      phases: withSpec(z.union([z.literal(1), z.literal(3)]), { expected: 'the number of phases of the load, 1 (line to neutral) or 3', unitText: false }).optional(),
    })
    .optional(),
  cable: cableSchema,
  checks: z
    .strictObject({
      disconnection_time: quantity('time', { example: '0.4 s' }).optional(),
      voltage_drop_limit: percentage('5 %', 1).optional(),
    })
    .optional(),
  assumptions: assumptionList.optional(),
});

export const circuitListFileSchema = z.strictObject({ circuits: z.array(circuitSchema) });

/** A circuits/*.yaml file: one circuit, or a list under `circuits:`. */
export const circuitFileSchema = z.union([circuitSchema, circuitListFileSchema]);

// ---------------------------------------------------------------------------------------------
// Author-side types (what a file may say) and parsed types (units resolved, defaults not applied).

export type ProjectFileInput = z.input<typeof projectFileSchema>;
export type DevicesFileInput = z.input<typeof devicesFileSchema>;
export type CircuitFileInput = z.input<typeof circuitFileSchema>;
export type SupplyInput = z.input<typeof supplySchema>;
export type DeviceInput = z.input<typeof deviceSchema>;
export type CircuitInput = z.input<typeof circuitSchema>;

export type ParsedProjectMeta = z.output<typeof projectMetaSchema>;
export type ParsedSettings = z.output<typeof settingsSchema>;
export type ParsedSupply = z.output<typeof supplySchema>;
export type ParsedSignoff = z.output<typeof signoffSchema>;
export type ParsedDevice = z.output<typeof deviceSchema>;
export type ParsedCircuit = z.output<typeof circuitSchema>;
