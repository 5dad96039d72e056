#!/usr/bin/env node
// Entry point: the compiled command line lives in dist/ (built by `npm install` via the prepare script).
import { main } from '../dist/cli.js';

// The first Ctrl-C (or SIGTERM) asks a running build to stop: it removes its staging folder and
// leaves OUT as it was. A second one ends the process at once, the usual way.
const interrupt = new AbortController();
const onSignal = (signal) => {
  process.off('SIGINT', onSignal);
  process.off('SIGTERM', onSignal);
  interrupt.abort(new Error(`interrupted by ${signal}`));
};
process.on('SIGINT', onSignal);
process.on('SIGTERM', onSignal);

main({ argv: process.argv.slice(2), cwd: process.cwd(), stdout: process.stdout, stderr: process.stderr, signal: interrupt.signal })
  .then((code) => { process.exitCode = code; });
