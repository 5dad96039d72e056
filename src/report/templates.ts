// The report's wording: Handlebars templates (templates/ in the package, overridden file by file by
// a project's own templates/ folder) rendered to a small block markup that the layout turns into
// pdfmake content. User text reaches a template only as data (wrapped with `literal()`), never as
// template source, so "{{" in a description prints as typed.

import Handlebars from 'handlebars';

type CompileOptions = NonNullable<Parameters<typeof Handlebars.compile>[1]>;
type RuntimeOptions = Handlebars.RuntimeOptions;
import * as fmt from './format.js';
import type { Project } from '../model/types.js';
import { literal } from './typeset.js';

/** A template set as read from disk: relative posix path ("sheet/verdict.hbs") -> source. */
export type TemplateFiles = ReadonlyMap<string, string>;

/** A template that failed to compile or render, named by file (and whether it is the project's). */
export class TemplateError extends Error {
  constructor(
    readonly file: string,
    readonly detail: string,
  ) {
    super(`${file}: ${detail}`);
    this.name = 'TemplateError';
  }
}

export type BlockKind = 'h1' | 'h2' | 'p' | 'bullet' | 'numbered' | 'note' | 'slot';

/** One block of rendered template text; `text` may hold literal placeholders resolved by `literals`. */
export interface Block {
  kind: BlockKind;
  text: string;
  label?: string; // the number of a numbered item, as written ("1", "A3")
}

export interface Rendered {
  blocks: Block[];
  literals: string[];
}

/** A formatting helper: exactly one argument, a number or nothing (shown as "—"). */
function numberHelper(name: string, format: (x: number | null) => string): Handlebars.HelperDelegate {
  return (...args: unknown[]) => {
    const values = args.slice(0, -1); // the last argument is Handlebars' options object
    if (values.length !== 1) throw new Error(`helper "${name}" takes one value, ${values.length} given`);
    const x = values[0];
    if (x != null && typeof x !== 'number') throw new Error(`helper "${name}" takes a number, got ${typeof x}`);
    return format(x ?? null);
  };
}

const HELPERS: Record<string, Handlebars.HelperDelegate> = {
  kA: numberHelper('kA', fmt.kiloamps),
  mohm: numberHelper('mohm', fmt.milliohms),
  energy: numberHelper('energy', fmt.energy),
  metres: numberHelper('metres', fmt.metres),
  seconds: numberHelper('seconds', fmt.seconds),
  percent: numberHelper('percent', fmt.percent),
  sig: numberHelper('sig', (x) => fmt.factor(x)),
  eq: (a: unknown, b: unknown) => a === b,
  ne: (a: unknown, b: unknown) => a !== b,
  not: (a: unknown) => !a,
  and: (a: unknown, b: unknown) => !!a && !!b,
  or: (a: unknown, b: unknown) => !!a || !!b,
  upper: (s: unknown) => {
    if (typeof s !== 'string' && typeof s !== 'number') throw new Error(`helper "upper" takes text, got ${s === null ? 'null' : typeof s}`);
    return String(s).toUpperCase();
  },
};

/** Handlebars' own helpers a template may use; `lookup` (a dynamic field name) and `log` (console output) are removed. */
const BUILTIN_HELPERS = ['if', 'unless', 'each', 'with'] as const;
const REMOVED_HELPERS = ['lookup', 'log'] as const;

// A template is a project file, so it is untrusted code: compiled strict (a misspelt field is an
// error), with only the helpers above (knownHelpersOnly: an unknown helper fails at compile time),
// without Handlebars' compat mode (no lookups up the context stack), and rendered with prototype
// access denied (the defaults of Handlebars 4.6+, written out so that no option turns them on).
const COMPILE_OPTIONS: CompileOptions = {
  strict: true,
  compat: false,
  knownHelpersOnly: true,
  knownHelpers: {
    ...Object.fromEntries(Object.keys(HELPERS).map((h) => [h, true])),
    ...Object.fromEntries(BUILTIN_HELPERS.map((h) => [h, true])),
    ...Object.fromEntries(REMOVED_HELPERS.map((h) => [h, false])),
  },
  noEscape: true, // the output is markup for a PDF, not HTML
};

const KNOWN_HELPERS: ReadonlySet<string> = new Set([...Object.keys(HELPERS), ...BUILTIN_HELPERS]);
const HELPER_LIST = [...KNOWN_HELPERS].join(', ');
/** Handlebars' helpers a template cannot call: the removed ones and the internal fallbacks. */
const HIDDEN_HELPERS: ReadonlySet<string> = new Set([...REMOVED_HELPERS, 'helperMissing', 'blockHelperMissing']);

const RUNTIME_OPTIONS: RuntimeOptions = {
  allowProtoPropertiesByDefault: false,
  allowProtoMethodsByDefault: false,
  allowedProtoProperties: {},
  allowedProtoMethods: {},
  allowCallsToHelperMissing: false,
};

/**
 * Names a template may not use as a field, a hash key or a block parameter: what Object.prototype
 * holds, every method of the built-in values a context can hold (arrays, text, numbers, functions:
 * `split`, `push`, `apply`, `bind`...), `prototype`, and anything starting with "__". These are
 * the steps of every known Handlebars prototype-pollution or code-execution payload; a sheet's
 * data never has a field of these names.
 */
const FORBIDDEN_NAMES: ReadonlySet<string> = (() => {
  const names = new Set<string>(['prototype', 'constructor', '__proto__']);
  for (const proto of [Object.prototype, Array.prototype, String.prototype, Number.prototype, Boolean.prototype, Function.prototype])
    for (const [key, d] of Object.entries(Object.getOwnPropertyDescriptors(proto))) if (typeof d.value === 'function') names.add(key);
  return names;
})();

/** A field name as templates write it: letters, digits, "_" and "-", or an array index. */
const FIELD_NAME = /^(?:[A-Za-z_][A-Za-z0-9_-]*|[0-9]+)$/;

interface HbsLoc {
  start: { line: number; column: number };
}
interface HbsNode {
  type: string;
  loc?: HbsLoc;
  [key: string]: unknown;
}

/** A problem found in a template before it is compiled, with its position (1-based). */
class TemplateProblem extends Error {
  constructor(
    message: string,
    readonly line?: number,
    readonly col?: number,
  ) {
    super(message);
  }
}

function problemAt(node: HbsNode, message: string): TemplateProblem {
  return new TemplateProblem(message, node.loc?.start.line, node.loc ? node.loc.start.column + 1 : undefined);
}

function checkName(node: HbsNode, name: string, what: string): void {
  if (FORBIDDEN_NAMES.has(name) || name.startsWith('__'))
    throw problemAt(node, `${what} "${name}" is not allowed: it names a built-in of JavaScript, not a field of the data`);
  if (!FIELD_NAME.test(name)) throw problemAt(node, `${what} "${name}" is not allowed: field names are letters, digits, "_" and "-"`);
}

/** Names of the inline partials (`{{#*inline "name"}}`) a template declares. */
function inlinePartials(node: unknown, found = new Set<string>()): Set<string> {
  if (Array.isArray(node)) for (const n of node) inlinePartials(n, found);
  else if (node && typeof node === 'object') {
    const n = node as HbsNode;
    if (n.type === 'DecoratorBlock') {
      const first = (n.params as HbsNode[] | undefined)?.[0];
      if (first?.type === 'StringLiteral') found.add(String(first.value));
    }
    for (const [key, value] of Object.entries(n)) if (key !== 'loc' && value && typeof value === 'object') inlinePartials(value, found);
  }
  return found;
}

/**
 * Check a parsed template before it is compiled: no forbidden or odd field names, no dynamic
 * partial and no partial that is not one of the set's `partials/` files (or declared inline), no
 * decorator but `inline`. Helpers are checked by the compiler (knownHelpersOnly).
 */
function checkTemplate(ast: HbsNode, partials: ReadonlySet<string>): void {
  const inline = inlinePartials(ast);
  const visit = (node: unknown): void => {
    if (Array.isArray(node)) return node.forEach(visit);
    if (!node || typeof node !== 'object') return;
    const n = node as HbsNode;
    if (n.type === 'BlockStatement') for (const p of ((n.program as HbsNode | undefined)?.blockParams as string[] | undefined) ?? []) checkName(n, p, 'block parameter');
    switch (n.type) {
      case 'MustacheStatement':
      case 'BlockStatement':
      case 'SubExpression': {
        const path = n.path as HbsNode;
        if (path.type === 'PathExpression' && HIDDEN_HELPERS.has(String(path.original)))
          throw problemAt(n, `no helper "${path.original}" for templates; the helpers are ${HELPER_LIST}`);
        if (path.type === 'PathExpression' && KNOWN_HELPERS.has(String(path.original))) {
          // a helper call: its name is not a field; its arguments and blocks are checked
          for (const [key, value] of Object.entries(n)) if (key !== 'loc' && key !== 'path' && value && typeof value === 'object') visit(value);
          return;
        }
        break;
      }
      case 'PathExpression':
        for (const part of n.parts as string[]) checkName(n, part, 'field');
        break;
      case 'HashPair':
        checkName(n, String(n.key), 'parameter');
        break;
      case 'PartialStatement':
      case 'PartialBlockStatement': {
        const name = n.name as HbsNode;
        if (name.type === 'SubExpression') throw problemAt(n, 'a partial named by an expression ({{> (...)}}) is not allowed: name the partial');
        const partial = name.type === 'PathExpression' ? String(name.original) : String(name.value);
        if (partial !== '@partial-block' && !partials.has(partial) && !inline.has(partial)) {
          const known = [...partials].sort().join(', ');
          throw problemAt(n, `no partial "${partial}": a partial is a file in partials/ of the package's or the project's templates folder${known ? ` (${known})` : ''}`);
        }
        break;
      }
      case 'Decorator':
        throw problemAt(n, 'decorators ({{* ...}}) are not allowed');
      case 'DecoratorBlock': {
        const path = n.path as HbsNode;
        if (path.type !== 'PathExpression' || path.original !== 'inline') throw problemAt(n, 'only the inline decorator ({{#*inline "name"}}) is allowed');
        visit(n.program);
        return;
      }
    }
    for (const [key, value] of Object.entries(n)) if (key !== 'loc' && value && typeof value === 'object') visit(value);
  };
  visit(ast);
}

/** Handlebars' error text, on one line, without its " - line:col" tail; the position separately. */
function describeError(err: unknown): { message: string; line?: number; col?: number } {
  if (err instanceof TemplateProblem) return { message: err.message, line: err.line, col: err.col };
  const e = err as { message?: unknown; lineNumber?: unknown; column?: unknown };
  let message = typeof e?.message === 'string' ? e.message : String(err);
  let line = typeof e?.lineNumber === 'number' ? e.lineNumber : undefined;
  let col = typeof e?.column === 'number' ? e.column + 1 : undefined;
  const parse = /^Parse error on line (\d+):\n[\s\S]*\n(Expecting [\s\S]*|.*)$/.exec(message);
  if (parse) {
    line = Number(parse[1]);
    col = undefined;
    message = `syntax error: ${parse[2].replace(/\s+/g, ' ')}`;
  }
  message = message.replace(/ - \d+:\d+$/, '').replace(/ not defined in \[object Object\]/, ' not defined');
  const unknown = /^You specified knownHelpersOnly, but used the unknown helper (.*)$/.exec(message);
  if (unknown) message = `unknown helper "${unknown[1]}"; the helpers are ${HELPER_LIST}`;
  const primitive = /^Cannot use 'in' operator to search for '(.*)' in /.exec(message);
  if (primitive) message = `"${primitive[1]}" not defined: the value it is looked up in is text or a number, not a group of fields`;
  if (err instanceof RangeError) message = `${message} (a partial that includes itself?)`;
  return { message: message.replace(/\s*\n\s*/g, ' '), line, col };
}

/** The partial an error was thrown in, where it was (see the TemplateSet constructor). */
const failedIn = new WeakMap<object, Source>();

interface Source {
  text: string;
  name: string; // "sheet/verdict.hbs"
  own: boolean; // the project's file, not the package's
  key: string; // compiled-template cache key, distinct for package and project files
}

/**
 * The templates of one build: package defaults with the project's files laid over them.
 * `labels.hbs` files are merged key by key (the project's keys win); every other file is replaced
 * as a whole.
 */
export class TemplateSet {
  private readonly env: typeof Handlebars;
  private readonly compiled = new Map<string, Handlebars.TemplateDelegate>();
  private readonly labelCache = new Map<string, Record<string, string>>();
  private readonly partialNames: ReadonlySet<string>;

  constructor(
    private readonly defaults: TemplateFiles,
    private readonly overrides: TemplateFiles = new Map(),
    private readonly overrideRoot = 'project templates',
  ) {
    this.env = Handlebars.create();
    for (const name of REMOVED_HELPERS) this.env.unregisterHelper(name);
    for (const [name, fn] of Object.entries(HELPERS)) this.env.registerHelper(name, fn);
    const partialKeys = [...new Set([...defaults.keys(), ...overrides.keys()].filter((k) => k.startsWith('partials/') && k.endsWith('.hbs')))].sort();
    this.partialNames = new Set(partialKeys.map((key) => key.slice('partials/'.length, -'.hbs'.length)));
    for (const key of partialKeys) {
      const src = this.source(key)!;
      const tpl = this.compile(src);
      // an error inside a partial is reported against the partial's file (the innermost one)
      const partial = ((context: unknown, options?: Handlebars.RuntimeOptions) => {
        try {
          return tpl(context, options);
        } catch (err) {
          if (err && typeof err === 'object' && !failedIn.has(err)) failedIn.set(err, src);
          throw err;
        }
      }) as Handlebars.TemplateDelegate;
      this.env.registerPartial(key.slice('partials/'.length, -'.hbs'.length), partial);
    }
  }

  /** Where a template comes from, for messages; with a position where known. */
  private where(src: Pick<Source, 'name' | 'own'>, line?: number, col?: number): string {
    const at = line === undefined ? '' : `:${line}${col === undefined ? '' : `:${col}`}`;
    return src.own ? `${this.overrideRoot}/${src.name}${at}` : `templates/${src.name}${at} (package)`;
  }

  private fail(src: Source, err: unknown, doing = ''): TemplateError {
    const d = describeError(err);
    const inner = err && typeof err === 'object' ? failedIn.get(err) : undefined;
    if (inner && inner.key !== src.key)
      return new TemplateError(this.where(inner, d.line, d.col), `${doing}${d.message} (in partial ${inner.name}, included from ${this.where(src)})`);
    return new TemplateError(this.where(src, d.line, d.col), `${doing}${d.message}`);
  }

  /** Parse, check and compile one template (Handlebars compiles the checked tree, not the text again). */
  private compile(src: Source): Handlebars.TemplateDelegate {
    const cached = this.compiled.get(src.key);
    if (cached) return cached;
    let tpl: Handlebars.TemplateDelegate;
    try {
      const ast = this.env.parse(src.text) as unknown as HbsNode;
      checkTemplate(ast, this.partialNames);
      this.env.precompile(ast as unknown as hbs.AST.Program, COMPILE_OPTIONS); // compile() is lazy; this checks helpers now
      tpl = this.env.compile(ast as unknown as hbs.AST.Program, COMPILE_OPTIONS);
    } catch (err) {
      throw this.fail(src, err);
    }
    this.compiled.set(src.key, tpl);
    return tpl;
  }

  /** Compile every template now, so a broken project template is reported before a build writes anything. */
  check(): void {
    for (const name of [...new Set([...this.defaults.keys(), ...this.overrides.keys()])].sort()) {
      if (name.startsWith('partials/')) continue; // compiled in the constructor
      this.compile(this.source(name)!);
      if (name.endsWith('labels.hbs') && this.overrides.has(name) && this.defaults.has(name)) this.compile(this.packageSource(name)!);
    }
  }

  /** The files of this set, to rebuild it elsewhere (a sheet child process). */
  files(): { defaults: TemplateFiles; overrides: TemplateFiles; overrideRoot: string } {
    return { defaults: this.defaults, overrides: this.overrides, overrideRoot: this.overrideRoot };
  }

  /** True where the project overrides `name`. */
  overridden(name: string): boolean {
    return this.overrides.has(name);
  }

  private packageSource(name: string): Source | undefined {
    const def = this.defaults.get(name);
    return def === undefined ? undefined : { text: def, name, own: false, key: `package:${name}` };
  }

  private source(name: string): Source | undefined {
    const own = this.overrides.get(name);
    if (own !== undefined) return { text: own, name, own: true, key: `project:${name}` };
    return this.packageSource(name);
  }

  private run(name: string, src: Source, context: object): string {
    const tpl = this.compile(src);
    let out: unknown;
    try {
      out = tpl(context, RUNTIME_OPTIONS);
    } catch (err) {
      throw this.fail(src, err, `cannot render ${name}: `);
    }
    return String(out);
  }

  /** Render a template to text. */
  text(name: string, context: object): string {
    const src = this.source(name);
    if (!src) throw new TemplateError(`templates/${name}`, 'template not found');
    return this.run(name, src, context);
  }

  /** Render a template to blocks. */
  render(name: string, context: object): Rendered {
    return parseBlocks(this.text(name, context));
  }

  /** Labels of a `labels.hbs` (rendered without context), defaults merged with the project's. */
  labels(name: string): Record<string, string> {
    const cached = this.labelCache.get(name);
    if (cached) return cached;
    const def = this.packageSource(name);
    if (def === undefined) throw new TemplateError(`templates/${name}`, 'template not found');
    const merged = parseLabels(this.run(name, def, {}));
    if (this.overrides.has(name)) Object.assign(merged, parseLabels(this.run(name, this.source(name)!, {})));
    this.labelCache.set(name, merged);
    return merged;
  }
}

/** `key: text` lines; blank lines ignored. */
export function parseLabels(text: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const line of text.split(/\r?\n/)) {
    const m = /^\s*([A-Za-z0-9_.-]+)\s*:\s?(.*)$/.exec(line);
    if (m) out[m[1]] = m[2].trimEnd();
  }
  return out;
}

/**
 * The block markup: `# heading`, `## subheading`, `- bullet`, `1. numbered`, `> note`, `@@slot`
 * (where the layout puts its table or chart), blank line between paragraphs; inline `**bold**`.
 * Literal spans (user text) are taken out first so nothing inside them counts as markup.
 */
export function parseBlocks(text: string): Rendered {
  const literals: string[] = [];
  const coded = text.replace(/\uE000([\s\S]*?)\uE001/g, (_m, inner: string) => {
    literals.push(inner);
    return `\uE002${literals.length - 1}\uE003`;
  });
  const blocks: Block[] = [];
  let open: Block | null = null;
  const close = (): void => {
    open = null;
  };
  for (const raw of coded.split(/\r?\n/)) {
    const line = raw.trimEnd();
    if (line.trim() === '') {
      close();
      continue;
    }
    let m: RegExpExecArray | null;
    if ((m = /^##\s+(.*)$/.exec(line))) {
      blocks.push({ kind: 'h2', text: m[1] });
      close();
    } else if ((m = /^#\s+(.*)$/.exec(line))) {
      blocks.push({ kind: 'h1', text: m[1] });
      close();
    } else if ((m = /^@@([A-Za-z0-9_-]+)\s*$/.exec(line))) {
      blocks.push({ kind: 'slot', text: m[1] });
      close();
    } else if ((m = /^-\s+(.*)$/.exec(line))) {
      open = { kind: 'bullet', text: m[1] };
      blocks.push(open);
    } else if ((m = /^([A-Za-z]?[0-9]{1,3})[.)]\s+(.*)$/.exec(line))) {
      open = { kind: 'numbered', label: m[1], text: m[2] };
      blocks.push(open);
    } else if ((m = /^>\s?(.*)$/.exec(line))) {
      const o = open as Block | null;
      if (o && o.kind === 'note') o.text += ' ' + m[1];
      else {
        open = { kind: 'note', text: m[1] };
        blocks.push(open);
      }
    } else {
      const o = open as Block | null;
      if (o && o.kind !== 'note') o.text += ' ' + line.trim();
      else {
        open = { kind: 'p', text: line.trim() };
        blocks.push(open);
      }
    }
  }
  return { blocks, literals };
}

/** The project's fields every template may print: user text marked literal, never compiled. */
export function projectContext(project: Project) {
  return {
    name: literal(project.meta.name),
    number: literal(project.meta.number),
    revision: literal(project.meta.revision),
    date: literal(project.meta.date),
    client: project.meta.client ? literal(project.meta.client) : null,
    hash: project.inputSha256,
    hashShort: project.inputSha256.slice(0, 12),
    criterion: project.settings.withstandCriterion,
  };
}
