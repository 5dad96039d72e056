// Display formatting of SI values for the sheets: the unit converted once, here, with the
// significant figures a checker expects. Output is sheet markup (see typeset.ts): "^8" becomes a
// superscript, "A^2 s" becomes A²s, "mohm" becomes mΩ.

/** `x` rounded to `sig` significant figures, in fixed notation (never exponent form). */
export function significant(x: number, sig = 3): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const rounded = Number(x.toPrecision(sig));
  const exponent = Math.floor(Math.log10(Math.abs(rounded)));
  const decimals = Math.max(0, sig - 1 - exponent);
  return rounded.toFixed(decimals);
}

/** Scientific form with a 3-figure mantissa: 1.85e8 -> "1.85 x 10^8". */
export function scientific(x: number, sig = 3): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  let exponent = Math.floor(Math.log10(Math.abs(x)));
  let mantissa = x / 10 ** exponent;
  if (Math.abs(Number(mantissa.toFixed(sig - 1))) >= 10) {
    exponent += 1;
    mantissa = x / 10 ** exponent;
  }
  return `${mantissa.toFixed(sig - 1)} x 10^${exponent}`;
}

const NONE = '—';

/** A current in A shown in kA with 3 significant figures. */
export function kiloamps(a: number | null | undefined): string {
  return a == null ? NONE : `${significant(a / 1000)} kA`;
}

/** An impedance in ohm shown in milliohm, 3 significant figures, without the unit. */
export function milliohmNumber(ohm: number): string {
  return significant(ohm * 1000);
}

export function milliohms(ohm: number | null | undefined): string {
  return ohm == null ? NONE : `${milliohmNumber(ohm)} mohm`;
}

/** An energy in A^2 s in scientific form: "1.85 x 10^8 A^2 s". */
export function energy(a2s: number | null | undefined): string {
  return a2s == null ? NONE : `${scientific(a2s)} A^2 s`;
}

/** A length in m with one decimal. */
export function metres(m: number | null | undefined): string {
  return m == null ? NONE : `${m.toFixed(1)} m`;
}

/** A time in s: below 0.1 s in ms, else in s, 3 significant figures. */
export function seconds(s: number | null | undefined): string {
  if (s == null) return NONE;
  return s < 0.1 ? `${significant(s * 1000)} ms` : `${significant(s)} s`;
}

export function percent(p: number | null | undefined): string {
  return p == null ? NONE : `${p.toFixed(2)} %`;
}

/** A plain current in A (device ratings): whole amperes below 10 kA, else kA. */
export function amps(a: number | null | undefined): string {
  if (a == null) return NONE;
  return a >= 10_000 ? kiloamps(a) : `${significant(a, Math.max(3, Math.floor(Math.log10(a)) + 1))} A`;
}

/** 4 significant figures without trailing zeros after the decimal point: 11.00 -> "11". */
function trimmed(x: number): string {
  const s = significant(x, 4);
  return s.includes('.') ? s.replace(/\.?0+$/, '') : s;
}

export function volts(v: number): string {
  return v >= 1000 ? `${trimmed(v / 1000)} kV` : `${trimmed(v)} V`;
}

/** Apparent power: MVA from `mvaFrom` up (network fault levels), else kVA (transformer ratings). */
export function voltAmps(va: number, mvaFrom = 1e6): string {
  return va >= mvaFrom ? `${trimmed(va / 1e6)} MVA` : `${trimmed(va / 1e3)} kVA`;
}

export function watts(w: number): string {
  return w >= 1000 ? `${significant(w / 1000, 3)} kW` : `${significant(w, 3)} W`;
}

/** An area in m^2 shown in mm^2. */
export function squareMillimetres(m2: number): string {
  return `${significant(m2 * 1e6, 3)} mm2`;
}

/** ohm per metre shown in ohm/km with 3 significant figures. */
export function ohmsPerKm(ohmPerM: number): string {
  return `${significant(ohmPerM * 1000, 3)} ohm/km`;
}

/** A dimensionless factor (c, kappa, ratios). */
export function factor(x: number | null | undefined, sig = 3): string {
  return x == null ? NONE : significant(x, sig);
}

/** A value with the unit named in a Traced quantity (SI text), in the unit the sheet uses. */
export function quantity(value: number | null, unit: string): string {
  if (value == null) return 'undetermined';
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
