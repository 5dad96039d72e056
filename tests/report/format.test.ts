// Display formatting and symbol typesetting of the sheets.
import { describe, expect, it } from 'vitest';
import * as fmt from '../../src/report/format.js';
import { literal, plain, runsText, typeset } from '../../src/report/typeset.js';

describe('number formatting', () => {
  it('shows currents in kA with 3 significant figures', () => {
    // significant-figure rounding: common practice, no source; 3 s.f. for kA is the sheet's convention
    expect(fmt.kiloamps(23810.4)).toBe('23.8 kA');
    expect(fmt.kiloamps(107.07)).toBe('0.107 kA');
    expect(fmt.kiloamps(9996)).toBe('10.0 kA'); // rounding across a decade keeps 3 figures
    expect(fmt.kiloamps(125_400)).toBe('125 kA');
    expect(fmt.kiloamps(null)).toBe('—');
  });

  it('shows impedances in milliohm, energies in scientific form, lengths with one decimal', () => {
    expect(fmt.milliohms(0.00972)).toBe('9.72 mohm');
    expect(fmt.milliohmNumber(0.00007005)).toBe('0.0701');
    // (143 x 95)^2 = 184 552 225 A^2 s: the FORMAT.md section 3 example's withstand_a2s
    expect(fmt.energy(184_552_225)).toBe('1.85 x 10^8 A^2 s');
    expect(fmt.energy(9.996e4)).toBe('1.00 x 10^5 A^2 s');
    expect(fmt.metres(412.5)).toBe('412.5 m');
    expect(fmt.metres(3.74)).toBe('3.7 m');
  });

  it('shows short times in ms and others in s', () => {
    expect(fmt.seconds(0.01)).toBe('10.0 ms');
    expect(fmt.seconds(0.4)).toBe('0.400 s');
    expect(fmt.seconds(6.77)).toBe('6.77 s');
  });

  it('formats a traced quantity by its SI unit', () => {
    expect(fmt.quantity(25318, 'A')).toBe('25.3 kA');
    expect(fmt.quantity(0.0095776, 'ohm')).toBe('9.58 mohm');
    expect(fmt.quantity(3.205e8, 'A^2 s')).toBe('3.21 x 10^8 A^2 s');
    expect(fmt.quantity(null, 'A')).toBe('undetermined');
    expect(fmt.volts(11_000)).toBe('11 kV');
    expect(fmt.voltAmps(250e6)).toBe('250 MVA');
    expect(fmt.voltAmps(1e6, 1e7)).toBe('1000 kVA');
  });
});

describe('values that are missing or not finite', () => {
  const FORMATTERS: Record<string, (x: number | null | undefined) => string> = {
    significant: (x) => fmt.significant(x as number),
    scientific: (x) => fmt.scientific(x as number),
    kiloamps: fmt.kiloamps,
    milliohmNumber: (x) => fmt.milliohmNumber(x as number),
    milliohms: fmt.milliohms,
    energy: fmt.energy,
    metres: fmt.metres,
    seconds: fmt.seconds,
    percent: fmt.percent,
    amps: fmt.amps,
    volts: (x) => fmt.volts(x as number),
    voltAmps: (x) => fmt.voltAmps(x as number),
    watts: (x) => fmt.watts(x as number),
    squareMillimetres: (x) => fmt.squareMillimetres(x as number),
    ohmsPerKm: (x) => fmt.ohmsPerKm(x as number),
    factor: fmt.factor,
  };
  const UNITS = ['A', 'ohm', 'A^2 s', 's', 'm', '%', 'm^2', 'ohm/m', 'V', 'VA', '', 'Hz'];
  const BAD = /NaN|Infinity|undefined|null|\[object|e[+-]\d/;

  it.each(Object.keys(FORMATTERS))('%s shows a missing or non-finite value as "—"', (name) => {
    for (const x of [NaN, Infinity, -Infinity, null, undefined]) expect(FORMATTERS[name](x)).toBe('—');
  });

  it('a traced quantity without a finite value reads "undetermined"', () => {
    for (const unit of UNITS) for (const x of [NaN, Infinity, -Infinity, null, undefined]) expect(fmt.quantity(x, unit)).toBe('undetermined');
  });

  it('extreme and negative finite values never read as exponent text, "NaN" or "-0"', () => {
    const values = [0, -0, 1e-320, 5e-324, -5e-324, 1e-30, 1e-7, -1e-7, 1e-3, 0.04, -0.04, -0.004, 1, -1, 9.996, 1e6, 1e15, 1e20, 1e21, -1e21, 1.7e308, -1.7e308, Number.MAX_VALUE, Number.MIN_VALUE];
    for (const x of values) {
      for (const [name, f] of Object.entries(FORMATTERS)) {
        const text = f(x);
        expect(text, `${name}(${x})`).not.toMatch(BAD);
        expect(text, `${name}(${x})`).not.toMatch(/^-0(?:\.0+)?(?: |$)/);
        expect(text.length, `${name}(${x})`).toBeLessThan(40);
      }
      for (const unit of UNITS) expect(fmt.quantity(x, unit), `quantity(${x}, ${unit})`).not.toMatch(BAD);
    }
  });

  it('shows very large and very small magnitudes in scientific form', () => {
    // scientific notation: common practice, no source
    expect(fmt.significant(1e20)).toBe('1.00 x 10^20');
    expect(fmt.significant(2.5e-9)).toBe('2.50 x 10^-9');
    expect(fmt.metres(3e18)).toBe('3.00 x 10^18 m');
    expect(fmt.percent(1e300)).toBe('1.00 x 10^300 %');
    expect(fmt.volts(1e22)).toBe('1.000 x 10^19 kV'); // not trimmed into "10^1"
    expect(fmt.energy(Number.MIN_VALUE)).toBe('4.94 x 10^-324 A^2 s');
    expect(fmt.energy(Number.MAX_VALUE)).toBe('1.80 x 10^308 A^2 s');
    expect(fmt.metres(-0.04)).toBe('0.0 m');
    expect(fmt.amps(-16)).toBe('-16.0 A');
  });
});

describe('typesetting', () => {
  it('sets I\'\'k3max as I″ with a real subscript', () => {
    const runs = typeset("I''k3max = 25.3 kA");
    expect(runs[0]).toEqual({ text: 'I″' });
    expect(runs[1]).toEqual({ text: 'k3max', sub: true });
    expect(runsText(runs)).toBe('I″k3max = 25.3 kA');
  });

  it('sets k^2 S^2, I^2 t, units and subscripts', () => {
    expect(runsText(typeset('k^2 S^2 >= I^2 t'))).toBe('k²S² ≥ I²t');
    expect(runsText(typeset('1.85 x 10^8 A^2 s'))).toBe('1.85 × 108 A²s');
    expect(typeset('10^8').find((r) => r.sup)?.text).toBe('8');
    expect(typeset('c_max U_n / (sqrt(3) |Z_k|)').filter((r) => r.sub).map((r) => r.text)).toEqual(['max', 'n', 'k']);
    expect(runsText(typeset('9.72 mohm, 0.08 ohm/km, 250 degC, theta_f'))).toBe('9.72 mΩ, 0.08 Ω/km, 250 °C, θf');
    expect(runsText(typeset("S''_kQ"))).toBe('S″kQ');
  });

  it("reads the solver's Unicode forms too: I″k1min,end, θ subscripts, e^(...)", () => {
    const subs = (m: string): string[] => typeset(m).filter((r) => r.sub).map((r) => r.text);
    expect(subs('at I″k1min,end the device')).toEqual(['k1min,end']);
    expect(subs("I''k3max,origin")).toEqual(['k3max,origin']);
    expect(subs('R_θ = R_20 [1 + 0.004 (θ − 20)]; |Z_k,end|')).toEqual(['θ', '20', 'k,end']);
    expect(typeset('1.02 + 0.98·e^(−3R/X)').find((r) => r.sup)?.text).toBe('−3R/X');
    expect(runsText(typeset('2.12×10^8 A²s'))).toBe('2.12×108 A²s');
  });

  it('leaves user text as typed', () => {
    const runs = typeset(`Circuit ${literal("Q_1 {{x}} I''k **b**")} ok`);
    expect(runsText(runs)).toBe("Circuit Q_1 {{x}} I''k **b** ok");
    expect(runs.every((r) => !r.sub && !r.sup && !r.bold)).toBe(true);
  });

  it('gives chart labels Unicode subscripts', () => {
    expect(plain("I''k3max origin")).toBe('I″ₖ₃ₘₐₓ origin');
    expect(plain('k^2 S^2')).toBe('k²S²');
  });
});
