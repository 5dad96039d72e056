// The report's wording: Handlebars templates (templates/ in the package, overridden file by file by
// a project's own templates/ folder) rendered to a small block markup that the layout turns into
// pdfmake content. User text reaches a template only as data (wrapped with `literal()`), never as
// template source, so "{{" in a description prints as typed.

import Handlebars from 'handlebars';
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

const HELPERS: Record<string, (...args: never[]) => unknown> = {
  kA: (a: number | null) => fmt.kiloamps(a),
  mohm: (ohm: number | null) => fmt.milliohms(ohm),
  energy: (a2s: number | null) => fmt.energy(a2s),
  metres: (m: number | null) => fmt.metres(m),
  seconds: (s: number | null) => fmt.seconds(s),
  percent: (p: number | null) => fmt.percent(p),
  sig: (x: number | null) => fmt.factor(x),
  eq: (a: unknown, b: unknown) => a === b,
  ne: (a: unknown, b: unknown) => a !== b,
  not: (a: unknown) => !a,
  and: (a: unknown, b: unknown) => !!a && !!b,
  or: (a: unknown, b: unknown) => !!a || !!b,
  upper: (s: string) => String(s).toUpperCase(),
};

const COMPILE_OPTIONS = {
  strict: true,
  knownHelpersOnly: true,
  knownHelpers: Object.fromEntries(Object.keys(HELPERS).map((h) => [h, true])) as Record<string, true>,
  noEscape: true, // the output is markup for a PDF, not HTML
};

interface Source {
  text: string;
  origin: string; // for messages: "templates/sheet/verdict.hbs" (package) or the project's path
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

  constructor(
    private readonly defaults: TemplateFiles,
    private readonly overrides: TemplateFiles = new Map(),
    private readonly overrideRoot = 'project templates',
  ) {
    this.env = Handlebars.create();
    for (const [name, fn] of Object.entries(HELPERS)) this.env.registerHelper(name, fn as Handlebars.HelperDelegate);
    const partialNames = new Set([...defaults.keys(), ...overrides.keys()].filter((k) => k.startsWith('partials/')));
    for (const key of [...partialNames].sort()) {
      const src = this.source(key)!;
      const name = key.slice('partials/'.length).replace(/\.hbs$/, '');
      try {
        this.env.registerPartial(name, this.env.compile(src.text, COMPILE_OPTIONS));
      } catch (err) {
        throw new TemplateError(src.origin, (err as Error).message);
      }
    }
  }

  /** Compile every template now, so a broken project template is reported before a build writes anything. */
  check(): void {
    for (const name of [...new Set([...this.defaults.keys(), ...this.overrides.keys()])].sort()) {
      if (name.startsWith('partials/')) continue; // compiled in the constructor
      const src = this.source(name)!;
      try {
        this.env.precompile(src.text, COMPILE_OPTIONS); // compile() is lazy; this parses and checks helpers now
      } catch (err) {
        throw new TemplateError(src.origin, (err as Error).message);
      }
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

  private source(name: string): Source | undefined {
    const own = this.overrides.get(name);
    if (own !== undefined) return { text: own, origin: `${this.overrideRoot}/${name}`, key: `project:${name}` };
    const def = this.defaults.get(name);
    return def === undefined ? undefined : { text: def, origin: `templates/${name} (package)`, key: `package:${name}` };
  }

  private run(name: string, src: Source, context: object): string {
    const origin = src.origin;
    let tpl = this.compiled.get(src.key);
    try {
      if (!tpl) {
        tpl = this.env.compile(src.text, COMPILE_OPTIONS);
        this.compiled.set(src.key, tpl);
      }
      return tpl(context);
    } catch (err) {
      throw new TemplateError(origin, `cannot render ${name}: ${(err as Error).message}`);
    }
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
    const def = this.defaults.get(name);
    if (def === undefined) throw new TemplateError(`templates/${name}`, 'template not found');
    const merged = parseLabels(this.run(name, { text: def, origin: `templates/${name} (package)`, key: `package:${name}` }, {}));
    const own = this.overrides.get(name);
    if (own !== undefined)
      Object.assign(merged, parseLabels(this.run(name, { text: own, origin: `${this.overrideRoot}/${name}`, key: `project:${name}` }, {})));
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
