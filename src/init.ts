// `faultsheet init DIR`: a new project folder that checks and builds as it is, and the shipped JSON
// Schemas its files point their editor at.

import { chmod, mkdir, mkdtemp, readdir, rename, rm, rmdir, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { jsonSchemas } from './model/json-schema.js';
import { packageRoot } from './demo.js';

/** A reason not to create the project (the folder is in use, or cannot be written). */
export class InitError extends Error {}

/** Which shipped schema each kind of input file follows. */
export const SCHEMA_OF = {
  project: 'project.schema.json',
  devices: 'devices.schema.json',
  circuit: 'circuit.schema.json',
} as const;

export const schemaDir = path.join(packageRoot, 'schema');

/** The JSON Schema files as they are committed under schema/: name and exact text. */
export function schemaFiles(): Array<{ name: string; text: string }> {
  const schemas = jsonSchemas() as Record<string, unknown>;
  return Object.keys(schemas)
    .sort()
    .map((key) => ({ name: `${key}.schema.json`, text: `${JSON.stringify(schemas[key], null, 2)}\n` }));
}

/** The editor hint at the top of a YAML file: a schema path relative to the file (posix separators). */
export function schemaHint(fileDir: string, schemaFile: string): string {
  const target = path.join(schemaDir, schemaFile);
  let ref = path.relative(fileDir, target);
  if (path.isAbsolute(ref)) ref = target; // another drive: only an absolute path reaches it
  return `# yaml-language-server: $schema=${ref.split(path.sep).join('/')}\n`;
}

export interface InitOptions {
  date?: string; // YYYY-MM-DD for project.date; default today
}

/**
 * Write the starter project into `target` (absolute). Refuses a folder that exists and is not empty.
 * The files are written into a temporary sibling first and moved into place, so a failure leaves nothing.
 * Returns the files written, relative to the project folder.
 */
export async function initProject(target: string, options: InitOptions = {}): Promise<string[]> {
  const existing = await entries(target);
  if (existing === 'file') throw new InitError(`${target} exists and is a file, not a folder`);
  if (existing !== null && existing.length > 0) {
    throw new InitError(`${target} is not empty (${existing.length} entries); init only writes into a new or empty folder`);
  }
  const parent = path.dirname(target);
  try {
    await mkdir(parent, { recursive: true });
  } catch (e) {
    throw new InitError(`cannot create ${parent}: ${(e as Error).message}`);
  }
  const files = starterFiles(target, options.date ?? new Date().toISOString().slice(0, 10));
  const temp = await mkdtemp(path.join(parent, `.${path.basename(target)}.init-`));
  await chmod(temp, 0o777 & ~process.umask()); // mkdtemp makes it private; a project folder is an ordinary one
  try {
    for (const f of files) {
      await mkdir(path.dirname(path.join(temp, f.path)), { recursive: true });
      await writeFile(path.join(temp, f.path), f.text, { flag: 'wx' });
    }
    if (existing !== null) await rmdir(target); // empty: make room for the rename
    await rename(temp, target);
  } catch (e) {
    await rm(temp, { recursive: true, force: true });
    throw new InitError(`cannot write ${target}: ${(e as Error).message}`);
  }
  return files.map((f) => f.path);
}

/** null: does not exist; 'file': not a folder; else the folder's entries. */
async function entries(p: string): Promise<string[] | 'file' | null> {
  try {
    const s = await stat(p);
    if (!s.isDirectory()) return 'file';
    return await readdir(p);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw new InitError(`cannot read ${p}: ${(e as Error).message}`);
  }
}

interface StarterFile {
  path: string; // relative, posix
  text: string;
}

function starterFiles(target: string, date: string): StarterFile[] {
  const name = path.basename(target);
  const hint = (rel: string, schema: string) => schemaHint(path.dirname(path.join(target, rel)), schema);
  return [
    { path: 'project.yaml', text: hint('project.yaml', SCHEMA_OF.project) + projectYaml(name, date) },
    { path: 'devices/devices.yaml', text: hint('devices/devices.yaml', SCHEMA_OF.devices) + DEVICES_YAML },
    { path: 'circuits/MSB-Q1.yaml', text: hint('circuits/MSB-Q1.yaml', SCHEMA_OF.circuit) + CIRCUIT_YAML },
    { path: '.gitignore', text: '# faultsheet build output (faultsheet build . writes here)\nout/\n' },
  ];
}

function projectYaml(name: string, date: string): string {
  // the name goes in as a double-quoted YAML string so any folder name is valid
  const quoted = JSON.stringify(name);
  return `# A faultsheet project. Every dimensional value is a string with its unit ("400 V", "250 MVA").
# Check it with \`faultsheet check .\`, see the results with \`faultsheet solve .\`,
# write the PDF sheets with \`faultsheet build .\` (into out/).
# The values below are a worked starting point: replace them with your project's.

project:
  name: ${quoted}
  number: P-0001
  revision: A
  date: ${date}                # printed on every sheet and used as the PDFs' creation date
  # client: ...

settings:
  system_voltage: 400 V             # U_n, line to line
  frequency: 50 Hz
  earthing: TN-S                    # TN-S | TN-C-S | TN-C | TT | IT
  voltage_factor_max: 1.05          # c_max, IEC 60909-0 Table 1 (LV, +6 % tolerance)
  voltage_factor_min: 0.95          # c_min, IEC 60909-0 Table 1 (LV)
  min_fault_conductor_temperature: final   # final | operating | e.g. "160 degC"
  withstand_criterion: any-point    # any-point (IEC 60364-4-43 434.5.2) | through-fault

supplies:
  - id: TX1
    feeds: MSB                      # the board at the transformer's LV terminals
    network:                        # the MV feeder as declared by the network operator
      voltage: 11 kV                # U_nQ
      fault_level: 250 MVA          # S''kQ for maximum currents
      fault_level_min: 150 MVA      # S''kQ for minimum currents
      x_over_r: 10
      voltage_factor: 1.10          # c_Q
    transformer:
      rating: 800 kVA               # S_rT
      primary_voltage: 11 kV
      secondary_voltage: 400 V
      impedance: 6 %                # u_kr, from the test certificate
      load_losses: 9.5 kW           # P_krT, from the test certificate
      vector_group: Dyn11
      zero_sequence_ratio: 1.0      # Z0T / Z1T

assumptions:
  - Motor contribution to fault current is neglected.
  - Network fault levels are those declared by the network operator (replace with the declaration).

signoff:
  prepared_by: { name: To be named, role: Electrical design engineer }
  checked_by: { name: To be named, role: Checking engineer }
  approved_by: { name: To be named, role: Engineer responsible }
`;
}

const DEVICES_YAML = `# Protective devices used by this project: a list under \`devices:\`.
# Take every value from the maker's current datasheet for the exact device and setting.

devices:
  - id: MCCB-160
    kind: mccb                      # mcb | mccb | acb | fuse | relay
    description: Moulded-case breaker, thermal-magnetic, 160 A (illustrative data, not any maker's)
    illustrative: true              # remove once the values come from the maker's datasheet
    rating: 160 A                   # I_n
    breaking_capacity: 36 kA        # I_cu
    instantaneous:
      pickup: 10 x In
      clearing_time: 10 ms
    trip_curve:                     # total clearing time (upper edge of the band) against current
      current_unit: x In
      time_unit: s
      points: [[1.3, 3600], [2, 300], [3, 80], [5, 25], [8, 10], [10, 7]]
    let_through:                    # maker's let-through I^2 t against prospective current
      current_unit: kA
      energy_unit: A^2 s
      points: [[2, 2.5e4], [5, 6.0e4], [10, 1.0e5], [20, 1.6e5], [36, 2.2e5]]
`;

const CIRCUIT_YAML = `# One circuit: the board it leaves, its device, its cable and (optionally) its load.

id: MSB-Q1
description: Sub-main to distribution board DB1
from: MSB                           # the board that feeds this circuit
to: DB1                             # the board this circuit feeds (omit for a final circuit)
device: MCCB-160                    # an id from devices/
load: { current: 125 A, power_factor: 0.9 }    # design current I_b, for voltage drop
cable:
  conductor: copper                 # copper | aluminium
  insulation: XLPE                  # PVC | XLPE | EPR | rubber-60 | mineral-pvc | mineral-bare
  size: 70 mm2
  parallel: 1
  length: 40 m
  # resistance: 0.268 ohm/km        # at 20 degC; default IEC 60228 Table 2 (class 2)
  # reactance: 0.08 ohm/km          # default 0.08 ohm/km
  # protective_conductor: { size: 35 mm2, conductor: copper, arrangement: in-cable }
checks:
  voltage_drop_limit: 5 %
assumptions:
  - Cable route length from the layout drawing plus 10 %.
`;
