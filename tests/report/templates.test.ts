// The template layer: block markup, labels merged with a project's, strict/known helpers only,
// user text never compiled, hostile templates and templates folders refused.
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { defaultTemplatesDir, readTemplateFiles } from '../../src/report/assets.js';
import { TemplateError, TemplateSet, parseBlocks, parseLabels } from '../../src/report/templates.js';
import { literal } from '../../src/report/typeset.js';

const files = (entries: Record<string, string>): Map<string, string> => new Map(Object.entries(entries));

describe('block markup', () => {
  it('reads headings, paragraphs, lists, notes and slots', () => {
    const { blocks } = parseBlocks('# 1 Title\n\nFirst line\nsecond line.\n\n- item one\n  continued\n- item two\nA3. third\n> a note\n@@table\n');
    expect(blocks.map((b) => b.kind)).toEqual(['h1', 'p', 'bullet', 'bullet', 'numbered', 'note', 'slot']);
    expect(blocks[1].text).toBe('First line second line.');
    expect(blocks[2].text).toBe('item one continued');
    expect(blocks[4]).toMatchObject({ label: 'A3', text: 'third' });
    expect(blocks[6].text).toBe('table');
  });

  it('never reads user text as markup', () => {
    const r = parseBlocks(`Description: ${literal('# not a heading\n- not a list\n@@slot')}`);
    expect(r.blocks).toHaveLength(1);
    expect(r.blocks[0].kind).toBe('p');
    expect(r.literals).toEqual(['# not a heading\n- not a list\n@@slot']);
  });

  it('reads labels as key: text lines', () => {
    expect(parseLabels('a: One\n\nb.c:Two words\n')).toEqual({ a: 'One', 'b.c': 'Two words' });
  });
});

describe('TemplateSet', () => {
  it('prints "{{" in user data as typed (it is data, not template source)', () => {
    const set = new TemplateSet(files({ 'sheet/x.hbs': 'Circuit {{circuit.description}}' }));
    const out = set.text('sheet/x.hbs', { circuit: { description: literal('Pump {{#each x}} set {{> p}}') } });
    expect(out).toContain('Pump {{#each x}} set {{> p}}');
  });

  it('lets a project file replace a default file and merges labels key by key', () => {
    const set = new TemplateSet(
      files({ 'sheet/x.hbs': 'default text', 'sheet/labels.hbs': 'a: A\nb: B\n' }),
      files({ 'sheet/x.hbs': 'firm text', 'sheet/labels.hbs': 'b: Firm B\n' }),
    );
    expect(set.text('sheet/x.hbs', {})).toBe('firm text');
    expect(set.labels('sheet/labels.hbs')).toEqual({ a: 'A', b: 'Firm B' });
  });

  it('rejects unknown helpers and missing fields, naming the file', () => {
    const set = new TemplateSet(files({ 'sheet/a.hbs': '{{shout x}}', 'sheet/b.hbs': '{{circuit.nope}}' }), files({}));
    expect(() => set.text('sheet/a.hbs', { x: 1 })).toThrow(TemplateError);
    expect(() => set.text('sheet/a.hbs', { x: 1 })).toThrow(/templates\/sheet\/a\.hbs.*shout/);
    expect(() => set.text('sheet/b.hbs', { circuit: {} })).toThrow(/templates\/sheet\/b\.hbs.*"nope" not defined/);
  });

  it('offers the formatting helpers', () => {
    const set = new TemplateSet(files({ 'x.hbs': '{{kA a}} / {{energy e}} / {{metres m}}' }));
    expect(set.text('x.hbs', { a: 23810.4, e: 184552225, m: 3.74 })).toBe('23.8 kA / 1.85 x 10^8 A^2 s / 3.7 m');
  });
});

// Hostile templates: a project's templates/ folder is code written by someone else. The payloads
// below are the classic Handlebars prototype-pollution and code-execution chains, and their
// variants; none may run, touch Object.prototype, or fail other than as a TemplateError naming
// the file.
describe('hostile templates', () => {
  const RCE = [
    // the string.sub.apply chain: builds a Function from "constructor" and calls it
    '{{#with "s" as |string|}}{{#with "e"}}{{#with split as |conslist|}}{{this.pop}}{{this.push (lookup string.sub "constructor")}}{{this.pop}}' +
      '{{#with string.split as |codelist|}}{{this.pop}}{{this.push "return globalThis.__faultsheetPwned = 1;"}}{{this.pop}}' +
      '{{#each conslist}}{{#with (string.sub.apply 0 codelist)}}{{this}}{{/with}}{{/each}}{{/with}}{{/with}}{{/with}}{{/with}}',
    '{{#with this as |o|}}{{#with (o.constructor.constructor "globalThis.__faultsheetPwned = 1")}}{{this}}{{/with}}{{/with}}',
    '{{constructor.constructor "globalThis.__faultsheetPwned = 1"}}',
    '{{#with name as |n|}}{{n.constructor.constructor}}{{/with}}',
    '{{#each list}}{{this.constructor.constructor}}{{/each}}',
    '{{#with (lookup this "constructor")}}{{lookup this "constructor"}}{{/with}}',
    '{{#with list as |l|}}{{l.push "x"}}{{l.join}}{{/with}}',
    '{{#with name as |n|}}{{n.split "a"}}{{/with}}',
    '{{#with fn as |f|}}{{f.call}}{{f.apply}}{{f.bind}}{{/with}}',
  ];
  const POLLUTION = [
    '{{lookup this "__proto__"}}',
    '{{#with __proto__}}{{polluted}}{{/with}}',
    '{{#with this.__proto__}}x{{/with}}',
    '{{#with (lookup this "__proto__")}}{{/with}}',
    '{{this.[__proto__]}}',
    '{{[__proto__].polluted}}',
    '{{this.[constructor].[prototype]}}',
    '{{@root.__proto__}}',
    '{{../__proto__}}',
    '{{__defineGetter__ "polluted" fn}}',
    '{{__lookupGetter__}}',
    '{{hasOwnProperty}}{{valueOf}}{{toString}}',
    '{{#each this as |__proto__|}}{{/each}}',
    '{{> p __proto__=list}}',
    '{{#with obj as |o|}}{{o.prototype}}{{/with}}',
    '{{[a b]}}',
  ];
  const INCLUDES = [
    '{{> ../../etc/passwd}}',
    '{{> /etc/passwd}}',
    '{{> "../../../etc/passwd"}}',
    '{{> partials/p}}',
    '{{> (lookup . "name")}}',
    '{{> (upper "p")}}',
    '{{#> nowhere}}fallback{{/nowhere}}',
    '{{> missing}}',
    '{{* someDecorator}}',
    '{{#* other "x"}}{{/other}}',
  ];
  const OTHER = ['{{log "hello from a template"}}', '{{#log}}{{/log}}', '{{helperMissing}}x', '{{blockHelperMissing "x"}}'];

  const context = () => ({ name: 'n', list: [1, 2], obj: { a: 1 }, fn: () => 'called' });

  it.each([...RCE, ...POLLUTION, ...INCLUDES, ...OTHER].map((t) => [t]))('%s is a TemplateError naming the file, and nothing runs', (payload) => {
    const protoBefore = Object.getOwnPropertyNames(Object.prototype).sort();
    const logs: unknown[] = [];
    const spies = (['log', 'info', 'warn', 'error', 'debug'] as const).map((m) => vi.spyOn(console, m).mockImplementation((...a) => void logs.push(a)));
    try {
      const set = new TemplateSet(files({ 'sheet/x.hbs': 'default', 'partials/p.hbs': 'P' }), files({ 'sheet/x.hbs': payload }), '/proj/templates');
      let error: unknown;
      try {
        set.check();
        set.text('sheet/x.hbs', context());
      } catch (err) {
        error = err;
      }
      expect(error).toBeInstanceOf(TemplateError);
      expect((error as TemplateError).message).toMatch(/^\/proj\/templates\/sheet\/x\.hbs(?::\d+(?::\d+)?)?: \S/);
      expect((error as TemplateError).message).not.toContain('\n');
    } finally {
      for (const s of spies) s.mockRestore();
    }
    expect(logs).toEqual([]); // no console output (Handlebars' log helper, its prototype-access warnings)
    expect((globalThis as Record<string, unknown>).__faultsheetPwned).toBeUndefined();
    expect(Object.getOwnPropertyNames(Object.prototype).sort()).toEqual(protoBefore);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(Object.getPrototypeOf({})).toBe(Object.prototype);
  });

  it('still offers partials of both sets, inline partials and block parameters', () => {
    const set = new TemplateSet(
      files({ 'sheet/x.hbs': '', 'partials/p.hbs': 'P{{#if flag}}!{{/if}}', 'partials/q.hbs': 'Q' }),
      files({ 'sheet/x.hbs': '{{#*inline "i"}}I{{/inline}}{{> p flag=true}} {{> q}} {{> i}} {{#each list as |v k|}}{{k}}={{v}} {{/each}}{{> own}}', 'partials/q.hbs': 'q', 'partials/own.hbs': 'O' }),
    );
    set.check();
    expect(set.text('sheet/x.hbs', { list: [7, 8] })).toBe('P! q I 0=7 1=8 O');
  });

  it('checks the helpers\' arguments: a formatting helper takes one number', () => {
    const set = new TemplateSet(files({ 'a.hbs': '{{kA}}', 'b.hbs': '{{kA name}}', 'c.hbs': '{{kA x y}}', 'd.hbs': '{{upper obj}}', 'e.hbs': '{{kA nothing}}' }));
    expect(() => set.text('a.hbs', {})).toThrow(/templates\/a\.hbs \(package\): cannot render a\.hbs: helper "kA" takes one value, 0 given/);
    expect(() => set.text('b.hbs', { name: 'x' })).toThrow(/helper "kA" takes a number, got string/);
    expect(() => set.text('c.hbs', { x: 1, y: 2 })).toThrow(/takes one value, 2 given/);
    expect(() => set.text('d.hbs', { obj: {} })).toThrow(/helper "upper" takes text/);
    expect(set.text('e.hbs', { nothing: null })).toBe('—');
  });

  it('reports a field looked up in text, and a syntax error, on one line with the position', () => {
    const set = new TemplateSet(files({}), files({ 'a.hbs': 'x\n{{name.first}}', 'b.hbs': 'ok\n{{#if x}}never closed' }), 'T');
    expect(() => set.text('a.hbs', { name: 'text' })).toThrow(/^T\/a\.hbs: cannot render a\.hbs: "first" not defined: the value it is looked up in is text or a number/);
    expect(() => set.check()).toThrow(/^T\/a\.hbs|^T\/b\.hbs:\d+/);
    try {
      new TemplateSet(files({}), files({ 'b.hbs': 'ok\n{{#if x}}never closed' }), 'T').check();
      expect.unreachable();
    } catch (err) {
      expect((err as Error).message).toMatch(/^T\/b\.hbs:\d+: syntax error: /);
      expect((err as Error).message).not.toContain('\n');
    }
  });

  it('reports a partial that includes itself as a TemplateError', () => {
    const set = new TemplateSet(files({ 'x.hbs': '{{> loop}}', 'partials/loop.hbs': '{{> loop}}' }));
    expect(() => set.text('x.hbs', {})).toThrow(TemplateError);
  });
});

describe('reading a templates folder', () => {
  let root: string;
  beforeAll(() => {
    root = mkdtempSync(path.join(os.tmpdir(), 'faultsheet-templates-'));
  });
  afterAll(() => rmSync(root, { recursive: true, force: true }));

  /** A project folder with templates/ made by `make`; returns the templates/ path. */
  const project = (name: string, make: (templates: string, projectDir: string) => void): string => {
    const dir = path.join(root, name);
    const templates = path.join(dir, 'templates');
    mkdirSync(path.join(templates, 'sheet'), { recursive: true });
    make(templates, dir);
    return templates;
  };

  it('reads *.hbs files, links inside the project included', () => {
    const t = project('inside', (templates, dir) => {
      writeFileSync(path.join(templates, 'sheet/verdict.hbs'), '\uFEFFVerdict');
      writeFileSync(path.join(dir, 'shared.hbs'), 'shared');
      symlinkSync(path.join(dir, 'shared.hbs'), path.join(templates, 'sheet/cautions.hbs'));
      writeFileSync(path.join(templates, 'notes.txt'), 'not a template');
      symlinkSync('/nonexistent/anything', path.join(templates, 'broken-note.txt'));
      symlinkSync('..', path.join(templates, 'sheet/loop')); // a link back up: read once, no endless walk
    });
    const read = readTemplateFiles(t);
    expect(read.get('sheet/verdict.hbs')).toBe('Verdict');
    expect(read.get('sheet/cautions.hbs')).toBe('shared');
    expect([...read.keys()].every((k) => k.endsWith('.hbs'))).toBe(true);
  });

  it('rejects a link to a file outside the project, naming it', () => {
    const outside = path.join(root, 'secret.hbs');
    writeFileSync(outside, '{{name}}');
    const t = project('escape-file', (templates) => symlinkSync(outside, path.join(templates, 'sheet/verdict.hbs')));
    expect(() => readTemplateFiles(t)).toThrow(TemplateError);
    expect(() => readTemplateFiles(t)).toThrow(new RegExp(`^${t}/sheet/verdict\\.hbs: is a link to .*outside the project folder`));
  });

  it('rejects a linked folder outside the project, and a templates folder that is a link outside', () => {
    const t = project('escape-dir', (templates) => symlinkSync('/etc', path.join(templates, 'partials')));
    expect(() => readTemplateFiles(t)).toThrow(/escape-dir\/templates\/partials: is a link to \/etc, outside the project folder/);
    const dir = path.join(root, 'escape-root');
    mkdirSync(path.join(root, 'elsewhere/sheet'), { recursive: true });
    mkdirSync(dir);
    symlinkSync(path.join(root, 'elsewhere'), path.join(dir, 'templates'));
    expect(() => readTemplateFiles(path.join(dir, 'templates'))).toThrow(/escape-root\/templates: is a link to .*elsewhere, outside the project folder/);
  });

  it('rejects a link to nothing, a template that is not a regular file, binary and over-large files', () => {
    const broken = project('broken-link', (templates) => symlinkSync(path.join(templates, 'gone.hbs'), path.join(templates, 'sheet/verdict.hbs')));
    expect(() => readTemplateFiles(broken)).toThrow(/sheet\/verdict\.hbs: cannot be read \(ENOENT: a link to nothing\)/);
    const binary = project('binary', (templates) => writeFileSync(path.join(templates, 'sheet/verdict.hbs'), Buffer.from([0xff, 0xfe, 0x00, 0x80, 0xc3])));
    expect(() => readTemplateFiles(binary)).toThrow(/sheet\/verdict\.hbs: is not UTF-8 text/);
    const nul = project('nul', (templates) => writeFileSync(path.join(templates, 'sheet/verdict.hbs'), 'a\u0000b'));
    expect(() => readTemplateFiles(nul)).toThrow(/holds a NUL character/);
    const big = project('big', (templates) => writeFileSync(path.join(templates, 'sheet/verdict.hbs'), 'x'.repeat((1 << 20) + 1)));
    expect(() => readTemplateFiles(big)).toThrow(/is 1048577 bytes; a template may hold at most 1048576 bytes/);
    const fifo = project('fifo', (templates) => execFileSync('mkfifo', [path.join(templates, 'sheet/verdict.hbs')]));
    expect(() => readTemplateFiles(fifo)).toThrow(/sheet\/verdict\.hbs: is not a regular file/);
    const device = project('device', (templates) => symlinkSync('/dev/zero', path.join(templates, 'sheet/verdict.hbs')));
    expect(() => readTemplateFiles(device)).toThrow(/is a link to \/dev\/zero, outside the project folder/);
  });

  it('reads the package templates, and every one of them passes the checks', () => {
    const set = new TemplateSet(readTemplateFiles(defaultTemplatesDir));
    expect(() => set.check()).not.toThrow();
  });
});

describe('errors inside partials', () => {
  it('names the partial file where the error is, and the template that included it', () => {
    const set = new TemplateSet(files({ 'sheet/x.hbs': 'a\n{{> p}}', 'partials/p.hbs': 'b\n{{kA name}}' }), files({ 'partials/p.hbs': 'own\n\n{{kA name}}' }), 'T');
    expect(() => set.text('sheet/x.hbs', { name: 'text' })).toThrow(
      /^T\/partials\/p\.hbs: cannot render sheet\/x\.hbs: helper "kA" takes a number, got string \(in partial partials\/p\.hbs, included from templates\/sheet\/x\.hbs \(package\)\)$/,
    );
    const loop = new TemplateSet(files({ 'x.hbs': '{{> loop}}' }), files({ 'partials/loop.hbs': '{{> loop}}' }), 'T');
    expect(() => loop.text('x.hbs', {})).toThrow(/^T\/partials\/loop\.hbs: .*a partial that includes itself/);
  });
});
