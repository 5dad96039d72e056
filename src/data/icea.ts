// Source: ICEA P-32-382 (2007), "Short Circuit Characteristics of Insulated Cable", the adiabatic
// conductor equations (from memory):
//   copper:    (I/A)^2 t = 0.0297 log10((T2 + 234) / (T1 + 234))
//   aluminium: (I/A)^2 t = 0.0125 log10((T2 + 228) / (T1 + 228))
// I short-circuit current, A; A conductor area, circular mils; t time, s;
// T1, T2 initial and final conductor temperatures, degC. Used by the tests as an independent
// cross-check of the IEC 60949 adiabatic result.

export const ICEA_P32_382 = Object.freeze({
  copper: Object.freeze({ constant: 0.0297, inferredZero: 234 }),
  aluminium: Object.freeze({ constant: 0.0125, inferredZero: 228 }),
});

/** Short-circuit current (A) a conductor of `circularMils` carries for `seconds` from T1 to T2 degC, ICEA P-32-382. */
export function iceaShortCircuitCurrent(
  conductor: 'copper' | 'aluminium',
  circularMils: number,
  seconds: number,
  T1: number,
  T2: number,
): number {
  const { constant, inferredZero } = ICEA_P32_382[conductor];
  return circularMils * Math.sqrt((constant * Math.log10((T2 + inferredZero) / (T1 + inferredZero))) / seconds);
}
