// Source: IEC 60228:2004 (3rd edition), "Conductors of insulated cables", Table 2 — Class 2
// stranded conductors, maximum resistance of conductor at 20 degC, ohm/km.
// Columns used: "Annealed copper conductor, plain wires" (not metal-coated) and "Aluminium or
// aluminium alloy conductor". The table gives aluminium from 10 mm2 upward only.
// The metal-coated copper column and the minimum numbers of wires are not reproduced.
// Values transcribed from memory of the published table, each as printed (3 significant figures).
// Rows 1200 mm2 to 2500 mm2 are recalled with less certainty than the rows up to 1000 mm2
// (from memory); the aluminium value for 2500 mm2 is deliberately left out: the figure recalled
// (0.0127) is inconsistent with the Al/Cu ratio of every other row, so it is not tabulated here
// and a user of that size must state the resistance.
// Checked in tests/data/iec60228.test.ts against spot values and the resistivity of IEC 60028.

export interface Class2ConductorRow {
  areaMm2: number; // nominal cross-sectional area
  copper: number; // ohm/km at 20 degC, plain annealed copper wires
  aluminium?: number; // ohm/km at 20 degC, aluminium or aluminium alloy; absent where the table has none
}

export const IEC60228_CLASS2: ReadonlyArray<Class2ConductorRow> = Object.freeze([
  { areaMm2: 0.5, copper: 36.0 },
  { areaMm2: 0.75, copper: 24.5 },
  { areaMm2: 1, copper: 18.1 },
  { areaMm2: 1.5, copper: 12.1 },
  { areaMm2: 2.5, copper: 7.41 },
  { areaMm2: 4, copper: 4.61 },
  { areaMm2: 6, copper: 3.08 },
  { areaMm2: 10, copper: 1.83, aluminium: 3.08 },
  { areaMm2: 16, copper: 1.15, aluminium: 1.91 },
  { areaMm2: 25, copper: 0.727, aluminium: 1.2 },
  { areaMm2: 35, copper: 0.524, aluminium: 0.868 },
  { areaMm2: 50, copper: 0.387, aluminium: 0.641 },
  { areaMm2: 70, copper: 0.268, aluminium: 0.443 },
  { areaMm2: 95, copper: 0.193, aluminium: 0.32 },
  { areaMm2: 120, copper: 0.153, aluminium: 0.253 },
  { areaMm2: 150, copper: 0.124, aluminium: 0.206 },
  { areaMm2: 185, copper: 0.0991, aluminium: 0.164 },
  { areaMm2: 240, copper: 0.0754, aluminium: 0.125 },
  { areaMm2: 300, copper: 0.0601, aluminium: 0.1 },
  { areaMm2: 400, copper: 0.047, aluminium: 0.0778 },
  { areaMm2: 500, copper: 0.0366, aluminium: 0.0605 },
  { areaMm2: 630, copper: 0.0283, aluminium: 0.0469 },
  { areaMm2: 800, copper: 0.0221, aluminium: 0.0367 },
  { areaMm2: 1000, copper: 0.0176, aluminium: 0.0291 },
  { areaMm2: 1200, copper: 0.0151, aluminium: 0.0247 }, // from memory, less certain
  { areaMm2: 1400, copper: 0.0129, aluminium: 0.0212 }, // from memory, less certain
  { areaMm2: 1600, copper: 0.0113, aluminium: 0.0186 }, // from memory, less certain
  { areaMm2: 1800, copper: 0.0101, aluminium: 0.0165 }, // from memory, less certain
  { areaMm2: 2000, copper: 0.009, aluminium: 0.0149 }, // from memory, less certain
  { areaMm2: 2500, copper: 0.0072 }, // from memory, less certain; aluminium left out (see header)
].map((row) => Object.freeze(row)));

const AREA_TOLERANCE_MM2 = 1e-9;

/**
 * Maximum DC resistance at 20 degC of a class 2 conductor, ohm/km, from IEC 60228:2004 Table 2;
 * undefined where the size (matched exactly, to 1e-9 mm2) or the conductor is not tabulated.
 */
export function tabulatedResistance20(conductor: 'copper' | 'aluminium', areaMm2: number): number | undefined {
  const row = IEC60228_CLASS2.find((r) => Math.abs(r.areaMm2 - areaMm2) <= AREA_TOLERANCE_MM2);
  if (row === undefined) return undefined;
  return conductor === 'copper' ? row.copper : row.aluminium;
}

/**
 * The common metric cable sizes offered as alternatives, mm2, ascending (a subset of the
 * IEC 60228 nominal areas; common practice for LV power cables, no source for the selection).
 */
export const METRIC_SIZES_MM2: readonly number[] = Object.freeze([
  1.5, 2.5, 4, 6, 10, 16, 25, 35, 50, 70, 95, 120, 150, 185, 240, 300, 400, 500, 630, 800, 1000,
]);
