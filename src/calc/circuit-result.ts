// Assembles one circuit's result: the four checks with their governing case and, for the sheet, every
// quantity with formula, substituted values and result.

import type { AppliedDefault, Circuit, Device, Project } from '../model/types.js';
import type { CheckResult, CircuitResult, Traced } from './types.js';
import { type CircuitCase, type CircuitEvaluation, cableVoltageDrop, evaluateCircuit } from './circuit.js';
import { cableLoopImpedance, cablePhaseImpedance, chainStep, defineSteps, magnitude, resistanceAt } from './impedance.js';
import { minFaultTemperature } from './fault-point.js';
import { maxProtectedLength, thresholdLength } from './length-search.js';
import { isDefiniteTimeOnly } from './device.js';
import { alternativesFor } from './alternatives.js';
import { chartSeries } from './charts.js';
import { fmt, sig } from './quantity-text.js';
import type { BoardState } from './network.js';

const REF = {
  ik3: 'IEC 60909-0:2016 eq. (29)',
  ip: 'IEC 60909-0:2016 eq. (54), (55)',
  ik1: 'IEC 60909-0:2016 eq. (52)',
  k: 'IEC 60949:1988 eq. (1); IEC 60364-5-54:2011 Table A.54',
  withstand: 'IEC 60364-4-43:2008 434.5.2',
  breaking: 'IEC 60364-4-43:2008 434.5.1',
  disconnection: 'IEC 60364-4-41:2005 411.3.2',
  voltageDrop: 'IEC 60364-5-52:2009 Annex G',
};

export function circuitResult(project: Project, circuit: Circuit, device: Device, board: BoardState): CircuitResult {
  const settings = project.settings;
  const cable = circuit.cable;
  const c: CircuitCase = {
    settings,
    device: { device, clearingTime: circuit.clearingTime ?? device.clearingTime, frequency: settings.frequency },
    source: board.source,
    upstreamDrop: board.voltageDrop,
    cable,
    load: circuit.load,
    disconnectionTime: circuit.checks.disconnectionTime,
    voltageDropLimit: circuit.checks.voltageDropLimit,
  };
  const ev = evaluateCircuit(c);
  const threshold = thresholdLength(c, ev.withstand);
  const maxLength = maxProtectedLength(c);
  const alt = alternativesFor(c, { evaluation: ev, thresholdLength: threshold, maxLength });
  const notes = [...board.notes];
  if (circuit.clearingTime !== undefined) notes.push(`Definite clearing time ${fmt.time(circuit.clearingTime)} set for this circuit (overrides the device's).`);
  if (maxLength === null && ev.disconnection.point !== null && isDefiniteTimeOnly(device)) {
    notes.push('The device operates in a definite time whatever the current (clearing time alone): no maximum protected length follows from it.');
  }
  const definite = circuit.clearingTime ?? device.clearingTime;
  const curveStart = device.tripCurve?.[0]?.current;
  if (definite !== undefined && curveStart !== undefined && ev.end.ik1min < curveStart) {
    notes.push(
      `At I″k1min = ${fmt.current(ev.end.ik1min)}, below the trip curve's first point (${fmt.current(curveStart)}), the definite clearing time ${fmt.time(definite)} is applied as written; confirm from the maker's data that the device's short-time or relay pickup is below this current.`,
    );
  }
  if (ev.disconnection.point === null) {
    notes.push(`Earthing ${settings.earthing}: the earth-fault loop through earth electrodes is not modelled; disconnection is not determined (IEC 60364-4-41 411.5 / 411.6 need the electrode and insulation data).`);
  }
  if (settings.withstandCriterion === 'any-point' && threshold !== null && threshold > 0 && ev.energy.status === 'fail') {
    notes.push(`Threshold length ${fmt.length(threshold)}: far-end faults pass from this length, but under the any-point criterion a fault at the origin (${fmt.current(ev.origin.ik3max)}) counts whatever the length, so length alone does not resolve the withstand check.`);
  }
  if (circuit.load && board.voltageDropUnknownUpstream) notes.push('Voltage drop: an upstream circuit has no load given; its drop is taken as zero.');

  const thetaMin = minFaultTemperature(settings, cable);
  const phase20 = cablePhaseImpedance(cable, cable.length, 20);
  const loop = cableLoopImpedance(cable, cable.length, thetaMin);
  const pe = cable.protectiveConductor;
  const cableLabel = `${cable.parallel > 1 ? `${cable.parallel} × ` : ''}${cable.size.label} ${cable.conductor} ${cable.insulation}, ${fmt.length(cable.length)}`;
  const chainMax = chainStep(
    board.chainMax,
    `Circuit ${circuit.id} cable (phase, 20 °C)`,
    `${cableLabel}: R = ${sig(cable.resistance20 * 1000, 4)} Ω/km × ${fmt.length(cable.length)} / ${cable.parallel} = ${fmt.ohm(phase20.r)}; ` +
      `X = ${sig(cable.reactance * 1000, 3)} Ω/km × ${fmt.length(cable.length)} / ${cable.parallel} = ${fmt.ohm(phase20.x)}`,
    phase20,
  );
  const chainMin = chainStep(
    board.chainMin,
    `Circuit ${circuit.id} cable (phase + PE, ${sig(thetaMin, 4)} °C)`,
    `R_θ = R_20 [1 + 0.004 (θ − 20)], θ = ${sig(thetaMin, 4)} °C; phase ${sig(resistanceAt(cable.resistance20, thetaMin) * 1000, 4)} Ω/km / ${cable.parallel}, ` +
      `PE ${pe.size.label} ${pe.conductor} ${sig(resistanceAt(pe.resistance20, thetaMin) * 1000, 4)} Ω/km / ${pe.parallel}; X_PE per length = X phase`,
    loop,
  );

  const un = settings.systemVoltage;
  const cMax = settings.voltageFactorMax;
  const cMin = settings.voltageFactorMin;
  const q: Traced[] = [];
  const zo = magnitude(ev.origin.zMax);
  const ze = magnitude(ev.end.zMax);
  const zl = magnitude(ev.end.zLoop);
  q.push({ symbol: "I''k3max,origin", value: ev.origin.ik3max, unit: 'A', formula: 'c_max·U_n / (√3·|Z_k|)', substitution: `${sig(cMax, 3)} × ${fmt.voltage(un)} / (√3 × ${fmt.ohm(zo)})`, reference: REF.ik3 });
  const rx = ev.origin.zMax.r / ev.origin.zMax.x;
  const kappaOrigin =
    ev.origin.zMax.x > 0
      ? `1.02 + 0.98 × e^(−3 × ${sig(rx, 4)}), with R/X = ${fmt.ohm(ev.origin.zMax.r)} / ${fmt.ohm(ev.origin.zMax.x)} = ${sig(rx, 4)}`
      : `X = 0 (a purely resistive path): e^(−3R/X) → 0, κ = 1.02`;
  q.push({ symbol: 'κ origin', value: ev.origin.kappa3, unit: '', formula: '1.02 + 0.98·e^(−3R/X)', substitution: kappaOrigin, reference: REF.ip });
  q.push({ symbol: 'i_p,origin', value: ev.origin.ip, unit: 'A', formula: 'κ·√2·I″k3max', substitution: `${sig(ev.origin.kappa3, 4)} × √2 × ${fmt.current(ev.origin.ik3max)}`, reference: REF.ip });
  q.push({ symbol: "I''k3max,end", value: ev.end.ik3max, unit: 'A', formula: 'c_max·U_n / (√3·|Z_k,end|)', substitution: `${sig(cMax, 3)} × ${fmt.voltage(un)} / (√3 × ${fmt.ohm(ze)})`, reference: REF.ik3 });
  const rxEnd = ev.end.zMax.r / ev.end.zMax.x;
  const kappaEnd = ev.end.zMax.x > 0 ? `κ = 1.02 + 0.98 × e^(−3 × ${sig(rxEnd, 4)})` : 'κ = 1.02 (X = 0, a purely resistive path)';
  q.push({ symbol: 'i_p,end', value: ev.end.ip, unit: 'A', formula: 'κ·√2·I″k3max,end, κ = 1.02 + 0.98·e^(−3R/X)', substitution: `${sig(ev.end.kappa3, 4)} × √2 × ${fmt.current(ev.end.ik3max)}, with ${kappaEnd}`, reference: REF.ip });
  q.push({ symbol: "I''k1min,end", value: ev.end.ik1min, unit: 'A', formula: 'c_min·U_n / (√3·|Z_loop|)', substitution: `${sig(cMin, 3)} × ${fmt.voltage(un)} / (√3 × ${fmt.ohm(zl)}), conductors at ${sig(thetaMin, 4)} °C`, reference: REF.ik1 });
  const k = ev.k;
  q.push({
    symbol: 'k',
    value: k.k,
    unit: 'A·s^0.5/mm²',
    formula: 'K·√(ln((θ_f + β)/(θ_i + β)))',
    substitution: `${k.K} × √(ln((${k.finalC} + ${k.beta})/(${k.initialC} + ${k.beta})))`,
    reference: `${REF.k}; ${k.reference}`,
    note: `${cable.conductor}: K = ${k.K} A·s^0.5/mm², β = ${k.beta} °C (IEC 60949 Table I); θ_i = ${k.initialC} °C, θ_f = ${k.finalC} °C`,
  });
  q.push({ symbol: 'k^2 S^2', value: ev.withstand, unit: 'A^2 s', formula: 'k²·(n·S)²', substitution: `${sig(k.k, 4)}² × (${cable.parallel} × ${sig(cable.size.area * 1e6, 4)} mm²)²`, reference: REF.withstand });
  const e = ev.energy;
  q.push({
    symbol: 'I^2 t',
    value: e.letThrough,
    unit: 'A^2 s',
    formula: e.rule === 'let-through curve' ? "maker's let-through curve, log-log interpolation" : 'I²·t·(1 + m) for t < 0.1 s, else I²·t',
    substitution: e.governingCurrent === null ? (e.largestFound ? `not determined over the whole range; largest where determined ${fmt.energy(e.largestFound.energy)} at ${fmt.current(e.largestFound.current)}` : 'not determined over the whole range') : `largest over ${fmt.current(e.currentMin)} … ${fmt.current(e.currentMax)}: at ${fmt.current(e.governingCurrent)} (${e.rule})`,
    reference: REF.withstand,
  });
  const dp = ev.disconnection.point;
  q.push({
    symbol: 't_a',
    value: dp?.time ?? null,
    unit: 's',
    formula: 'device operating time at I″k1min,end',
    substitution: dp === null ? 'earth-fault loop not modelled' : dp.rule === null ? `no device rule covers ${fmt.current(ev.disconnection.current)}` : `at ${fmt.current(ev.disconnection.current)}: ${dp.rule}`,
    reference: REF.disconnection,
  });
  if (ev.voltageDrop && circuit.load) {
    const vd = cableVoltageDrop(settings, cable, circuit.load);
    q.push({
      symbol: 'ΔU',
      value: ev.voltageDrop.total,
      unit: '%',
      formula: circuit.load.phases === 1 ? 'ΔU_from + 2·I_b·(R·cos φ + X·sin φ)/U_0, U_0 = U_n/√3' : 'ΔU_from + √3·I_b·(R·cos φ + X·sin φ)/U_n',
      substitution: `${sig(ev.voltageDrop.total - ev.voltageDrop.own, 3)} % + ${circuit.load.phases === 1 ? '2' : '√3'} × ${fmt.current(circuit.load.current)} × (${fmt.ohm(vd.r)} × ${sig(circuit.load.powerFactor, 3)} + ${fmt.ohm(vd.x)} × ${sig(Math.sqrt(1 - circuit.load.powerFactor ** 2), 3)}) / ${fmt.voltage(circuit.load.phases === 1 ? un / Math.sqrt(3) : un)} (R at ${vd.temperature} °C)`,
      reference: REF.voltageDrop,
    });
  }
  q.push({ symbol: 'L_min', value: threshold, unit: 'm', formula: 'smallest length at which far-end faults pass the energy check', substitution: threshold === null ? 'none up to 10 km' : fmt.length(threshold), reference: REF.withstand });
  q.push({ symbol: 'L_max', value: maxLength, unit: 'm', formula: 'largest length at which I″k1min,end operates the device within the disconnection time', substitution: maxLength === null ? 'not limited by the device (definite time) or not determined' : fmt.length(maxLength), reference: REF.disconnection });

  const peCheck = ev.protectiveConductor;
  const peArea = `${cable.protectiveConductor.parallel > 1 ? `${cable.protectiveConductor.parallel} × ` : ''}${sig(cable.protectiveConductor.size.area * 1e6, 4)} mm²`;
  q.push({
    symbol: 'k PE',
    value: peCheck.k.k,
    unit: 'A·s^0.5/mm²',
    formula: 'K·√(ln((θ_f + β)/(θ_i + β))) for the protective conductor',
    substitution: `${peCheck.k.K} × √(ln((${peCheck.k.finalC} + ${peCheck.k.beta})/(${peCheck.k.initialC} + ${peCheck.k.beta}))), ${cable.protectiveConductor.arrangement}`,
    reference: `IEC 60364-5-54:2011 543.1.2; ${peCheck.k.reference}`,
  });
  q.push({ symbol: 'k^2 S^2 PE', value: peCheck.withstand, unit: 'A^2 s', formula: 'k_PE²·(n·S_PE)²', substitution: `${sig(peCheck.k.k, 4)}² × (${peArea})²`, reference: 'IEC 60364-5-54:2011 543.1.2' });
  const peExplanation =
    peCheck.status === 'pass'
      ? `The protective conductor (${peArea}, k = ${sig(peCheck.k.k, 4)}) withstands ${fmt.energy(peCheck.withstand)}, not less than the largest let-through energy ${fmt.energy(e.largestFound?.energy ?? 0)}.`
      : peCheck.status === 'fail'
        ? `The protective conductor (${peArea}, k = ${sig(peCheck.k.k, 4)}) withstands only ${fmt.energy(peCheck.withstand)}, less than the largest let-through energy over the range of the phase check, ${fmt.energy(e.largestFound?.energy ?? 0)}, which bounds the earth-fault energy on the safe side (IEC 60364-5-54 543.1.2): enlarge it to at least ${sig(Math.sqrt(e.largestFound?.energy ?? 0) / peCheck.k.k / cable.protectiveConductor.parallel, 3)} mm² per conductor. This check stands beside the four checks of the verdict.`
        : 'The protective conductor check is not determined: the let-through energy is not known over the whole range.';
  const rank = { pass: 0, undetermined: 1, fail: 2 } as const;
  const peWorse = rank[peCheck.status] > rank[e.status];
  if (peWorse) notes.push(peExplanation); // worse than the phase check: say so
  const checks = checkResults(c, ev, circuit, threshold, maxLength, alt.smallestWithstandingSize);
  const defaults: AppliedDefault[] = [...board.defaults, ...circuit.defaults]; // the device's own are on the Device
  const result: Omit<CircuitResult, 'charts' | 'buildUpMax' | 'buildUpMin'> = {
    id: circuit.id,
    description: circuit.description,
    from: circuit.from,
    to: circuit.to,
    device: device.id,
    supply: board.supply,
    origin: { ik3max: ev.origin.ik3max, ip: ev.origin.ip, ik1min: ev.origin.ik1min, kappa: ev.origin.kappa3 },
    end: { ik3max: ev.end.ik3max, ip: ev.end.ip, ik1min: ev.end.ik1min, kappa: ev.end.kappa3 },
    k: k.k,
    withstand: ev.withstand,
    letThrough: e.letThrough,
    thresholdLength: threshold,
    maxLength,
    voltageDrop: ev.voltageDrop?.total ?? null,
    verdict: ev.verdict,
    checks,
    protectiveConductor: { k: peCheck.k.k, withstand: peCheck.withstand, status: peCheck.status, worseThanPhase: peWorse, explanation: peExplanation, reference: 'IEC 60364-5-54:2011 543.1.2' },
    energy: { status: e.status, governingCurrent: e.governingCurrent, letThrough: e.letThrough, rule: e.rule, currentMin: e.currentMin, currentMax: e.currentMax },
    alternatives: alt.alternatives,
    smallestCompliantSize: alt.smallestCompliantSize,
    quantities: q,
    notes,
    defaults,
  };
  // The chart series cost more than the checks and only the report reads them: sample on first use.
  let charts: CircuitResult['charts'] | undefined;
  defineSteps(defineSteps(result, 'buildUpMax', chainMax), 'buildUpMin', chainMin);
  return Object.defineProperty(result, 'charts', {
    enumerable: false,
    get: () => (charts ??= chartSeries(c, ev, threshold, maxLength)),
  }) as CircuitResult;
}

function checkResults(
  c: CircuitCase,
  ev: CircuitEvaluation,
  circuit: Circuit,
  threshold: number | null,
  maxLength: number | null,
  smallest: string | null,
): CheckResult[] {
  const e = ev.energy;
  const anyPoint = c.settings.withstandCriterion === 'any-point';
  const where = (current: number | null) => {
    if (current === null) return 'not determined';
    if (Math.abs(current - ev.origin.ik3max) <= 1e-9 * current) return `I″k3max at the origin, ${fmt.current(current)}`;
    if (Math.abs(current - ev.end.ik3max) <= 1e-9 * current) return `I″k3max at the far end, ${fmt.current(current)}`;
    if (Math.abs(current - ev.end.ik1min) <= 1e-9 * current) return `I″k1min at the far end, ${fmt.current(current)}`;
    return `prospective current ${fmt.current(current)} (a step of the device's response)`;
  };
  const range = `${fmt.current(e.currentMin)} to ${fmt.current(e.currentMax)} (${anyPoint ? 'any point: far-end I″k1min to origin I″k3max' : 'through fault: far-end currents'})`;
  let thermalText = `Let-through energy does not exceed k²S² = ${fmt.energy(ev.withstand)} over ${range}.`;
  if (e.status === 'fail') {
    const fixes: string[] = [];
    if (smallest && smallest !== circuit.cable.size.label) fixes.push(`the smallest size that withstands it is ${smallest}`);
    else if (!smallest) fixes.push('no standard size withstands it with this device');
    if (threshold !== null && threshold > circuit.cable.length) {
      fixes.push(
        anyPoint
          ? `far-end faults pass from ${fmt.length(threshold)} (threshold length), but under the any-point criterion a fault at the origin still sees ${fmt.current(ev.origin.ik3max)}`
          : `the cable must be at least ${fmt.length(threshold)} long (threshold length) for far-end faults to pass`,
      );
    } else if (threshold === null) fixes.push('no length up to 10 km makes far-end faults pass');
    fixes.push(`a current-limiting device whose let-through energy stays below ${fmt.energy(ev.withstand)} over ${fmt.current(e.currentMin)} to ${fmt.current(e.currentMax)} resolves it`);
    const worst = e.largestFound!;
    const partly = e.letThrough === null ? ' (the device data leave part of the range undetermined, so the largest energy there is not known)' : '';
    thermalText = `Let-through energy ${fmt.energy(worst.energy)} at ${where(worst.current)} (${e.rule}) exceeds k²S² = ${fmt.energy(ev.withstand)}${partly}. To fix: ${fixes.join('; ')}.`;
  } else if (e.status === 'undetermined') {
    thermalText = `The device data do not cover every current in ${range}; no curve is extrapolated, so the check is not determined. Extend the maker's curves or give a definite clearing time.`;
  }
  const checks: CheckResult[] = [
    {
      name: 'thermal_withstand',
      status: e.status,
      value: e.letThrough,
      limit: ev.withstand,
      governing: where(e.governingCurrent ?? e.largestFound?.current ?? null),
      explanation: thermalText,
      reference: REF.withstand,
    },
  ];
  const b = ev.breaking;
  checks.push({
    name: 'breaking_capacity',
    status: b.status,
    value: b.value,
    limit: b.limit,
    governing: `I″k3max at the origin, ${fmt.current(b.value)}`,
    explanation:
      b.status === 'pass'
        ? `Breaking capacity ${fmt.current(b.limit!)} is not less than the prospective current ${fmt.current(b.value)} at the device.`
        : b.status === 'fail'
          ? `The prospective current ${fmt.current(b.value)} exceeds the breaking capacity ${fmt.current(b.limit!)}. To fix: a device rated at least ${fmt.current(b.value)}, or back-up protection by an upstream current-limiting device with a combination rating declared by the maker.`
          : 'The device has no breaking capacity given: the check is not determined.',
    reference: REF.breaking,
  });
  const d = ev.disconnection;
  const t = d.point?.time ?? null;
  let dText: string;
  if (d.point === null) dText = `Earthing ${c.settings.earthing}: disconnection on an earth fault needs the earth-electrode and insulation data, which this tool does not model.`;
  else if (t === null) dText = `No device rule covers ${fmt.current(d.current)}: the operating time is not determined.`;
  else if (d.status === 'pass') dText = `At I″k1min = ${fmt.current(d.current)} the device operates in ${fmt.time(t)} (${d.point.rule}), within ${fmt.time(d.limit)}.`;
  else {
    const fix = maxLength !== null && maxLength > 0 ? `the length must not exceed ${fmt.length(maxLength)} (maximum protected length)` : 'no length achieves it with this device';
    dText = `At I″k1min = ${fmt.current(d.current)} the device operates in ${fmt.time(t)} (${d.point.rule}), longer than ${fmt.time(d.limit)}. To fix: ${fix}; or a larger conductor or protective conductor, a device with a lower instantaneous pickup, or an RCD (IEC 60364-4-41 411.4.5).`;
  }
  checks.push({ name: 'disconnection', status: d.status, value: t, limit: d.limit, governing: `I″k1min at the far end, ${fmt.current(d.current)}`, explanation: dText, reference: REF.disconnection });
  if (ev.voltageDrop) {
    const v = ev.voltageDrop;
    checks.push({
      name: 'voltage_drop',
      status: v.status,
      value: v.total,
      limit: v.limit,
      governing: `design current at the far end (this cable ${sig(v.own, 3)} %, upstream ${sig(v.total - v.own, 3)} %)`,
      explanation:
        v.status === 'pass'
          ? `Voltage drop ${fmt.percent(v.total)} from the supply is within ${fmt.percent(v.limit)}.`
          : `Voltage drop ${fmt.percent(v.total)} from the supply exceeds ${fmt.percent(v.limit)}. To fix: a larger conductor or a shorter route.`,
      reference: REF.voltageDrop,
    });
  }
  return checks;
}

