// Typesetting of the sheets' plain-text markup into pdfmake text runs: I''k3max -> I″ with a real
// subscript, k^2 S^2 -> k²S², 10^8 -> a superscript, ohm -> Ω, c_max -> c with subscript "max".
// User text (descriptions, assumptions, names from YAML) is wrapped with `literal()` and is never
// typeset, parsed for markup or compiled as a template: it prints as typed.

export interface Run {
  text: string;
  sub?: boolean;
  sup?: boolean;
  bold?: boolean;
}

const LIT_OPEN = '\uE000';
const LIT_CLOSE = '\uE001';
const SUB_OPEN = '\uE010';
const SUB_CLOSE = '\uE011';
const SUP_OPEN = '\uE012';
const SUP_CLOSE = '\uE013';
const BOLD = '\uE014';
const PRIVATE = /[\uE000-\uE0FF]/g;

/** Mark user text as literal: it passes through templates and typesetting untouched. */
export function literal(text: string): string {
  return LIT_OPEN + text.replace(PRIVATE, '') + LIT_CLOSE;
}

/** Remove literal marks (for places that want the raw text back, e.g. PDF metadata). */
export function unmark(text: string): string {
  return text.replace(PRIVATE, '');
}

const GREEK: Record<string, string> = {
  theta: 'θ',
  beta: 'β',
  kappa: 'κ',
  phi: 'φ',
  Delta: 'Δ',
  delta: 'δ',
  alpha: 'α',
};
const GREEK_WORD = /\b(theta|beta|kappa|phi|Delta|delta|alpha)\b/g;

const sub = (s: string): string => SUB_OPEN + s + SUB_CLOSE;
/** What follows "_": letters, digits and Greek, with ",end"-style qualifiers (Z_k,end; R_θ). */
const SUBSCRIPT_BODY = '[A-Za-z0-9Α-Ωα-ω]+(?:,[A-Za-z0-9]+)*';
const sup = (s: string): string => SUP_OPEN + s.replace(/-/g, '−') + SUP_CLOSE;

/** Apply the symbol rules to markup text (no literals inside). Returns text with style marks. */
function symbols(text: string): string {
  let s = text;
  s = s.replace(/\bk\^2 ?S\^2/g, 'k²S²');
  s = s.replace(/\bI\^2 ?t\b/g, 'I²t');
  s = s.replace(/\bA\^2 ?s\b/g, 'A²s');
  s = s.replace(/\bA2s\b/g, 'A²s');
  s = s.replace(/sqrt\(3\)/g, '√3');
  s = s.replace(/sqrt\(/g, '√(');
  s = s.replace(/<=/g, '≤').replace(/>=/g, '≥').replace(/->/g, '→');
  // I''k3max, I″k1min,end, S''kQ: a double prime, the rest (with ",end"-style qualifiers) as subscript
  s = s.replace(/([A-Za-z])(?:''|″)((?:[A-Za-z0-9]+)(?:,[A-Za-z0-9]+)*)?/g, (_m, base: string, rest?: string) => `${base}″${rest ? sub(rest) : ''}`);
  s = s.replace(new RegExp(`\\b(theta|beta|kappa|phi|Delta|delta|alpha)_(\\{[^}]*\\}|${SUBSCRIPT_BODY})`, 'g'), (_m, g: string, rest: string) =>
    GREEK[g] + sub(rest.replace(/^\{|\}$/g, '')),
  );
  s = s.replace(
    new RegExp(`(^|[^A-Za-z0-9_])([A-Za-zΑ-Ωα-ω]″?)_(\\{[^}]*\\}|${SUBSCRIPT_BODY})`, 'g'),
    (_m, pre: string, base: string, rest: string) => pre + base + sub(rest.replace(/^\{|\}$/g, '')),
  );
  s = s.replace(GREEK_WORD, (g: string) => GREEK[g]);
  s = s.replace(/([A-Za-zΩ)²])\^2\b/g, '$1²').replace(/([A-Za-zΩ)])\^3\b/g, '$1³');
  s = s.replace(/\^(\{[^}]*\}|\([^()]*\)|[-−]?[0-9]+(?:\.[0-9]+)?)/g, (_m, e: string) => sup(e.replace(/^[{(]|[})]$/g, '')));
  s = s.replace(/\bmohm\b/g, 'mΩ').replace(/\bohm\b/g, 'Ω').replace(/\bdegC\b/g, '°C').replace(/\bmm2\b/g, 'mm²');
  s = s.replace(/ x (?=\S)/g, ' × ');
  s = s.replace(/\*\*/g, BOLD);
  return s;
}

/** Split `text` into code parts and literal parts (marked with `literal()` or by placeholder). */
function segments(text: string, literals: readonly string[]): Array<{ literal: boolean; text: string }> {
  const out: Array<{ literal: boolean; text: string }> = [];
  const re = /\uE000([\s\S]*?)\uE001|\uE002(\d+)\uE003/g;
  let last = 0;
  for (let m = re.exec(text); m; m = re.exec(text)) {
    if (m.index > last) out.push({ literal: false, text: text.slice(last, m.index) });
    out.push({ literal: true, text: m[1] ?? literals[Number(m[2])] ?? '' });
    last = re.lastIndex;
  }
  if (last < text.length) out.push({ literal: false, text: text.slice(last) });
  return out;
}

/** Markup text to pdfmake runs. `literals` resolves placeholders left by the block parser. */
export function typeset(text: string, literals: readonly string[] = []): Run[] {
  const runs: Run[] = [];
  let bold = false;
  const push = (t: string, style: { sub: boolean; sup: boolean }): void => {
    if (!t) return;
    const prev = runs[runs.length - 1];
    if (prev && !!prev.sub === style.sub && !!prev.sup === style.sup && !!prev.bold === bold) {
      prev.text += t;
      return;
    }
    const run: Run = { text: t };
    if (style.sub) run.sub = true;
    if (style.sup) run.sup = true;
    if (bold) run.bold = true;
    runs.push(run);
  };
  for (const seg of segments(text, literals)) {
    if (seg.literal) {
      push(seg.text, { sub: false, sup: false });
      continue;
    }
    const marked = symbols(seg.text);
    const style = { sub: false, sup: false };
    let buf = '';
    for (const ch of marked) {
      if (ch === SUB_OPEN || ch === SUB_CLOSE || ch === SUP_OPEN || ch === SUP_CLOSE || ch === BOLD) {
        push(buf, style);
        buf = '';
        if (ch === SUB_OPEN) style.sub = true;
        else if (ch === SUB_CLOSE) style.sub = false;
        else if (ch === SUP_OPEN) style.sup = true;
        else if (ch === SUP_CLOSE) style.sup = false;
        else bold = !bold;
      } else buf += ch;
    }
    push(buf, style);
  }
  return runs;
}

/** The runs' text joined (what a reader or pdftotext sees, without sub/sup positioning). */
export function runsText(runs: readonly Run[]): string {
  return runs.map((r) => r.text).join('');
}

const SUBSCRIPT: Record<string, string> = {
  '0': '₀', '1': '₁', '2': '₂', '3': '₃', '4': '₄', '5': '₅', '6': '₆', '7': '₇', '8': '₈', '9': '₉',
  a: 'ₐ', e: 'ₑ', h: 'ₕ', i: 'ᵢ', j: 'ⱼ', k: 'ₖ', l: 'ₗ', m: 'ₘ', n: 'ₙ', o: 'ₒ', p: 'ₚ', r: 'ᵣ',
  s: 'ₛ', t: 'ₜ', u: 'ᵤ', v: 'ᵥ', x: 'ₓ',
};
const SUPERSCRIPT: Record<string, string> = {
  '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹',
  '−': '⁻', '-': '⁻',
};

/** Markup to a single plain string with Unicode sub/superscripts (for chart labels). */
export function plain(text: string): string {
  return typeset(text)
    .map((r) => {
      if (r.sub) return [...r.text].map((c) => SUBSCRIPT[c] ?? c).join('');
      if (r.sup) return [...r.text].map((c) => SUPERSCRIPT[c] ?? c).join('');
      return r.text;
    })
    .join('');
}
