// Conductor sizes as written ("95 mm2", "4/0 AWG", "2/0", "250 kcmil") resolved to a nominal area,
// and the tabulated resistance at 20 degC of a size (IEC 60228 Table 2 or NFPA 70 Ch. 9 Table 8).

import { parseAwgLabel, nfpaResistance20, NFPA_TABLE8_REFERENCE } from '../data/awg.js';
import { tabulatedResistance20 } from '../data/iec60228.js';
import type { Conductor, ConductorSize } from './types.js';
import { formatNumber, inRange, parseQuantity, withoutConversionNoise, type QuantityProblem } from './units.js';

export const IEC60228_REFERENCE = 'IEC 60228:2004 Table 2 (class 2)';

export type SizeResult =
  | { ok: true; size: ConductorSize }
  | { ok: false; problem: QuantityProblem | 'not-positive' | 'unknown-size' | 'out-of-range' };

/** "2/0" alone is understood as AWG (FORMAT.md); "250 MCM" as kcmil. */
function awgOrKcmil(text: string): ReturnType<typeof parseAwgLabel> {
  const trimmed = text.trim();
  const withSystem = /^[1-4]\/0$/.test(trimmed) ? `${trimmed} AWG` : trimmed;
  return parseAwgLabel(withSystem);
}

export function parseConductorSize(text: string): SizeResult {
  const american = awgOrKcmil(text);
  if (american !== undefined) {
    return {
      ok: true,
      size: { label: american.label, system: american.system, area: withoutConversionNoise(american.areaMm2 / 1e6) },
    };
  }
  if (/awg|kcmil|mcm/i.test(text)) return { ok: false, problem: 'unknown-size' };
  const metric = parseQuantity(text, 'area');
  if (!metric.ok) return { ok: false, problem: metric.problem };
  if (!(metric.value > 0)) return { ok: false, problem: 'not-positive' };
  if (!inRange('area', metric.value)) return { ok: false, problem: 'out-of-range' };
  // Round away conversion noise (0.95 cm2 -> 95 mm2) so the size matches its table row.
  const areaMm2 = Number((metric.value * 1e6).toPrecision(10));
  return { ok: true, size: { label: `${formatNumber(areaMm2)} mm2`, system: 'metric', area: withoutConversionNoise(areaMm2 / 1e6) } };
}

/** Resistance at 20 degC of one conductor, ohm/m, from the size's table; undefined if not tabulated. */
export function tabulatedResistance(
  conductor: Conductor,
  size: ConductorSize,
): { resistance20: number; source: string } | undefined {
  if (size.system === 'metric') {
    const ohmPerKm = tabulatedResistance20(conductor, Number((size.area * 1e6).toPrecision(10)));
    return ohmPerKm === undefined ? undefined : { resistance20: withoutConversionNoise(ohmPerKm / 1000), source: IEC60228_REFERENCE };
  }
  const ohmPerKm = nfpaResistance20(conductor, size.label);
  return ohmPerKm === undefined ? undefined : { resistance20: withoutConversionNoise(ohmPerKm / 1000), source: NFPA_TABLE8_REFERENCE };
}

export function tableNameFor(size: ConductorSize): string {
  return size.system === 'metric' ? IEC60228_REFERENCE : NFPA_TABLE8_REFERENCE;
}
