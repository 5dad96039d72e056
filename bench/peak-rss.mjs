// Preloaded by bench/run.ts (node --import): writes the process's peak resident memory (all threads,
// in kB) to the file named by FAULTSHEET_BENCH_RSS when the process exits.
import { writeFileSync } from 'node:fs';
const file = process.env.FAULTSHEET_BENCH_RSS;
if (file) process.on('exit', () => writeFileSync(file, String(process.resourceUsage().maxRSS)));
