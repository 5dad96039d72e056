// Display formatting of SI values for the sheets: the unit converted once, here, with the
// significant figures a checker expects. Output is sheet markup (see typeset.ts): "^8" becomes a
// superscript, "A^2 s" becomes A²s, "mohm" becomes mΩ.

// A value that is missing (null, undefined) or not a finite number (NaN, ±Infinity: a solver
// result that could not be determined) is shown as NONE, never as "NaN" or "Infinity"; a traced
// quantity without a value reads "undetermined" (as the sheet's checks do).

const NONE = '—';
const UNDETERMINED = 'undetermined';

/** Magnitudes shown in scientific form by the fixed-notation formatters (toFixed has no room for them). */
const FIXED_MAX = 1e15;
const FIXED_MIN = 1e-6;

const shown = (x: number | null | undefined): x is number => typeof x === 'number' && Number.isFinite(x);

/** "-0.0" is "0.0": a rounded negative zero has no sign. */
const unsigned = (text: string): string => (/^-0(?:\.0+)?$/.test(text) ? text.slice(1) : text);

/** `x` with `decimals` decimals; beyond the fixed range in scientific form. */
function fixed(x: number, decimals: number): string {
  if (x !== 0 && (Math.abs(x) >= FIXED_MAX || Math.abs(x) < FIXED_MIN)) return scientific(x);
  return unsigned(x.toFixed(decimals));
}

/**
 * `x` rounded to `sig` significant figures, in fixed notation (never exponent form); magnitudes
 * of 10^15 and more or below 10^-6 in the scientific form "1.85 x 10^8".
 */
export function significant(x: number | null | undefined, sig = 3): string {
  if (!shown(x)) return NONE;
  if (x === 0) return '0';
  const rounded = Number(x.toPrecision(sig));
  if (Math.abs(rounded) >= FIXED_MAX || Math.abs(rounded) < FIXED_MIN) return scientific(x, sig);
  const exponent = Math.floor(Math.log10(Math.abs(rounded)));
  const decimals = Math.max(0, sig - 1 - exponent);
  return unsigned(rounded.toFixed(decimals));
}

/** Scientific form with a 3-figure mantissa: 1.85e8 -> "1.85 x 10^8". */
export function scientific(x: number | null | undefined, sig = 3): string {
  if (!shown(x)) return NONE;
  if (x === 0) return '0';
  const [mantissa, exponent] = x.toExponential(sig - 1).split('e');
  return `${mantissa} x 10^${Number(exponent)}`;
}

/** A current in A shown in kA with 3 significant figures. */
export function kiloamps(a: number | null | undefined): string {
  return shown(a) ? `${significant(a / 1000)} kA` : NONE;
}

/** An impedance in ohm shown in milliohm, 3 significant figures, without the unit. */
export function milliohmNumber(ohm: number | null | undefined): string {
  return shown(ohm) ? significant(ohm * 1000) : NONE;
}

export function milliohms(ohm: number | null | undefined): string {
  return shown(ohm) ? `${milliohmNumber(ohm)} mohm` : NONE;
}

/** An energy in A^2 s in scientific form: "1.85 x 10^8 A^2 s". */
export function energy(a2s: number | null | undefined): string {
  return shown(a2s) ? `${scientific(a2s)} A^2 s` : NONE;
}

/** A length in m with one decimal. */
export function metres(m: number | null | undefined): string {
  return shown(m) ? `${fixed(m, 1)} m` : NONE;
}

/** A time in s: below 0.1 s in ms, else in s, 3 significant figures. */
export function seconds(s: number | null | undefined): string {
  if (!shown(s)) return NONE;
  return s < 0.1 ? `${significant(s * 1000)} ms` : `${significant(s)} s`;
}

export function percent(p: number | null | undefined): string {
  return shown(p) ? `${fixed(p, 2)} %` : NONE;
}

/** A plain current in A (device ratings): whole amperes below 10 kA, else kA. */
export function amps(a: number | null | undefined): string {
  if (!shown(a)) return NONE;
  return a >= 10_000 ? kiloamps(a) : `${significant(a, a === 0 ? 3 : Math.min(5, Math.max(3, Math.floor(Math.log10(Math.abs(a))) + 1)))} A`;
}

/** 4 significant figures without trailing zeros after the decimal point: 11.00 -> "11". */
function trimmed(x: number): string {
  const s = significant(x, 4);
  return s.includes('.') && !s.includes(' x 10^') ? s.replace(/\.?0+$/, '') : s;
}

export function volts(v: number | null | undefined): string {
  if (!shown(v)) return NONE;
  return v >= 1000 ? `${trimmed(v / 1000)} kV` : `${trimmed(v)} V`;
}

/** Apparent power: MVA from `mvaFrom` up (network fault levels), else kVA (transformer ratings). */
export function voltAmps(va: number | null | undefined, mvaFrom = 1e6): string {
  if (!shown(va)) return NONE;
  return va >= mvaFrom ? `${trimmed(va / 1e6)} MVA` : `${trimmed(va / 1e3)} kVA`;
}

export function watts(w: number | null | undefined): string {
  if (!shown(w)) return NONE;
  return w >= 1000 ? `${significant(w / 1000, 3)} kW` : `${significant(w, 3)} W`;
}

/** An area in m^2 shown in mm^2. */
export function squareMillimetres(m2: number | null | undefined): string {
  if (!shown(m2)) return NONE;
  return `${significant(m2 * 1e6, 3)} mm2`;
}

/** ohm per metre shown in ohm/km with 3 significant figures. */
export function ohmsPerKm(ohmPerM: number | null | undefined): string {
  if (!shown(ohmPerM)) return NONE;
  return `${significant(ohmPerM * 1000, 3)} ohm/km`;
}

/** A dimensionless factor (c, kappa, ratios). */
export function factor(x: number | null | undefined, sig = 3): string {
  return shown(x) ? significant(x, sig) : NONE;
}

/** A value with the unit named in a Traced quantity (SI text), in the unit the sheet uses. */
export function quantity(value: number | null | undefined, unit: string): string {
  if (!shown(value)) return UNDETERMINED;
  switch (unit.replace(/\s+/g, ' ').trim()) {
    case 'A':
      return kiloamps(value);
    case 'ohm':
      return milliohms(value);
    case 'A^2 s':
    case 'A2s':
      return energy(value);
    case 's':
      return seconds(value);
    case 'm':
      return metres(value);
    case '%':
      return percent(value);
    case 'm^2':
      return squareMillimetres(value);
    case 'ohm/m':
      return ohmsPerKm(value);
    case 'V':
      return volts(value);
    case 'VA':
      return voltAmps(value);
    case '':
      return significant(value, 3);
    default:
      return `${significant(value, 3)} ${unit}`;
  }
}
