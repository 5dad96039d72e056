// Dimensional values written as text with a unit ("45 m", "95 mm2", "1.5e5 A^2 s"), converted once,
// here, to SI numbers (FORMAT.md: units are resolved at the edge, with mathjs's units).
//
// The units a project nearly always writes (SI prefixes on m, A, V, VA, W, s, Hz, ohm; degC; ft, in,
// min, h) are read by a small reader of our own that gives the same numbers as mathjs, bit for bit
// (tests/model/units.test.ts compares the two on every unit it reads). Any other text goes to mathjs,
// which is loaded only then: building its unit machinery costs about 0.4 s at start-up. A synchronous
// caller that meets such a text before the library is loaded gets UnitLibraryNeeded; the loader then
// loads the library and reads the project again (load.ts).

import { createRequire } from 'node:module';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { MathJsInstance, Unit } from 'mathjs';

type MathUnit = MathJsInstance['unit'];
let mathUnit: MathUnit | undefined;

/** Loads mathjs's unit machinery (once). Only its unit factories are built, imported by path, since
 * the package's entry point creates every function it has and its export map offers no partial entry. */
export async function loadUnitLibrary(): Promise<void> {
  if (mathUnit !== undefined) return;
  const mathjsRoot = path.dirname(createRequire(import.meta.url).resolve('mathjs/package.json'));
  const fromMathjs = async (file: string) => import(pathToFileURL(path.join(mathjsRoot, 'lib', 'esm', file)).href);
  const { create } = (await fromMathjs('core/create.js')) as { create: (factories: object) => MathJsInstance };
  const { unitDependencies } = (await fromMathjs('entry/dependenciesAny/dependenciesUnitFunction.generated.js')) as { unitDependencies: object };
  mathUnit ??= create({ unitDependencies }).unit;
}

/** Thrown where a unit text needs mathjs and it is not loaded yet: load it and read again. */
export class UnitLibraryNeeded extends Error {
  constructor(readonly unitText: string) {
    super(`the unit "${unitText}" needs the unit library: call loadUnitLibrary() first`);
    this.name = 'UnitLibraryNeeded';
  }
}

export type Dimension =
  | 'length'
  | 'area'
  | 'current'
  | 'voltage'
  | 'apparent-power'
  | 'power'
  | 'time'
  | 'frequency'
  | 'impedance'
  | 'impedance-per-length'
  | 'joule-integral'
  | 'temperature';

export interface DimensionInfo {
  siUnit: string; // the unit the value is converted to
  noun: string; // in words, with article: "a length"
  example: string; // a value an author could write
  /**
   * The magnitudes accepted, in SI: far beyond any LV installation either way, so that only a typing
   * slip (1e308 m, 5e-324 A) is refused, before it overflows a product or a quotient of the solve.
   */
  range: { min: number; max: number; text: string };
}

export const DIMENSIONS: Readonly<Record<Dimension, DimensionInfo>> = {
  length: { siUnit: 'm', noun: 'a length', example: '45 m', range: { min: 1e-6, max: 1e6, text: '1 µm to 1000 km' } },
  area: { siUnit: 'm^2', noun: 'an area', example: '95 mm2', range: { min: 1e-9, max: 1e-1, text: '0.001 mm2 to 100000 mm2' } },
  current: { siUnit: 'A', noun: 'a current', example: '13 kA', range: { min: 1e-6, max: 1e9, text: '1 µA to 1000 MA' } },
  voltage: { siUnit: 'V', noun: 'a voltage', example: '400 V', range: { min: 1e-3, max: 1e7, text: '1 mV to 10000 kV' } },
  'apparent-power': { siUnit: 'VA', noun: 'an apparent power', example: '1000 kVA', range: { min: 1e-3, max: 1e13, text: '1 mVA to 10000000 MVA' } },
  power: { siUnit: 'W', noun: 'a power', example: '10.5 kW', range: { min: 1e-3, max: 1e13, text: '1 mW to 10000000 MW' } },
  time: { siUnit: 's', noun: 'a time', example: '0.2 s', range: { min: 1e-9, max: 1e8, text: '1 ns to 100000000 s' } },
  frequency: { siUnit: 'Hz', noun: 'a frequency', example: '50 Hz', range: { min: 1e-3, max: 1e9, text: '1 mHz to 1 GHz' } },
  impedance: { siUnit: 'ohm', noun: 'an impedance', example: '0.35 ohm', range: { min: 1e-12, max: 1e9, text: '1 pohm to 1000 Mohm' } },
  'impedance-per-length': { siUnit: 'ohm/m', noun: 'an impedance per length', example: '0.08 ohm/km', range: { min: 1e-12, max: 1e6, text: '1 nohm/km to 1000 Mohm/km' } },
  'joule-integral': { siUnit: 'A^2 s', noun: 'a Joule integral', example: '1.5e5 A^2 s', range: { min: 1e-9, max: 1e20, text: '1e-9 A^2 s to 1e20 A^2 s' } },
  temperature: { siUnit: 'degC', noun: 'a temperature', example: '160 degC', range: { min: -273.15, max: 1e4, text: 'above absolute zero and at most 10000 degC' } },
};

/** True where a value of the dimension lies in its accepted range (zero is judged by the field's sign rule). */
export function inRange(dimension: Dimension, value: number): boolean {
  const { min, max } = DIMENSIONS[dimension].range;
  const size = Math.abs(value);
  return size <= max && (size === 0 || size >= min || dimension === 'temperature');
}

export type QuantityProblem = 'not-a-number' | 'missing-unit' | 'unknown-unit' | 'wrong-dimension';

export type QuantityResult =
  | { ok: true; value: number } // SI (temperature: degC)
  | { ok: false; problem: QuantityProblem; detail?: string };

const NUMBER_THEN_UNIT = /^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/;

// Powers of the base dimensions, in the order length, mass, time, current, temperature.
type Dims = readonly [number, number, number, number, number];
const DIMS: Readonly<Record<Dimension, Dims>> = {
  length: [1, 0, 0, 0, 0],
  area: [2, 0, 0, 0, 0],
  current: [0, 0, 0, 1, 0],
  voltage: [2, 1, -3, -1, 0],
  'apparent-power': [2, 1, -3, 0, 0],
  power: [2, 1, -3, 0, 0],
  time: [0, 0, 1, 0, 0],
  frequency: [0, 0, -1, 0, 0],
  impedance: [2, 1, -3, -2, 0],
  'impedance-per-length': [1, 1, -3, -2, 0],
  'joule-integral': [0, 0, 1, 2, 0],
  temperature: [0, 0, 0, 0, 1],
};

/** The units our own reader knows: each one's value in SI, its dimensions, and whether SI prefixes apply. */
const KNOWN_UNITS: ReadonlyMap<string, { value: number; dims: Dims; prefixed: boolean }> = new Map([
  ['m', { value: 1, dims: DIMS.length, prefixed: true }],
  ['A', { value: 1, dims: DIMS.current, prefixed: true }],
  ['V', { value: 1, dims: DIMS.voltage, prefixed: true }],
  ['VA', { value: 1, dims: DIMS['apparent-power'], prefixed: true }],
  ['W', { value: 1, dims: DIMS.power, prefixed: true }],
  ['s', { value: 1, dims: DIMS.time, prefixed: true }],
  ['Hz', { value: 1, dims: DIMS.frequency, prefixed: true }],
  ['ohm', { value: 1, dims: DIMS.impedance, prefixed: true }],
  ['degC', { value: 1, dims: DIMS.temperature, prefixed: false }],
  ['ft', { value: 0.3048, dims: DIMS.length, prefixed: false }],
  ['in', { value: 0.0254, dims: DIMS.length, prefixed: false }],
  ['min', { value: 60, dims: DIMS.time, prefixed: false }],
  ['h', { value: 3600, dims: DIMS.time, prefixed: false }],
]);

/** SI prefixes (SI Brochure, 9th edition, Table 7), as mathjs writes their values. */
const PREFIXES: ReadonlyMap<string, number> = new Map([
  ['da', 1e1], ['h', 1e2], ['k', 1e3], ['M', 1e6], ['G', 1e9], ['T', 1e12], ['P', 1e15], ['E', 1e18], ['Z', 1e21], ['Y', 1e24],
  ['d', 1e-1], ['c', 1e-2], ['m', 1e-3], ['u', 1e-6], ['n', 1e-9], ['p', 1e-12], ['f', 1e-15], ['a', 1e-18], ['z', 1e-21], ['y', 1e-24],
]);

/** The units our reader and mathjs both read, for the test that holds the reader to mathjs. */
export function ownUnitNames(): string[] {
  const names: string[] = [];
  for (const [name, unit] of KNOWN_UNITS) {
    names.push(name);
    if (unit.prefixed) for (const prefix of PREFIXES.keys()) names.push(prefix + name);
  }
  return names;
}

function findOwnUnit(name: string): { value: number; prefix: number; dims: Dims } | undefined {
  const exact = KNOWN_UNITS.get(name);
  if (exact !== undefined) return { value: exact.value, prefix: 1, dims: exact.dims };
  for (const [base, unit] of KNOWN_UNITS) {
    if (!unit.prefixed || !name.endsWith(base)) continue;
    const prefix = PREFIXES.get(name.slice(0, name.length - base.length));
    if (prefix !== undefined) return { value: unit.value, prefix, dims: unit.dims };
  }
  return undefined;
}

interface ReadUnitText {
  dims: (dimension: Dimension) => boolean; // true where the unit is of that dimension
  toSi: (magnitude: number, dimension: Dimension) => number;
}

/**
 * Our own reading of a (normalised) unit text; undefined where it is not of the plain form we read:
 * unit names, each with an optional power of 1 to 9, joined by spaces, "*" or "/", where "/" puts only
 * the next unit in the denominator, as mathjs reads it.
 */
function readOwnUnit(text: string): ReadUnitText | undefined {
  const terms: Array<{ factor: number; power: number; dims: Dims }> = [];
  const scan = /\s*(?:([*/])|([A-Za-z]+)(?:\s*\^\s*([1-9])(?![\d.]))?)/y;
  let sign = 1;
  let expectingTerm = true; // at the start, and after "*" or "/"
  let at = 0;
  const end = text.trimEnd().length;
  while (at < end) {
    scan.lastIndex = at;
    const match = scan.exec(text);
    if (match === null || match.index !== at) return undefined;
    at = scan.lastIndex;
    if (match[1] !== undefined) {
      if (expectingTerm) return undefined;
      sign = match[1] === '/' ? -1 : 1;
      expectingTerm = true;
      continue;
    }
    const unit = findOwnUnit(match[2]!);
    if (unit === undefined) return undefined;
    terms.push({ factor: unit.value * unit.prefix, power: sign * Number(match[3] ?? '1'), dims: unit.dims });
    sign = 1;
    expectingTerm = false;
  }
  if (expectingTerm || terms.length === 0) return undefined;
  // A temperature only alone and to the first power: its offset makes products meaningless.
  const temperature = terms.some((term) => term.dims[4] !== 0);
  if (temperature && (terms.length > 1 || terms[0]!.power !== 1 || terms[0]!.factor !== 1)) return undefined;
  const dims = [0, 0, 0, 0, 0];
  for (const term of terms) for (let d = 0; d < 5; d++) dims[d]! += term.dims[d]! * term.power;
  return {
    dims: (dimension) => DIMS[dimension].every((power, d) => power === dims[d]),
    // As mathjs: the magnitude times each term's (value x prefix)^power, in the order written; the SI
    // units it converts to have a factor of one.
    toSi: (magnitude) => terms.reduce((value, term) => value * Math.pow(term.factor, term.power), magnitude),
  };
}

const referenceUnits = new Map<Dimension, Unit>();
function referenceUnit(library: MathUnit, dimension: Dimension): Unit {
  let ref = referenceUnits.get(dimension);
  if (ref === undefined) {
    ref = library(1, DIMENSIONS[dimension].siUnit);
    referenceUnits.set(dimension, ref);
  }
  return ref;
}

/**
 * Spellings the trade writes that mathjs does not read: "mm2"/"mm²" for mm^2, "A2s"/"A²s" for
 * A^2 s, "Ω" for ohm, "µ" for the micro prefix, "·" as a product.
 */
export function normaliseUnitText(text: string): string {
  return text
    .replace(/°\s*C\b/g, 'degC')
    .replace(/°\s*F\b/g, 'degF')
    .replace(/Ω/g, 'ohm')
    .replace(/[µμ]/g, 'u')
    .replace(/²/g, '^2')
    .replace(/³/g, '^3')
    .replace(/·/g, ' ')
    .replace(/(?<=[A-Za-z])([23])(?![\d.])/g, '^$1')
    .replace(/\^([23])(?=[A-Za-z])/g, '^$1 ');
}

/** A unit text read by our reader, else by mathjs; not ok where neither reads it. */
function readUnit(unitText: string, own = true): { ok: true; unit: ReadUnitText } | { ok: false; detail: string } {
  const text = normaliseUnitText(unitText);
  const ours = own ? readOwnUnit(text) : undefined;
  if (ours !== undefined) return { ok: true, unit: ours };
  const library = mathUnit;
  if (library === undefined) throw new UnitLibraryNeeded(unitText);
  let unit: Unit;
  try {
    unit = library(1, text);
  } catch (error) {
    return { ok: false, detail: error instanceof Error ? error.message : String(error) };
  }
  return {
    ok: true,
    unit: {
      dims: (dimension) => unit.equalBase(referenceUnit(library, dimension)),
      // Temperatures carry an offset (degC, degF, K): convert the value, not the unit's size.
      toSi: (magnitude, dimension) => library(magnitude, text).toNumber(DIMENSIONS[dimension].siUnit),
    },
  };
}

/** Test hook: the SI value of a magnitude in a unit text as our own reader reads it (undefined where it
 * does not read the text or the text is not of the dimension). */
export function ownReading(unitText: string, dimension: Dimension, magnitude: number): number | undefined {
  const read = readOwnUnit(normaliseUnitText(unitText));
  return read !== undefined && read.dims(dimension) ? read.toSi(magnitude, dimension) : undefined;
}

/** Test hook: the same as mathjs alone reads it (undefined where it does not, or not of the dimension). */
export function libraryReading(unitText: string, dimension: Dimension, magnitude: number): number | undefined {
  const read = readUnit(unitText, false);
  return read.ok && read.unit.dims(dimension) ? read.unit.toSi(magnitude, dimension) : undefined;
}

/** "45 m" -> 45 and "m"; a text that is no number, or a number without its unit, is a problem. */
function splitNumberAndUnit(text: string): { ok: true; magnitude: number; unitText: string } | { ok: false; problem: 'not-a-number' | 'missing-unit' } {
  const match = NUMBER_THEN_UNIT.exec(text);
  if (match === null) return { ok: false, problem: 'not-a-number' };
  const magnitude = Number(match[1]);
  const unitText = match[2]!;
  if (!Number.isFinite(magnitude)) return { ok: false, problem: 'not-a-number' };
  if (unitText === '') return { ok: false, problem: 'missing-unit' };
  return { ok: true, magnitude, unitText };
}

/** A number followed by a unit of the given dimension, converted to SI. */
export function parseQuantity(text: string, dimension: Dimension): QuantityResult {
  const split = splitNumberAndUnit(text);
  if (!split.ok) return split;
  const { magnitude, unitText } = split;
  const read = readUnit(unitText);
  if (!read.ok) return { ok: false, problem: 'unknown-unit', detail: unitText };
  const { unit } = read;
  if (!unit.dims(dimension)) return { ok: false, problem: 'wrong-dimension', detail: unitText };
  const value = unit.toSi(magnitude, dimension);
  if (!Number.isFinite(value)) return { ok: false, problem: 'not-a-number' };
  return { ok: true, value: withoutConversionNoise(value) };
}

/** 0.07 ohm/km is 7e-5 ohm/m, not 7.000000000000001e-5: 12 significant figures are kept. */
export function withoutConversionNoise(value: number): number {
  return value === 0 ? 0 : Number(value.toPrecision(12));
}

/** A unit alone ("kA", "ms", "A^2 s"): the SI value of one of it. */
export function parseUnitFactor(unitText: string, dimension: Dimension): QuantityResult {
  if (unitText.trim() === '') return { ok: false, problem: 'missing-unit' };
  // "10 A" is a quantity, not a unit: mathjs would read it as the unit A and drop the number.
  if (/^\s*[+-]?(\d|\.\d)/.test(unitText)) return { ok: false, problem: 'unknown-unit', detail: unitText.trim() };
  const read = readUnit(unitText.trim());
  if (!read.ok) return { ok: false, problem: 'unknown-unit', detail: unitText };
  if (!read.unit.dims(dimension)) return { ok: false, problem: 'wrong-dimension', detail: unitText };
  return { ok: true, value: withoutConversionNoise(read.unit.toSi(1, dimension)) };
}

/** "5.75 %" -> 5.75 (the number of percent; the field decides whether it wants a fraction). */
export function parsePercent(text: string): QuantityResult {
  const split = splitNumberAndUnit(text);
  if (!split.ok) return split;
  const { magnitude, unitText } = split;
  if (unitText !== '%' && unitText !== 'percent') {
    return { ok: false, problem: 'wrong-dimension', detail: unitText };
  }
  return { ok: true, value: magnitude };
}

/** "10 x In" (also "10xIn", "10 × In", "10 * In"): the multiple; undefined if not that form. */
export function parseMultipleOfRating(text: string): number | undefined {
  const match = /^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*[x×*]\s*(?:In|I_n)\s*$/.exec(text);
  if (match === null) return undefined;
  const multiple = Number(match[1]);
  return Number.isFinite(multiple) ? multiple : undefined;
}

/** "x In" (or "xIn", "× In", "* In") as a curve's current unit. */
export function isMultipleOfRatingUnit(text: string): boolean {
  return /^\s*[x×*]\s*(?:In|I_n)\s*$/.test(text);
}

/** Numbers as the sheet and the defaults record print them: up to 6 significant figures. */
export function formatNumber(value: number): string {
  if (value === 0) return '0';
  return String(Number(value.toPrecision(6)));
}
