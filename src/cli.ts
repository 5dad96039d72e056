// The command line: parses arguments, calls the engine, prints to the streams it is given.
// It never exits the process itself; `main` returns the exit code (bin/faultsheet.js sets it).

import path from 'node:path';
import { Command, CommanderError } from 'commander';
import cliProgress from 'cli-progress';
import { formatIssues, type Issue } from './model/issues.js';
import type { Project } from './model/types.js';
import type { CheckResult, CircuitResult, ProjectResult, Status } from './calc/types.js';
import { demoProjectDirs, packageVersion } from './demo.js';
import type { ParseCache } from './model/parse-cache.js';
import type { SheetPool } from './report/pool.js';
import { CACHE_FOLDER } from './io/write.js';
import { SHAPED_FILE } from './report/shaped-words.js';

// The engine (the loader with its units and schemas, the solver) and the report are imported by
// the commands that use them: `build` starts its worker threads first, so they load the report on
// another core while this thread loads the engine (about half a second each).
const engine = async () => {
  const [{ loadProject }, { ParseCache, PARSE_CACHE_FILE }, { solveProject }, { resultsDocument }] = await Promise.all([
    import('./model/load.js'),
    import('./model/parse-cache.js'),
    import('./calc/solve.js'),
    import('./calc/results-json.js'),
  ]);
  return { loadProject, ParseCache, PARSE_CACHE_FILE, solveProject, resultsDocument };
};

export interface CliIo {
  argv: string[]; // arguments after the program name
  cwd: string;
  stdout: NodeJS.WritableStream & { isTTY?: boolean };
  stderr: NodeJS.WritableStream;
  /** Aborted on an interrupt (SIGINT, SIGTERM): a build stops and leaves OUT as it was. */
  signal?: AbortSignal;
}

/** Exit codes, documented in `--help` and the README. */
export const EXIT = {
  ok: 0, // success; checks may fail unless --strict
  input: 1, // input or usage error (and internal errors, which say so)
  checks: 2, // with --strict: some check fails or is undetermined
  interrupted: 130, // stopped by SIGINT or SIGTERM (128 + 2, the shell's convention); OUT left as it was
} as const;

/** A problem the user can fix: printed as one line, no stack. */
class UserError extends Error {}

/** A project that did not load: its issues are already formatted. */
class ProjectIssues extends Error {}

const EXIT_CODES_HELP = `
Exit codes:
  0  success (checks may fail; use --strict to make that an error)
  1  input or usage error (the problems are listed on stderr), or an internal error
  2  with --strict: at least one check fails or is undetermined
  130  interrupted (Ctrl-C): nothing written, OUT left as it was`;

const EXIT_CODES_HELP_PLAIN = `
Exit codes:
  0  success
  1  input or usage error (the problems are listed on stderr), or an internal error`;

export async function main(io: CliIo): Promise<number> {
  const out = (text: string) => void io.stdout.write(text);
  const err = (text: string) => void io.stderr.write(text);
  let code: number = EXIT.ok;

  const program = new Command('faultsheet')
    .description(
      'Short-circuit withstand, breaking capacity, disconnection and voltage-drop checks for LV ' +
        'installations, from a project folder of YAML files to PDF calculation sheets.',
    )
    .version(await packageVersion(), '-V, --version', 'print the version')
    .helpOption('-h, --help', 'show help')
    .addHelpCommand(false)
    .exitOverride()
    .showSuggestionAfterError(true)
    .showHelpAfterError("(run 'faultsheet --help' for the commands)")
    .configureOutput({ writeOut: out, writeErr: err, outputError: (text, write) => write(text) })
    .addHelpText(
      'after',
      `
Examples:
  $ faultsheet init my-project          start a new project folder
  $ faultsheet check my-project         validate the YAML files
  $ faultsheet solve my-project         fault levels and verdicts in the terminal
  $ faultsheet build my-project         write the PDF dossier to my-project/out/
  $ faultsheet demo                     build the demo projects
${EXIT_CODES_HELP}

Run 'faultsheet <command> --help' for a command's options.`,
    );

  const command = (name: string, summary: string, example: string, exitCodes = EXIT_CODES_HELP_PLAIN) =>
    program
      .command(name)
      .description(summary)
      .showHelpAfterError(`(run 'faultsheet ${name.split(' ')[0]} --help' for usage)`)
      .addHelpText('after', `\nExample:\n  $ ${example}\n${exitCodes}\n`);

  command('check <dir>', 'validate a project folder without solving it', 'faultsheet check projects-demo/iec-400v').action(
    async (dir: string) => {
      const project = await load(io, dir);
      const files = new Set<string>(['project.yaml']);
      for (const d of project.devices) files.add(d.pos.file);
      for (const c of project.circuits) files.add(c.pos.file);
      out(`${plural(files.size, 'file')}, ${plural(project.circuits.length, 'circuit')}: no problems\n`);
    },
  );

  command(
    'solve <dir>',
    'solve fault levels and check every circuit; print a table (or the JSON results)',
    'faultsheet solve projects-demo/iec-400v --json > results.json',
    EXIT_CODES_HELP,
  )
    .option('--json', 'print only the results JSON document on stdout (the same as results.json)')
    .option('--strict', 'exit 2 if any check fails or is undetermined')
    .action(async (dir: string, opts: { json?: boolean; strict?: boolean }) => {
      const { solveProject, resultsDocument } = await engine();
      const project = await load(io, dir);
      const result = solveProject(project);
      if (opts.json) out(`${JSON.stringify(resultsDocument(project, result), null, 2)}\n`);
      else out(solveTable(project, result));
      if (opts.strict && !allPass(result)) code = EXIT.checks;
    });

  command(
    'build <dir>',
    'solve and write the PDF sheets, summary, dossier and results.json',
    'faultsheet build projects-demo/iec-400v --out /tmp/iec-dossier',
    EXIT_CODES_HELP,
  )
    .option('-o, --out <out>', 'output folder (default: <dir>/out)')
    .option('-q, --quiet', 'no progress bar and no closing line (errors are still printed)')
    .option('--strict', 'exit 2 if any check fails or is undetermined')
    .option('--force', 'render every sheet again (by default a sheet whose content has not changed since the last build into OUT is kept)')
    .option('-j, --jobs <n>', 'sheets rendered at once, in worker threads (default: one per core)', (v: string) => {
      const n = Number(v);
      if (!Number.isInteger(n) || n < 1 || n > 64) throw new UserError(`--jobs: ${JSON.stringify(v)} is not a whole number from 1 to 64`);
      return n;
    })
    .action(async (dir: string, opts: { out?: string; quiet?: boolean; strict?: boolean; force?: boolean; jobs?: number }) => {
      const projectDir = path.resolve(io.cwd, dir);
      const outDir = opts.out ? path.resolve(io.cwd, opts.out) : path.join(projectDir, 'out');
      const built = await buildOne(io, projectDir, outDir, { quiet: Boolean(opts.quiet), force: Boolean(opts.force), jobs: opts.jobs });
      if (!opts.quiet) out(`${built.line}\n`);
      if (opts.strict && !allPass(built.result)) code = EXIT.checks;
    });

  command('init <dir>', 'create a new project folder that builds as it is', 'faultsheet init substation-b').action(
    async (dir: string) => {
      const target = path.resolve(io.cwd, dir);
      const { initProject, InitError } = await import('./init.js');
      const written = await initProject(target).catch((e: unknown) => {
        throw e instanceof InitError ? new UserError(e.message) : e;
      });
      out(`created ${display(io, target)}: ${written.join(', ')}\n`);
      const shown = display(io, target);
      out(`next: edit the YAML files there, then \`npx faultsheet check ${shown}\` and \`npx faultsheet build ${shown}\` (the sheets go to ${shown}/out)\n`);
    },
  );

  command('demo', 'build every demo project in projects-demo/ into its out/ folder', 'npm run demo')
    .option('-q, --quiet', 'no progress bar')
    .action(async (opts: { quiet?: boolean }) => {
      const dirs = await demoProjectDirs();
      if (dirs.length === 0) throw new Error('no demo projects found next to the program (projects-demo/)');
      out('Demo dossiers:\n');
      for (const dir of dirs) {
        const built = await buildOne(io, dir, path.join(dir, 'out'), { quiet: Boolean(opts.quiet) });
        out(`  ${built.line}\n`);
      }
      out('Open dossier.pdf in each folder; the per-circuit sheets sit beside it.\n');
    });

  try {
    await program.parseAsync(io.argv, { from: 'user' });
    return code;
  } catch (e) {
    if (e instanceof CommanderError) {
      // help and version are requested output; everything else is a usage error commander already printed
      if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version') return EXIT.ok;
      return EXIT.input;
    }
    if (io.signal?.aborted) {
      err('interrupted: the build stopped; OUT is as it was before it started\n');
      return EXIT.interrupted;
    }
    if (e instanceof ProjectIssues) {
      err(e.message.endsWith('\n') ? e.message : `${e.message}\n`);
      return EXIT.input;
    }
    if (e instanceof UserError) {
      err(e.message.split('\n').map((line) => `error: ${line}\n`).join(''));
      return EXIT.input;
    }
    const stack = e instanceof Error ? (e.stack ?? e.message) : String(e as unknown);
    err(`internal error: ${stack}\n(this is a bug in faultsheet, not in your project; please report it with the input)\n`);
    return EXIT.input;
  }
}

async function load(io: CliIo, dir: string, cache?: ParseCache): Promise<Project> {
  const projectDir = path.resolve(io.cwd, dir);
  const loaded = await (await engine()).loadProject(projectDir, cache);
  // locations as the user can open them from where they are: the project folder, then the file
  const located = (issues: readonly Issue[]) =>
    formatIssues(issues.map((i) => ({ ...i, file: path.join(display(io, projectDir), i.file).split(path.sep).join('/') })));
  if (!loaded.ok) throw new ProjectIssues(located(loaded.issues));
  if (loaded.warnings.length > 0) io.stderr.write(`${located(loaded.warnings)}\n`);
  return loaded.project;
}

interface Built {
  result: ProjectResult;
  line: string; // the closing line: sheets written, checks failed, time taken, where
}

/** Load, solve and write one project's dossier, with a progress bar on a terminal. */
async function buildOne(io: CliIo, projectDir: string, outDir: string, opts: { quiet: boolean; force?: boolean; jobs?: number }): Promise<Built> {
  const started = performance.now();
  // Worker threads for the sheets start now and load the report on another core while this thread
  // reads and solves the project (report/pool.ts). --jobs 1 renders in this thread.
  const { earlyThreads, startSheetPool } = await import('./report/pool.js');
  const threads = earlyThreads(opts.jobs);
  // each worker starts with the words the last build into OUT shaped (report/shaped-words.ts)
  const shapedWords = opts.force ? undefined : path.join(outDir, CACHE_FOLDER, SHAPED_FILE);
  const pool = threads > 0 ? await startSheetPool(threads, { shapedWords }) : undefined;
  try {
    return await solveAndBuild(io, projectDir, outDir, opts, started, pool);
  } finally {
    await pool?.destroy();
  }
}

async function solveAndBuild(io: CliIo, projectDir: string, outDir: string, opts: { quiet: boolean; force?: boolean; jobs?: number }, started: number, pool: SheetPool | undefined): Promise<Built> {
  const { solveProject, resultsDocument, ParseCache, PARSE_CACHE_FILE } = await engine();
  // what reading the project's files gave the last build into OUT (model/parse-cache.ts)
  const parsed = opts.force ? ParseCache.empty() : ParseCache.read(path.join(outDir, CACHE_FOLDER, PARSE_CACHE_FILE));
  const project = await load(io, projectDir, parsed);
  const result = solveProject(project);
  io.signal?.throwIfAborted();
  const showBar = Boolean(io.stdout.isTTY) && !opts.quiet;
  const bar = showBar
    ? new cliProgress.SingleBar(
        {
          stream: io.stdout,
          format: `${project.meta.number || project.meta.name} |{bar}| {value}/{total} circuits`,
          hideCursor: true,
          clearOnComplete: true,
        },
        cliProgress.Presets.shades_classic,
      )
    : undefined;
  // the report (pdfmake, canvas, fonts) is loaded only when a dossier is written
  const { buildDossier, OutputDirError, OutputPlanError, TemplateError } = await import('./report/build.js');
  let kept = 0;
  try {
    // results.json's document is made once the first sheets are on their way to the workers
    await buildDossier(project, result, () => resultsDocument(project, result), outDir, {
      onPlan: (render, unchanged) => {
        kept = unchanged;
        bar?.start(render, 0);
      },
      onProgress: (done: number) => bar?.update(done),
      force: opts.force,
      jobs: opts.jobs,
      signal: io.signal,
      pool,
      changedInputs: parsed.changed(),
      cacheFiles: [{ name: PARSE_CACHE_FILE, bytes: () => parsed.bytes() }],
    });
  } catch (e) {
    // two sheets on one file name, an output folder that cannot be used, a project template that does not compile
    if (e instanceof TemplateError && project.templatesDir) throw new UserError(e.message.split(project.templatesDir).join(display(io, project.templatesDir)));
    if (e instanceof OutputPlanError || e instanceof OutputDirError || e instanceof TemplateError) throw new UserError(e.message);
    throw e;
  } finally {
    bar?.stop();
  }
  const seconds = (performance.now() - started) / 1000;
  const failed = countChecks(result, 'fail');
  const undetermined = countChecks(result, 'undetermined');
  const parts = [
    `${plural(result.circuits.length, 'sheet')} written${kept > 0 ? ` (${kept} unchanged since the last build)` : ''}`,
    `${plural(failed, 'check')} failed`,
    ...(undetermined > 0 ? [`${undetermined} undetermined`] : []),
    ...(protectiveConductorProblems(result).length > 0 ? [`${plural(protectiveConductorProblems(result).length, 'protective conductor')} not passing`] : []),
  ];
  const line = `${parts.join(', ')} in ${seconds.toFixed(1)} s: ${display(io, path.join(outDir, 'dossier.pdf'))}`;
  return { result, line };
}

/** Circuits whose protective-conductor check (beside the four) is worse than their withstand check. */
function protectiveConductorProblems(result: ProjectResult): CircuitResult[] {
  return result.circuits.filter((c) => c.protectiveConductor?.worseThanPhase);
}

function allPass(result: ProjectResult): boolean {
  return result.circuits.every((c) => c.verdict === 'pass');
}

function countChecks(result: ProjectResult, status: Status): number {
  return result.circuits.reduce((n, c) => n + c.checks.filter((k) => k.status === status).length, 0);
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/** A path as the user would type it from where they are. */
function display(io: CliIo, p: string): string {
  const rel = path.relative(io.cwd, p);
  if (rel === '') return '.';
  const outside = rel === '..' || rel.startsWith(`..${path.sep}`) || path.isAbsolute(rel);
  return outside ? p : rel;
}

// ---- the terminal table of `solve` (pure: text from the result) ----

const STATUS_ORDER: Record<Status, number> = { fail: 0, undetermined: 1, pass: 2 };
const STATUS_WORD: Record<Status, string> = { fail: 'FAIL', undetermined: 'UNDET', pass: 'pass' };
const CHECK_WORD: Record<CheckResult['name'], string> = {
  thermal_withstand: 'withstand',
  breaking_capacity: 'breaking',
  disconnection: 'disconnection',
  voltage_drop: 'voltage drop',
};

/** The readable summary of a solved project: board fault levels, problems first, then every circuit. */
/**
 * Text for a terminal: control characters (C0 but the line feed, DEL, C1) and the bidirectional
 * controls an id or description may hold are shown as \u escapes, so input cannot move the cursor,
 * recolour the terminal or reorder what is printed.
 */
export function printable(text: string): string {
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

export function solveTable(project: Project, result: ProjectResult): string {
  const lines: string[] = [];
  const m = project.meta;
  lines.push(`${m.name}  ${m.number} rev ${m.revision}  ${m.date}`);
  lines.push('');
  lines.push('Boards (fault levels)');
  lines.push(
    table(
      ['board', "I''k3max", 'i_p', "I''k1min", 'volt drop', 'fed by'],
      result.boards.map((b) => [
        `${'  '.repeat(b.depth)}${b.id}`,
        kA(b.ik3max),
        kA(b.ip),
        kA(b.ik1min),
        `${b.voltageDrop.toFixed(2)} %`,
        b.fedBy,
      ]),
      [false, true, true, true, true, false],
    ),
  );

  const problems = result.circuits
    .flatMap((c) => c.checks.filter((k) => k.status !== 'pass').map((k) => ({ c, k })))
    .sort((a, b) => STATUS_ORDER[a.k.status] - STATUS_ORDER[b.k.status] || byText(a.c.id, b.c.id));
  lines.push('');
  if (problems.length === 0) lines.push(protectiveConductorProblems(result).length > 0 ? 'Every check of the verdicts passes (see the protective conductors below).' : 'Every check passes.');
  else {
    lines.push(`Checks that fail or are undetermined (${problems.length})`);
    for (const { c, k } of problems) {
      const vs =
        k.limit === null
          ? ' no limit given'
          : ` ${k.value === null ? 'value not determined' : checkValue(k.name, k.value)} vs limit ${checkValue(k.name, k.limit)}`;
      lines.push(`  ${STATUS_WORD[k.status].padEnd(5)} ${c.id}  ${CHECK_WORD[k.name]}:${vs}`);
      if (k.explanation) lines.push(`        ${k.explanation}`);
    }
  }
  // The protective conductor's own check (IEC 60364-5-54 543.1.2) stands beside the four checks.
  const peProblems = protectiveConductorProblems(result);
  if (peProblems.length > 0) {
    lines.push('');
    lines.push(`Protective conductors that fail or are undetermined (${peProblems.length}), beside the four checks`);
    for (const c of peProblems) {
      lines.push(`  ${STATUS_WORD[c.protectiveConductor!.status].padEnd(5)} ${c.id}  PE withstand`);
      lines.push(`        ${c.protectiveConductor!.explanation}`);
    }
  }

  const circuits = [...result.circuits].sort(
    (a, b) => STATUS_ORDER[a.verdict] - STATUS_ORDER[b.verdict] || byText(a.id, b.id),
  );
  lines.push('');
  lines.push('Circuits');
  lines.push(
    table(
      ['verdict', 'circuit', 'from', 'device', "I''k3 origin", "I''k1min end", 'k2S2', 'let-through', 'thresh. L', 'max L', 'failing'],
      circuits.map((c) => circuitRow(c)),
      [false, false, false, false, true, true, true, true, true, true, false],
    ),
  );
  lines.push('');
  const count = (s: Status) => result.circuits.filter((c) => c.verdict === s).length;
  lines.push(
    `${plural(result.circuits.length, 'circuit')}: ${count('pass')} pass, ${count('fail')} fail, ${count('undetermined')} undetermined`,
  );
  return `${printable(lines.join('\n'))}\n`;
}

function circuitRow(c: CircuitResult): string[] {
  return [
    STATUS_WORD[c.verdict],
    c.id,
    c.from,
    c.device,
    kA(c.origin.ik3max),
    kA(c.end.ik1min),
    energy(c.withstand),
    c.letThrough === null ? '-' : energy(c.letThrough),
    c.thresholdLength === null ? 'none' : metres(c.thresholdLength),
    c.maxLength === null ? '-' : metres(c.maxLength),
    c.checks
      .filter((k) => k.status !== 'pass')
      .map((k) => `${CHECK_WORD[k.name]}${k.status === 'undetermined' ? '?' : ''}`)
      .join(', '),
  ];
}

function checkValue(name: CheckResult['name'], v: number): string {
  switch (name) {
    case 'thermal_withstand':
      return energy(v);
    case 'breaking_capacity':
      return kA(v);
    case 'disconnection':
      return v < 0.1 ? `${Number((v * 1000).toPrecision(3))} ms` : `${Number(v.toPrecision(3))} s`;
    case 'voltage_drop':
      return `${v.toFixed(2)} %`;
  }
}

function kA(a: number): string {
  return a >= 1000 ? `${(a / 1000).toFixed(2)} kA` : `${a.toFixed(0)} A`;
}

function energy(a2s: number): string {
  return `${a2s.toExponential(2)} A2s`;
}

function metres(m: number): string {
  return m >= 10_000 ? '>10 km' : `${m.toFixed(1)} m`;
}

/** Plain-text columns, padded; numbers right-aligned. */
function table(head: string[], rows: string[][], right: boolean[]): string {
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]?.length ?? 0)));
  const cell = (s: string, i: number) => (right[i] ? s.padStart(widths[i]!) : s.padEnd(widths[i]!));
  const line = (r: string[]) => `  ${r.map(cell).join('  ')}`.trimEnd();
  return [line(head), line(widths.map((w) => '-'.repeat(w))), ...rows.map(line)].join('\n');
}

/** Code-unit order, so the table does not depend on the machine's locale. */
function byText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
