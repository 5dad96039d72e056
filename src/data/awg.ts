// Sources:
//  - ASTM B258 (standard nominal diameters and cross-sectional areas of AWG sizes of solid round
//    wires): d_n = 0.127 mm x 92^((36 - n) / 39), with 1/0 = 0, 2/0 = -1, 3/0 = -2, 4/0 = -3.
//    Areas here come from that formula (not the table's rounded figures).
//  - kcmil: 1 circular mil = pi/4 x (0.0254 mm)^2 = 5.06707479e-4 mm2 (definition).
//  - NFPA 70 (2023), National Electrical Code, Chapter 9 Table 8 "Conductor Properties":
//    DC resistance at 75 degC, ohm/km, "Uncoated copper" and "Aluminum", stranded conductors
//    (for 18 AWG to 8 AWG the table has a solid and a stranded row; the stranded row is used).
//    Table 8 footnote (note 2) used for the referral to 20 degC:
//    R2 = R1 [1 + alpha (T2 - 75)], alpha_cu = 0.00323, alpha_al = 0.00330 (per degC at 75 degC).
//    Values transcribed from memory, as printed; their internal consistency is checked in
//    tests/data/awg.test.ts against the ohm/kFT column of the same table and against R x cmil.

export type AwgSystem = 'awg' | 'kcmil';

export interface AwgKcmilSize {
  label: string; // "14 AWG", "1/0 AWG", "250 kcmil"
  system: AwgSystem;
  areaMm2: number;
  circularMils: number;
  copper75: number; // ohm/km at 75 degC, uncoated copper, stranded
  aluminium75?: number; // ohm/km at 75 degC, aluminium, stranded
}

export const MM2_PER_CIRCULAR_MIL = (Math.PI / 4) * 0.0254 ** 2; // 5.06707479e-4

/** Gauge numbers 0000..40 as ASTM B258 numbers them: "4/0" -> -3, ..., "1/0" -> 0. */
export function awgDiameterMm(gauge: number): number {
  return 0.127 * 92 ** ((36 - gauge) / 39);
}

export function awgCircularMils(gauge: number): number {
  const diameterMils = 5 * 92 ** ((36 - gauge) / 39); // 0.127 mm = 5 mils
  return diameterMils ** 2;
}

function awgLabel(gauge: number): string {
  return gauge <= 0 ? `${1 - gauge}/0 AWG` : `${gauge} AWG`;
}

function kcmilLabel(kcmil: number): string {
  return `${kcmil} kcmil`;
}

function awgRow(gauge: number, copper75: number, aluminium75: number): AwgKcmilSize {
  const circularMils = awgCircularMils(gauge);
  return Object.freeze({ label: awgLabel(gauge), system: 'awg', areaMm2: circularMils * MM2_PER_CIRCULAR_MIL, circularMils, copper75, aluminium75 });
}

function kcmilRow(kcmil: number, copper75: number, aluminium75: number): AwgKcmilSize {
  const circularMils = kcmil * 1000;
  return Object.freeze({ label: kcmilLabel(kcmil), system: 'kcmil', areaMm2: circularMils * MM2_PER_CIRCULAR_MIL, circularMils, copper75, aluminium75 });
}

/** NFPA 70 (2023) Chapter 9 Table 8 rows, ascending area; resistances in ohm/km at 75 degC. */
export const AWG_KCMIL_SIZES: ReadonlyArray<AwgKcmilSize> = Object.freeze([
  awgRow(18, 26.1, 42.8),
  awgRow(16, 16.4, 26.9),
  awgRow(14, 10.3, 16.9),
  awgRow(12, 6.5, 10.69),
  awgRow(10, 4.07, 6.679),
  awgRow(8, 2.551, 4.204),
  awgRow(6, 1.608, 2.652),
  awgRow(4, 1.01, 1.666),
  awgRow(3, 0.802, 1.32),
  awgRow(2, 0.634, 1.045),
  awgRow(1, 0.505, 0.829),
  awgRow(0, 0.399, 0.66), // 1/0
  awgRow(-1, 0.317, 0.523), // 2/0
  awgRow(-2, 0.2512, 0.413), // 3/0
  awgRow(-3, 0.1996, 0.328), // 4/0
  kcmilRow(250, 0.1687, 0.2778),
  kcmilRow(300, 0.1409, 0.2318),
  kcmilRow(350, 0.1205, 0.1984),
  kcmilRow(400, 0.1053, 0.1737),
  kcmilRow(500, 0.0845, 0.1391),
  kcmilRow(600, 0.0704, 0.1159),
  kcmilRow(700, 0.0603, 0.0994),
  kcmilRow(750, 0.0563, 0.0927),
  kcmilRow(800, 0.0528, 0.0868),
  kcmilRow(900, 0.047, 0.077),
  kcmilRow(1000, 0.0423, 0.0695),
  kcmilRow(1250, 0.0338, 0.0554),
  kcmilRow(1500, 0.0281, 0.0464),
  kcmilRow(1750, 0.0241, 0.0397),
  kcmilRow(2000, 0.0211, 0.0348),
]);

/** Temperature coefficients at 75 degC of NFPA 70 Chapter 9 Table 8, footnote (note 2). */
export const NFPA_TABLE8_ALPHA = Object.freeze({ copper: 0.00323, aluminium: 0.0033 });
export const NFPA_TABLE8_REFERENCE = 'NFPA 70 (2023) Chapter 9 Table 8, referred to 20 degC by its note 2';

const AWG_PATTERNS = [
  /^#?\s*(\d{1,4}|[1-4]\/0)\s*awg$/i, // "14 AWG", "4/0AWG", "0000 AWG"
  /^awg\s*#?\s*(\d{1,4}|[1-4]\/0)$/i, // "AWG 14", "AWG 4/0"
];
const KCMIL_PATTERN = /^(\d+(?:\.\d+)?)\s*(?:kcmil|mcm)$/i;

function gaugeNumber(text: string): number | undefined {
  if (/^[1-4]\/0$/.test(text)) return 1 - Number(text[0]);
  if (/^0{1,4}$/.test(text)) return 1 - text.length; // "0" = 1/0 ... "0000" = 4/0
  if (/^0/.test(text)) return undefined; // "01" and the like
  const n = Number(text);
  return n >= 1 && n <= 40 ? n : undefined;
}

/**
 * Parses an AWG or kcmil size ("4/0 AWG", "4/0AWG", "0000 AWG", "2 AWG", "250 kcmil", "250kcmil",
 * case-insensitive) into a normalised label and its area. AWG 0000..40 parses through the
 * ASTM B258 formula whether or not Table 8 lists it; any positive kcmil parses.
 */
export function parseAwgLabel(text: string): { label: string; system: AwgSystem; areaMm2: number } | undefined {
  const trimmed = text.trim();
  for (const pattern of AWG_PATTERNS) {
    const m = pattern.exec(trimmed);
    if (m === null) continue;
    const gauge = gaugeNumber(m[1]!);
    if (gauge === undefined) return undefined;
    return { label: awgLabel(gauge), system: 'awg', areaMm2: awgCircularMils(gauge) * MM2_PER_CIRCULAR_MIL };
  }
  const k = KCMIL_PATTERN.exec(trimmed);
  if (k !== null) {
    const kcmil = Number(k[1]);
    if (!(kcmil > 0) || !Number.isFinite(kcmil)) return undefined;
    return { label: kcmilLabel(kcmil), system: 'kcmil', areaMm2: kcmil * 1000 * MM2_PER_CIRCULAR_MIL };
  }
  return undefined;
}

/** Table 8 DC resistance at 75 degC referred to 20 degC with note 2, ohm/km; undefined if not tabulated. */
export function nfpaResistance20(conductor: 'copper' | 'aluminium', label: string): number | undefined {
  const parsed = parseAwgLabel(label);
  if (parsed === undefined) return undefined;
  const row = AWG_KCMIL_SIZES.find((r) => r.label === parsed.label);
  const r75 = row === undefined ? undefined : conductor === 'copper' ? row.copper75 : row.aluminium75;
  if (r75 === undefined) return undefined;
  return r75 * (1 + NFPA_TABLE8_ALPHA[conductor] * (20 - 75));
}

/** Sizes offered as alternatives, ascending area: 14 AWG to 4/0 AWG, 250 to 1000 kcmil (Table 8 rows). */
export const AWG_STANDARD_SIZES: readonly string[] = Object.freeze(
  AWG_KCMIL_SIZES.slice(
    AWG_KCMIL_SIZES.findIndex((r) => r.label === '14 AWG'),
    AWG_KCMIL_SIZES.findIndex((r) => r.label === '1000 kcmil') + 1,
  ).map((r) => r.label),
);
