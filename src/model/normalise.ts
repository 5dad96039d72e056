// From parsed values (units in SI, defaults not applied) to the solver-side Project entities:
// defaults applied and each one recorded, cross-field rules checked, multiples of In resolved.

import type { Issue, Severity } from './issues.js';
import { problem, type ProblemCode, type ProblemData } from './messages.js';
import {
  CIRCUIT_DEFAULTS,
  DEVICE_DEFAULTS,
  disconnectionTimeDefault,
  networkVoltageFactor,
  SETTINGS_DEFAULTS,
  SUPPLY_DEFAULTS,
  systemVoltageFactors,
  type DefaultValue,
} from './defaults.js';
import type { ParsedCircuit, ParsedCurve, ParsedDevice, ParsedProjectMeta, ParsedSettings, ParsedSignoff, ParsedSupply } from './schema.js';
import { tableNameFor, tabulatedResistance } from './sizes.js';
import type { PathSegment, SourceFile } from './source.js';
import type {
  AppliedDefault,
  Cable,
  Circuit,
  Conductor,
  ConductorSize,
  CurvePoint,
  Device,
  NetworkFeeder,
  ProjectMeta,
  ProtectiveConductor,
  Settings,
  Signoff,
  SourcePos,
  Supply,
  Transformer,
} from './types.js';
import { formatNumber } from './units.js';
import { locationOf } from './validate.js';

/** Reports a problem at a path relative to the entity being normalised. */
export type Reporter = (code: ProblemCode, path: readonly PathSegment[], data: ProblemData, severity?: Severity) => void;

export function reporterFor(file: SourceFile, prefix: readonly PathSegment[], issues: Issue[]): Reporter {
  return (code, path, data, severity = 'error') => {
    issues.push(problem(code, locationOf(file, [...prefix, ...path]), data, severity));
  };
}

function applied<T>(defaults: AppliedDefault[], field: string, value: DefaultValue<T>): T {
  defaults.push({ field, value: value.text, source: value.source });
  return value.value;
}

const SQRT3 = Math.sqrt(3);

// ---------------------------------------------------------------------------------------------
// project.yaml

export function normaliseMeta(parsed: ParsedProjectMeta): ProjectMeta {
  const meta: ProjectMeta = { name: parsed.name, number: parsed.number, revision: parsed.revision, date: parsed.date };
  if (parsed.client !== undefined) meta.client = parsed.client;
  return meta;
}

export function normaliseSettings(parsed: ParsedSettings, defaults: AppliedDefault[], report: Reporter): Settings {
  const factors = systemVoltageFactors(parsed.system_voltage, parsed.voltage_factor_max);
  const settings: Settings = {
    systemVoltage: parsed.system_voltage,
    frequency: parsed.frequency ?? applied(defaults, 'settings.frequency', SETTINGS_DEFAULTS.frequency),
    earthing: parsed.earthing ?? applied(defaults, 'settings.earthing', SETTINGS_DEFAULTS.earthing),
    voltageFactorMax: parsed.voltage_factor_max ?? applied(defaults, 'settings.voltage_factor_max', factors.max),
    voltageFactorMin: parsed.voltage_factor_min ?? applied(defaults, 'settings.voltage_factor_min', factors.min),
    minFaultTemperature:
      parsed.min_fault_conductor_temperature ??
      applied(defaults, 'settings.min_fault_conductor_temperature', SETTINGS_DEFAULTS.minFaultTemperature),
    withstandCriterion:
      parsed.withstand_criterion ?? applied(defaults, 'settings.withstand_criterion', SETTINGS_DEFAULTS.withstandCriterion),
  };
  if (settings.voltageFactorMin > settings.voltageFactorMax) {
    const at = parsed.voltage_factor_min !== undefined ? 'voltage_factor_min' : 'voltage_factor_max';
    report('inconsistent-values', [at], {
      detail: `c_min ${formatNumber(settings.voltageFactorMin)} is greater than c_max ${formatNumber(settings.voltageFactorMax)}`,
      expected: 'voltage_factor_min at most voltage_factor_max',
    });
  }
  return settings;
}

export function normaliseSignoff(parsed: ParsedSignoff | undefined): Signoff {
  const signoff: Signoff = {};
  if (parsed?.prepared_by) signoff.preparedBy = { ...parsed.prepared_by };
  if (parsed?.checked_by) signoff.checkedBy = { ...parsed.checked_by };
  if (parsed?.approved_by) signoff.approvedBy = { ...parsed.approved_by };
  return signoff;
}

function normaliseNetwork(
  parsed: NonNullable<ParsedSupply['network']>,
  field: string,
  defaults: AppliedDefault[],
  report: Reporter,
): NetworkFeeder | undefined {
  const voltage = parsed.voltage;
  let faultLevel: number | undefined;
  if (parsed.fault_level !== undefined && parsed.fault_current !== undefined) {
    report('conflicting-fields', ['network', 'fault_current'], { fields: ['fault_level', 'fault_current'] });
  } else if (parsed.fault_level !== undefined) {
    faultLevel = parsed.fault_level;
  } else if (parsed.fault_current !== undefined) {
    faultLevel = SQRT3 * voltage * parsed.fault_current; // S''_kQ = sqrt(3) U_nQ I''_kQ
  } else {
    report('missing-alternative', ['network'], { fields: ['fault_level', 'fault_current'] });
  }
  let faultLevelMin: number | undefined;
  if (parsed.fault_level_min !== undefined && parsed.fault_current_min !== undefined) {
    report('conflicting-fields', ['network', 'fault_current_min'], { fields: ['fault_level_min', 'fault_current_min'] });
  } else if (parsed.fault_level_min !== undefined) {
    faultLevelMin = parsed.fault_level_min;
  } else if (parsed.fault_current_min !== undefined) {
    faultLevelMin = SQRT3 * voltage * parsed.fault_current_min;
  } else if (faultLevel !== undefined) {
    faultLevelMin = applied(defaults, `${field}.fault_level_min`, {
      value: faultLevel,
      text: `${formatNumber(faultLevel / 1e6)} MVA`,
      source: 'faultsheet default (docs/FORMAT.md): equal to fault_level',
    });
  }
  if (faultLevel !== undefined && faultLevelMin !== undefined && faultLevelMin > faultLevel) {
    const at = parsed.fault_current_min !== undefined ? 'fault_current_min' : 'fault_level_min';
    report('inconsistent-values', ['network', at], {
      detail: `the minimum fault level ${formatNumber(faultLevelMin / 1e6)} MVA exceeds the maximum ${formatNumber(faultLevel / 1e6)} MVA`,
      expected: 'a minimum at most the maximum',
    });
  }
  const xOverR = parsed.x_over_r ?? applied(defaults, `${field}.x_over_r`, SUPPLY_DEFAULTS.networkXOverR);
  const voltageFactor = parsed.voltage_factor ?? applied(defaults, `${field}.voltage_factor`, networkVoltageFactor(voltage));
  if (faultLevel === undefined || faultLevelMin === undefined) return undefined;
  return { voltage, faultLevel, faultLevelMin, xOverR, voltageFactor };
}

function normaliseTransformer(
  parsed: NonNullable<ParsedSupply['transformer']>,
  field: string,
  defaults: AppliedDefault[],
  report: Reporter,
): Transformer | undefined {
  let ok = true;
  if (parsed.load_losses !== undefined && parsed.x_over_r !== undefined) {
    report('conflicting-fields', ['transformer', 'x_over_r'], { fields: ['load_losses', 'x_over_r'] });
    ok = false;
  } else if (parsed.load_losses === undefined && parsed.x_over_r === undefined) {
    report('missing-alternative', ['transformer'], { fields: ['load_losses', 'x_over_r'] });
    ok = false;
  }
  // u_Rr = P_krT / S_rT cannot exceed u_kr (IEC 60909-0 eq. for R_T and Z_T).
  if (parsed.load_losses !== undefined && parsed.load_losses / parsed.rating >= parsed.impedance) {
    report('inconsistent-values', ['transformer', 'load_losses'], {
      detail: `load losses of ${formatNumber(parsed.load_losses / 1e3)} kW give u_R = ${formatNumber((100 * parsed.load_losses) / parsed.rating)} %, not less than the impedance u_k = ${formatNumber(100 * parsed.impedance)} %`,
      expected: 'load losses below u_k x S_rT',
    });
    ok = false;
  }
  const transformer: Transformer = {
    rating: parsed.rating,
    primaryVoltage: parsed.primary_voltage,
    secondaryVoltage: parsed.secondary_voltage,
    impedance: parsed.impedance,
    vectorGroup: parsed.vector_group ?? applied(defaults, `${field}.vector_group`, SUPPLY_DEFAULTS.vectorGroup),
    zeroSequenceRatio:
      parsed.zero_sequence_ratio ?? applied(defaults, `${field}.zero_sequence_ratio`, SUPPLY_DEFAULTS.zeroSequenceRatio),
  };
  if (parsed.load_losses !== undefined) transformer.loadLosses = parsed.load_losses;
  if (parsed.x_over_r !== undefined) transformer.xOverR = parsed.x_over_r;
  return ok ? transformer : undefined;
}

export function normaliseSupply(
  parsed: ParsedSupply,
  pos: SourcePos,
  defaults: AppliedDefault[],
  report: Reporter,
): Supply | undefined {
  const field = `supplies[${parsed.id}]`;
  if (parsed.transformer !== undefined && parsed.service !== undefined) {
    report('conflicting-fields', ['service'], { fields: ['transformer', 'service'] });
    return undefined;
  }
  if (parsed.service !== undefined) {
    if (parsed.network !== undefined) {
      report('conflicting-fields', ['network'], { fields: ['service', 'network'] });
      return undefined;
    }
    const service = parsed.service;
    const supply: Supply = {
      kind: 'service',
      id: parsed.id,
      feeds: parsed.feeds,
      faultCurrent: service.fault_current,
      xOverR: service.x_over_r ?? applied(defaults, `${field}.service.x_over_r`, SUPPLY_DEFAULTS.serviceXOverR),
      pos,
    };
    if (service.earth_loop_impedance !== undefined) supply.earthLoopImpedance = service.earth_loop_impedance;
    return supply;
  }
  if (parsed.transformer === undefined) {
    report('missing-alternative', [], { fields: ['transformer', 'service'] });
    return undefined;
  }
  const network = parsed.network === undefined ? undefined : normaliseNetwork(parsed.network, `${field}.network`, defaults, report);
  const transformer = normaliseTransformer(parsed.transformer, `${field}.transformer`, defaults, report);
  if (transformer === undefined || (parsed.network !== undefined && network === undefined)) return undefined;
  const supply: Supply = { kind: 'transformer', id: parsed.id, feeds: parsed.feeds, transformer, pos };
  if (network !== undefined) supply.network = network;
  return supply;
}

// ---------------------------------------------------------------------------------------------
// devices

function resolveCurve(curve: ParsedCurve, rating: number): CurvePoint[] {
  const factor = curve.scale.kind === 'multiple-of-rating' ? rating : 1;
  return curve.points.map((p) => ({ current: p.current * factor, value: p.value }));
}

export function normaliseDevice(parsed: ParsedDevice, pos: SourcePos, report: Reporter): Device | undefined {
  const defaults: AppliedDefault[] = [];
  const device: Device = { id: parsed.id, kind: parsed.kind, rating: parsed.rating, pos, defaults };
  if (parsed.breaking_capacity !== undefined) device.breakingCapacity = parsed.breaking_capacity;
  if (parsed.clearing_time !== undefined) device.clearingTime = parsed.clearing_time;
  if (parsed.instantaneous !== undefined) {
    const pickup = parsed.instantaneous.pickup;
    const current = pickup.kind === 'multiple-of-rating' ? pickup.multiple * parsed.rating : pickup.current;
    if (!(current > parsed.rating)) {
      report(
        'inconsistent-values',
        ['instantaneous', 'pickup'],
        { detail: `the instantaneous pickup ${formatNumber(current)} A is not above the rating ${formatNumber(parsed.rating)} A`, expected: 'a pickup above the rating' },
        'warning',
      );
    }
    const clearingTime =
      parsed.instantaneous.clearing_time ??
      applied(defaults, 'instantaneous.clearing_time', DEVICE_DEFAULTS.instantaneousClearingTime);
    device.instantaneous = { pickup: current, clearingTime };
  }
  if (parsed.trip_curve !== undefined) device.tripCurve = resolveCurve(parsed.trip_curve, parsed.rating);
  if (parsed.let_through !== undefined) device.letThrough = resolveCurve(parsed.let_through, parsed.rating);
  if (parsed.description !== undefined) device.description = parsed.description;
  if (parsed.illustrative !== undefined) device.illustrative = parsed.illustrative;
  if (parsed.clearing_time === undefined && parsed.trip_curve === undefined && parsed.let_through === undefined) {
    report('no-timing-data', [], { id: parsed.id });
    return undefined;
  }
  return device;
}

// ---------------------------------------------------------------------------------------------
// circuits

interface ResolvedResistance {
  resistance20: number; // ohm/m
  source: string;
}

function lookUpResistance(
  conductor: Conductor,
  size: ConductorSize,
  field: string,
  sizePath: readonly PathSegment[],
  defaults: AppliedDefault[],
  report: Reporter,
): ResolvedResistance | undefined {
  const found = tabulatedResistance(conductor, size);
  if (found === undefined) {
    report('no-resistance', sizePath, { detail: `${conductor} ${size.label}`, other: tableNameFor(size) });
    return undefined;
  }
  applied(defaults, field, { value: found.resistance20, text: `${formatNumber(found.resistance20 * 1000)} ohm/km`, source: found.source });
  return found;
}

const GIVEN = 'given';

function normaliseCable(
  parsed: ParsedCircuit['cable'],
  defaults: AppliedDefault[],
  report: Reporter,
): Cable | undefined {
  const parallel = parsed.parallel ?? applied(defaults, 'cable.parallel', CIRCUIT_DEFAULTS.parallel);
  const phase: ResolvedResistance | undefined =
    parsed.resistance !== undefined
      ? { resistance20: parsed.resistance, source: GIVEN }
      : lookUpResistance(parsed.conductor, parsed.size, 'cable.resistance', ['cable', 'size'], defaults, report);
  const reactance = parsed.reactance ?? applied(defaults, 'cable.reactance', CIRCUIT_DEFAULTS.reactance);

  const written = parsed.protective_conductor;
  let protective: ProtectiveConductor | undefined;
  if (written === undefined) {
    applied(defaults, 'cable.protective_conductor', {
      value: undefined,
      text: `${parsed.size.label} ${parsed.conductor}, in-cable, ${parallel} in parallel`,
      source: 'faultsheet default (docs/FORMAT.md): a conductor of the phase size in the same cable',
    });
    if (phase !== undefined) {
      protective = {
        size: parsed.size,
        conductor: parsed.conductor,
        arrangement: 'in-cable',
        parallel,
        resistance20: phase.resistance20,
        resistanceSource: phase.source,
      };
    }
  } else {
    const prefix = 'cable.protective_conductor';
    const size =
      written.size ??
      applied(defaults, `${prefix}.size`, { value: parsed.size, text: parsed.size.label, source: 'faultsheet default (docs/FORMAT.md): the phase size' });
    const conductor =
      written.conductor ??
      applied(defaults, `${prefix}.conductor`, { value: parsed.conductor, text: parsed.conductor, source: 'faultsheet default (docs/FORMAT.md): the phase conductor' });
    const arrangement = written.arrangement ?? applied(defaults, `${prefix}.arrangement`, CIRCUIT_DEFAULTS.protectiveConductorArrangement);
    const peParallel =
      written.parallel ??
      (arrangement === 'in-cable'
        ? applied(defaults, `${prefix}.parallel`, { value: parallel, text: String(parallel), source: 'faultsheet default: one in each parallel cable (the phase parallel count)' })
        : applied(defaults, `${prefix}.parallel`, { value: 1, text: '1', source: 'faultsheet default: one separate conductor' }));
    let resistance: ResolvedResistance | undefined;
    if (written.resistance !== undefined) {
      resistance = { resistance20: written.resistance, source: GIVEN };
    } else if (phase !== undefined && size.label === parsed.size.label && conductor === parsed.conductor) {
      // Same conductor as a phase: the same resistance, given or tabulated.
      resistance = phase;
      applied(defaults, `${prefix}.resistance`, {
        value: phase.resistance20,
        text: `${formatNumber(phase.resistance20 * 1000)} ohm/km`,
        source: phase.source === GIVEN ? 'the phase conductor\'s given resistance' : phase.source,
      });
    } else if (size.label !== parsed.size.label || conductor !== parsed.conductor) {
      const sizePath = written.size !== undefined ? ['cable', 'protective_conductor', 'size'] : ['cable', 'protective_conductor'];
      resistance = lookUpResistance(conductor, size, `${prefix}.resistance`, sizePath, defaults, report);
    }
    if (resistance !== undefined) {
      protective = { size, conductor, arrangement, parallel: peParallel, resistance20: resistance.resistance20, resistanceSource: resistance.source };
    }
  }
  if (phase === undefined || protective === undefined) return undefined;
  return {
    conductor: parsed.conductor,
    insulation: parsed.insulation,
    size: parsed.size,
    parallel,
    length: parsed.length,
    resistance20: phase.resistance20,
    resistanceSource: phase.source,
    resistanceGiven: parsed.resistance !== undefined,
    reactance,
    protectiveConductor: protective,
    protectiveConductorDefaulted: written === undefined,
  };
}

export function normaliseCircuit(
  parsed: ParsedCircuit,
  pos: SourcePos,
  device: Device | undefined,
  settings: Settings | undefined,
  report: Reporter,
): Circuit | undefined {
  const defaults: AppliedDefault[] = [];
  const description = parsed.description ?? applied(defaults, 'description', CIRCUIT_DEFAULTS.description);
  const cable = normaliseCable(parsed.cable, defaults, report);
  let load: Circuit['load'];
  if (parsed.load !== undefined) {
    load = {
      current: parsed.load.current,
      powerFactor: parsed.load.power_factor ?? applied(defaults, 'load.power_factor', CIRCUIT_DEFAULTS.powerFactor),
      phases: parsed.load.phases ?? applied(defaults, 'load.phases', CIRCUIT_DEFAULTS.phases),
    };
  }
  let disconnectionTime = parsed.checks?.disconnection_time;
  if (disconnectionTime === undefined && device !== undefined && settings !== undefined) {
    disconnectionTime = applied(
      defaults,
      'checks.disconnection_time',
      disconnectionTimeDefault(device.rating, settings.earthing, settings.systemVoltage),
    );
  }
  const voltageDropLimit =
    parsed.checks?.voltage_drop_limit ?? applied(defaults, 'checks.voltage_drop_limit', CIRCUIT_DEFAULTS.voltageDropLimit);
  if (cable === undefined || disconnectionTime === undefined) return undefined;
  const circuit: Circuit = {
    id: parsed.id,
    description,
    from: parsed.from,
    device: parsed.device,
    cable,
    checks: { disconnectionTime, voltageDropLimit },
    assumptions: parsed.assumptions ?? [],
    pos,
    defaults,
  };
  if (parsed.to !== undefined) circuit.to = parsed.to;
  if (parsed.clearing_time !== undefined) circuit.clearingTime = parsed.clearing_time;
  if (load !== undefined) circuit.load = load;
  return circuit;
}
