#!/usr/bin/env node
// Entry point: the compiled command line lives in dist/ (built by `npm install` via the prepare script).
import { main } from '../dist/cli.js';

main({ argv: process.argv.slice(2), cwd: process.cwd(), stdout: process.stdout, stderr: process.stderr })
  .then((code) => { process.exitCode = code; });
