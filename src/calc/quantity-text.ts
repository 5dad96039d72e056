// Number-to-text for the working shown on a sheet (substitutions): engineering prefixes, significant figures.
// Pure and locale-independent, so the same inputs always give the same text.

/** A number rounded to `sig` significant figures, without exponent for ordinary magnitudes. */
export function sig(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return '0';
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  if (magnitude >= 6 || magnitude <= -4) return sci(value, digits);
  const decimals = Math.max(0, digits - 1 - magnitude);
  return trimZeros(value.toFixed(decimals));
}

/** Scientific form "1.85×10^8" (the report may typeset the exponent as a superscript). */
export function sci(value: number, digits = 3): string {
  if (value === 0) return '0';
  const exponent = Math.floor(Math.log10(Math.abs(value)));
  let mantissa = value / 10 ** exponent;
  let exp = exponent;
  let text = trimZeros(mantissa.toFixed(digits - 1));
  if (Math.abs(Number(text)) >= 10) {
    exp += 1;
    mantissa = value / 10 ** exp;
    text = trimZeros(mantissa.toFixed(digits - 1));
  }
  return `${text}×10^${exp}`;
}

function trimZeros(text: string): string {
  return text.includes('.') ? text.replace(/0+$/, '').replace(/\.$/, '') : text;
}

export const fmt = {
  current: (a: number) => (Math.abs(a) >= 1000 ? `${sig(a / 1000, 4)} kA` : `${sig(a, 4)} A`),
  ohm: (ohm: number) => `${sig(ohm * 1000, 4)} mΩ`,
  voltage: (v: number) => (v >= 1000 ? `${sig(v / 1000, 4)} kV` : `${sig(v, 4)} V`),
  power: (va: number, unit: 'VA' | 'W') =>
    va >= 1e6 ? `${sig(va / 1e6, 4)} M${unit}` : va >= 1e3 ? `${sig(va / 1e3, 4)} k${unit}` : `${sig(va, 4)} ${unit}`,
  energy: (a2s: number) => `${sci(a2s, 3)} A²s`,
  time: (s: number) => (s < 0.1 ? `${sig(s * 1000, 3)} ms` : `${sig(s, 3)} s`),
  length: (m: number) => `${sig(m, 4)} m`,
  area: (m2: number) => `${sig(m2 * 1e6, 4)} mm²`,
  percent: (p: number) => `${sig(p, 3)} %`,
  plain: (x: number, digits = 4) => sig(x, digits),
};
