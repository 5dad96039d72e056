// The template layer: block markup, labels merged with a project's, strict/known helpers only,
// user text never compiled.
import { describe, expect, it } from 'vitest';
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
