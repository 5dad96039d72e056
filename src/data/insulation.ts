// Sources:
//  - IEC 60364-4-43:2008 (Edition 3), Table 43A "Values of k for conductors": initial (maximum
//    continuous operating) and final (short-circuit) conductor temperatures and the k values
//    for phase conductors. Footnote used: for bare mineral-insulated cables exposed to touch or
//    in contact with combustible material, k = 115 instead of 135 (recorded, not applied: the
//    insulation ids below cannot tell the two cases apart).
//    The "> 300 mm2" columns for thermoplastic (PVC) insulation are used for areas above 300 mm2.
//  - IEC 60364-5-54:2011 (Edition 3), Annex A (normative), method for deriving k in 543.1.2:
//    Table A.54.2 "insulated protective conductors not incorporated in cables and not bunched with
//    other cables" (initial temperature 30 degC); and the table for "protective conductor as a core
//    incorporated in a cable or bunched with other cables or insulated conductors" (initial
//    temperature = the cable's maximum operating temperature), cited as Table A.54.3 in FORMAT.md.
//    Footnote used (both tables): the lower value (140 degC final) applies to PVC-insulated
//    conductors of cross-sectional area greater than 300 mm2.
//    Doubt (from memory): the number of the core-in-cable table. In some printings of the 2011
//    edition Table A.54.3 is "bare protective conductors in contact with cable covering" and the
//    core-in-cable table is A.54.4; the reference strings therefore name the table by its title too.
// All values transcribed from memory of the published tables, as printed (k rounded to integers).
// Checked in tests/data/insulation.test.ts against the IEC 60949 formula.

import type { Insulation } from '../model/types.js';

export interface InsulationTemperatures {
  label: string;
  operatingC: number; // theta_i: maximum continuous operating temperature
  finalC: number; // theta_f: limiting temperature in a short circuit
  finalAbove300C?: number; // theta_f for conductors above 300 mm2, where the table gives one
  reference: string;
}

const TABLE_43A = 'IEC 60364-4-43:2008 Table 43A';
const TABLE_A54_2 = 'IEC 60364-5-54:2011 Table A.54.2 (insulated protective conductor not in a cable, not bunched)';
const TABLE_A54_3 = 'IEC 60364-5-54:2011 Table A.54.3 (protective conductor as a core in a cable or bunched)';

export const INSULATIONS: Readonly<Record<Insulation, Readonly<InsulationTemperatures>>> = Object.freeze({
  PVC: Object.freeze({
    label: 'PVC (thermoplastic, 70 degC)',
    operatingC: 70,
    finalC: 160,
    finalAbove300C: 140,
    reference: TABLE_43A,
  }),
  XLPE: Object.freeze({
    label: 'XLPE (thermosetting, 90 degC)',
    operatingC: 90,
    finalC: 250,
    reference: TABLE_43A,
  }),
  EPR: Object.freeze({
    label: 'EPR (thermosetting, 90 degC)',
    operatingC: 90,
    finalC: 250,
    reference: TABLE_43A,
  }),
  'rubber-60': Object.freeze({
    label: 'Rubber (thermosetting, 60 degC)',
    operatingC: 60,
    finalC: 200,
    reference: TABLE_43A,
  }),
  'mineral-pvc': Object.freeze({
    label: 'Mineral insulated, PVC covered',
    operatingC: 70,
    finalC: 160,
    reference: TABLE_43A,
  }),
  'mineral-bare': Object.freeze({
    label: 'Mineral insulated, bare, not exposed to touch and not in contact with combustible material',
    operatingC: 105,
    finalC: 250,
    reference: TABLE_43A,
  }),
});

/** The Table 43A column no insulation id maps to: thermoplastic 90 degC. Kept for comparison. */
export const THERMOPLASTIC_90: Readonly<InsulationTemperatures> = Object.freeze({
  label: 'PVC (thermoplastic, 90 degC)',
  operatingC: 90,
  finalC: 160,
  finalAbove300C: 140,
  reference: TABLE_43A,
});

const ABOVE_300_MM2 = 300 + 1e-9;

function finalFor(t: InsulationTemperatures, areaMm2: number): number {
  return areaMm2 > ABOVE_300_MM2 && t.finalAbove300C !== undefined ? t.finalAbove300C : t.finalC;
}

/** theta_i and theta_f of a phase conductor, IEC 60364-4-43:2008 Table 43A (> 300 mm2 rule for PVC). */
export function insulationTemperatures(
  ins: Insulation,
  areaMm2: number,
): { initialC: number; finalC: number; reference: string } {
  const t = INSULATIONS[ins];
  const above = areaMm2 > ABOVE_300_MM2 && t.finalAbove300C !== undefined;
  return {
    initialC: t.operatingC,
    finalC: finalFor(t, areaMm2),
    reference: above ? `${TABLE_43A} (${ins}, > 300 mm2)` : `${TABLE_43A} (${ins})`,
  };
}

/** Initial temperature of Table A.54.2: a separate protective conductor starts at 30 degC. */
export const SEPARATE_PROTECTIVE_INITIAL_C = 30;

/**
 * theta_i and theta_f of a protective conductor, IEC 60364-5-54:2011 Annex A.
 * 'in-cable': a core in a cable (Table A.54.3 of FORMAT.md), initial = operating temperature.
 * 'separate': insulated, not in a cable, not bunched (Table A.54.2), initial 30 degC.
 * Mineral insulation is in neither table: in a cable its core is taken as Table 43A; separate, as
 * 30 degC initial with the Table 43A final temperature, and the reference says so.
 */
export function protectiveConductorTemperatures(
  arrangement: 'in-cable' | 'separate',
  insulation: Insulation,
  areaMm2: number,
): { initialC: number; finalC: number; reference: string } {
  const t = INSULATIONS[insulation];
  const mineral = insulation === 'mineral-pvc' || insulation === 'mineral-bare';
  const above = areaMm2 > ABOVE_300_MM2 && t.finalAbove300C !== undefined;
  const suffix = above ? `${insulation}, > 300 mm2` : insulation;
  if (arrangement === 'in-cable') {
    return {
      initialC: t.operatingC,
      finalC: finalFor(t, areaMm2),
      reference: mineral
        ? `${TABLE_43A} (${suffix}; mineral insulation is not in Table A.54.3)`
        : `${TABLE_A54_3} (${suffix})`,
    };
  }
  return {
    initialC: SEPARATE_PROTECTIVE_INITIAL_C,
    finalC: finalFor(t, areaMm2),
    reference: mineral
      ? `IEC 60364-5-54:2011 Annex A, initial 30 degC as Table A.54.2; final temperature from ${TABLE_43A} (${suffix}; mineral insulation is not in Table A.54.2)`
      : `${TABLE_A54_2} (${suffix})`,
  };
}

/** Published k, A s^0.5/mm2, of one column of a table; "Above300" where the table splits at 300 mm2. */
export interface PublishedK {
  copper: number;
  copperAbove300?: number;
  aluminium?: number;
  aluminiumAbove300?: number;
  steel?: number;
  steelAbove300?: number;
  initialC: number;
  finalC: number;
  finalAbove300C?: number;
}

/** Table 43A columns: the six insulation ids plus thermoplastic 90 degC. */
export type Table43AColumn = Insulation | 'thermoplastic-90';

/** IEC 60364-4-43:2008 Table 43A, k for phase conductors (from memory, values as printed). */
export const TABLE_43A_K: Readonly<Record<Table43AColumn, Readonly<PublishedK & { copperExposedToTouch?: number }>>> =
  Object.freeze({
    PVC: { copper: 115, copperAbove300: 103, aluminium: 76, aluminiumAbove300: 68, initialC: 70, finalC: 160, finalAbove300C: 140 },
    'thermoplastic-90': { copper: 100, copperAbove300: 86, aluminium: 66, aluminiumAbove300: 57, initialC: 90, finalC: 160, finalAbove300C: 140 },
    XLPE: { copper: 143, aluminium: 94, initialC: 90, finalC: 250 },
    EPR: { copper: 143, aluminium: 94, initialC: 90, finalC: 250 },
    'rubber-60': { copper: 141, aluminium: 93, initialC: 60, finalC: 200 },
    'mineral-pvc': { copper: 115, initialC: 70, finalC: 160 },
    // footnote: 115 for bare cables exposed to touch or in contact with combustible material
    'mineral-bare': { copper: 135, copperExposedToTouch: 115, initialC: 105, finalC: 250 },
  });

/** Columns of the Annex A protective-conductor tables that the insulation ids map to. */
export type TableA54Column = 'PVC' | 'thermoplastic-90' | 'XLPE-EPR' | 'rubber-60';

/** IEC 60364-5-54:2011 Table A.54.2, separate insulated protective conductor, initial 30 degC (from memory). */
export const TABLE_A54_2_K: Readonly<Record<TableA54Column, Readonly<PublishedK>>> = Object.freeze({
  PVC: { copper: 143, copperAbove300: 133, aluminium: 95, aluminiumAbove300: 88, steel: 52, steelAbove300: 49, initialC: 30, finalC: 160, finalAbove300C: 140 },
  'thermoplastic-90': { copper: 143, copperAbove300: 133, aluminium: 95, aluminiumAbove300: 88, steel: 52, steelAbove300: 49, initialC: 30, finalC: 160, finalAbove300C: 140 },
  'XLPE-EPR': { copper: 176, aluminium: 116, steel: 64, initialC: 30, finalC: 250 },
  'rubber-60': { copper: 159, aluminium: 105, steel: 58, initialC: 30, finalC: 200 },
});

/** IEC 60364-5-54:2011 protective conductor as a core in a cable (Table A.54.3 in FORMAT.md; see header), from memory. */
export const TABLE_A54_3_K: Readonly<Record<TableA54Column, Readonly<PublishedK>>> = Object.freeze({
  PVC: { copper: 115, copperAbove300: 103, aluminium: 76, aluminiumAbove300: 68, initialC: 70, finalC: 160, finalAbove300C: 140 },
  'thermoplastic-90': { copper: 100, copperAbove300: 86, aluminium: 66, aluminiumAbove300: 57, initialC: 90, finalC: 160, finalAbove300C: 140 },
  'XLPE-EPR': { copper: 143, aluminium: 94, initialC: 90, finalC: 250 },
  'rubber-60': { copper: 141, aluminium: 93, initialC: 60, finalC: 200 },
});
