// Writes a synthetic project folder of N circuits (invented data, for benchmarks only):
//   npx tsx bench/generate-project.ts 1000 /tmp/p1000
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

import { pathToFileURL } from 'node:url';

/** Write a project of `n` circuits into `dir` (sub-mains from MSB to one board per 40 circuits, then finals). */
export function generateProject(n: number, dir: string): void {
mkdirSync(join(dir, 'devices'), { recursive: true });
mkdirSync(join(dir, 'circuits'), { recursive: true });

writeFileSync(
  join(dir, 'project.yaml'),
  `project:
  name: Benchmark campus (synthetic)
  number: BENCH-${n}
  revision: A
  date: 2026-11-20
settings:
  system_voltage: 400 V
  frequency: 50 Hz
  earthing: TN-S
supplies:
  - id: TX1
    feeds: MSB
    network: { voltage: 11 kV, fault_level: 250 MVA, fault_level_min: 150 MVA }
    transformer: { rating: 1600 kVA, primary_voltage: 11 kV, secondary_voltage: 400 V, impedance: 6 %, load_losses: 14 kW }
signoff:
  prepared_by: { name: A. Author, role: Design engineer }
  checked_by: { name: B. Checker, role: Checking engineer }
  approved_by: { name: C. Approver, role: Engineer of record }
`,
);

writeFileSync(
  join(dir, 'devices', 'devices.yaml'),
  `devices:
  - id: ACB-1600
    kind: acb
    rating: 1600 A
    breaking_capacity: 65 kA
    clearing_time: 0.3 s
  - id: MCCB-250
    kind: mccb
    rating: 250 A
    breaking_capacity: 50 kA
    instantaneous: { pickup: 10 x In, clearing_time: 10 ms }
    trip_curve: { current_unit: x In, time_unit: s, points: [[1.3, 3600], [3, 60], [9.9, 5]] }
    let_through: { current_unit: kA, energy_unit: A^2 s, points: [[5, 1.5e5], [20, 4.0e5], [50, 8.0e5]] }
  - id: MCB-C32
    kind: mcb
    rating: 32 A
    breaking_capacity: 10 kA
    instantaneous: { pickup: 10 x In, clearing_time: 10 ms }
    trip_curve: { current_unit: x In, time_unit: s, points: [[1.45, 3600], [3, 40], [9.9, 2]] }
`,
);

const boards = Math.max(1, Math.floor(n / 40));
let written = 0;
for (let b = 0; b < boards && written < n; b++, written++) {
  writeFileSync(
    join(dir, 'circuits', `MSB-F${String(b).padStart(3, '0')}.yaml`),
    `id: MSB-F${String(b).padStart(3, '0')}
description: Sub-main to DB${b}
from: MSB
to: DB${b}
device: MCCB-250
load: { current: 160 A, power_factor: 0.9 }
cable: { conductor: copper, insulation: XLPE, size: 95 mm2, length: ${20 + (b % 7) * 10} m }
`,
  );
}
for (let i = 0; written < n; i++, written++) {
  const b = i % boards;
  const id = `DB${b}-C${String(i).padStart(4, '0')}`;
  writeFileSync(
    join(dir, 'circuits', `${id}.yaml`),
    `id: ${id}
description: Final circuit ${i}
from: DB${b}
device: MCB-C32
load: { current: ${10 + (i % 20)} A }
cable: { conductor: copper, insulation: ${i % 2 ? 'PVC' : 'XLPE'}, size: ${[2.5, 4, 6, 10][i % 4]} mm2, length: ${10 + (i % 60)} m }
`,
  );
}
}

/** The file of the last final circuit (the one a benchmark edits). */
export function lastFinalCircuitFile(n: number, dir: string): string {
  const boards = Math.max(1, Math.floor(n / 40));
  const i = n - boards - 1;
  return join(dir, 'circuits', `DB${i % boards}-C${String(i).padStart(4, '0')}.yaml`);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const n = Number(process.argv[2] ?? 100);
  const dir = process.argv[3] ?? `/tmp/faultsheet-bench-${n}`;
  generateProject(n, dir);
  console.log(`${n} circuits written to ${dir}`);
}
