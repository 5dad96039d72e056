// Source: IEC 60949:1988 (1st edition), "Calculation of thermally permissible short-circuit
// currents, taking into account non-adiabatic heating effects", Table I — material constants for
// the adiabatic equation of clause 3: K (A s^0.5/mm2), beta (K, reciprocal of the temperature
// coefficient of resistance at 0 degC), sigma_c (volumetric specific heat at 20 degC, J/(K m3))
// and rho_20 (electrical resistivity at 20 degC, ohm m). Values as printed, from memory.
// IEC 60364-5-54:2011 Table A.54.1 repeats the same constants.

export interface AdiabaticConstants {
  K: number; // A s^0.5 / mm2
  beta: number; // K
}

export interface MaterialConstants extends AdiabaticConstants {
  volumetricSpecificHeat: number; // sigma_c, J/(K m3)
  resistivity20: number; // rho_20, ohm m
}

/** IEC 60949:1988 Table I, all four materials. */
export const IEC60949_TABLE_I: Readonly<Record<'copper' | 'aluminium' | 'lead' | 'steel', Readonly<MaterialConstants>>> =
  Object.freeze({
    copper: Object.freeze({ K: 226, beta: 234.5, volumetricSpecificHeat: 3.45e6, resistivity20: 1.7241e-8 }),
    aluminium: Object.freeze({ K: 148, beta: 228, volumetricSpecificHeat: 2.5e6, resistivity20: 2.8264e-8 }),
    lead: Object.freeze({ K: 41, beta: 230, volumetricSpecificHeat: 1.45e6, resistivity20: 21.4e-8 }),
    steel: Object.freeze({ K: 78, beta: 202, volumetricSpecificHeat: 3.8e6, resistivity20: 13.8e-8 }),
  });

/** K and beta of the conductor materials the tool sizes, IEC 60949:1988 Table I. */
export const IEC60949_CONSTANTS: Readonly<Record<'copper' | 'aluminium', Readonly<AdiabaticConstants>>> = Object.freeze({
  copper: Object.freeze({ K: IEC60949_TABLE_I.copper.K, beta: IEC60949_TABLE_I.copper.beta }),
  aluminium: Object.freeze({ K: IEC60949_TABLE_I.aluminium.K, beta: IEC60949_TABLE_I.aluminium.beta }),
});
