// Dimensional values written as text with a unit ("45 m", "95 mm2", "1.5e5 A^2 s"), parsed with
// mathjs and converted once, here, to SI numbers (FORMAT.md: units are resolved at the edge).

import { createRequire } from 'node:module';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { MathJsInstance, Unit } from 'mathjs';

// Only mathjs's unit machinery is built: the package's entry point creates every function it has at
// import, which costs most of a second at start-up. Its files are imported by path, since the
// package's export map offers no partial entry.
const mathjsRoot = path.dirname(createRequire(import.meta.url).resolve('mathjs/package.json'));
const fromMathjs = async (file: string) => import(pathToFileURL(path.join(mathjsRoot, 'lib', 'esm', file)).href);
const { create } = (await fromMathjs('core/create.js')) as { create: (factories: object) => MathJsInstance };
const { unitDependencies } = (await fromMathjs('entry/dependenciesAny/dependenciesUnitFunction.generated.js')) as { unitDependencies: object };
const mathUnit = create({ unitDependencies }).unit;

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

const referenceUnits = new Map<Dimension, Unit>();
function referenceUnit(dimension: Dimension): Unit {
  let ref = referenceUnits.get(dimension);
  if (ref === undefined) {
    ref = mathUnit(1, DIMENSIONS[dimension].siUnit);
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

function readUnit(unitText: string): { ok: true; unit: Unit } | { ok: false; detail: string } {
  try {
    return { ok: true, unit: mathUnit(1, normaliseUnitText(unitText)) };
  } catch (error) {
    return { ok: false, detail: error instanceof Error ? error.message : String(error) };
  }
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
  const ref = referenceUnit(dimension);
  if (!unit.equalBase(ref)) return { ok: false, problem: 'wrong-dimension', detail: unitText };
  // Temperatures carry an offset (degC, degF, K): convert the value, not the unit's size.
  const value = mathUnit(magnitude, normaliseUnitText(unitText)).toNumber(DIMENSIONS[dimension].siUnit);
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
  if (!read.unit.equalBase(referenceUnit(dimension))) {
    return { ok: false, problem: 'wrong-dimension', detail: unitText };
  }
  return { ok: true, value: withoutConversionNoise(read.unit.toNumber(DIMENSIONS[dimension].siUnit)) };
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
