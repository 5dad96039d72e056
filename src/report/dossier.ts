// The dossier: the summary and every sheet merged page for page (the sheets are laid out once),
// with a PDF outline (bookmarks): the summary, then one entry per circuit. pdf-lib writes no clock
// and no random id here; dates come from the project, the object layout is fixed.

import { PDFArray, PDFDict, PDFDocument, PDFHexString, PDFName, PDFNumber, PDFRef, PDFString, StandardFonts, rgb } from 'pdf-lib';

export interface DossierPart {
  bytes: Uint8Array;
  title: string; // outline entry, plain text
  file?: string; // the sheet's own file name: links to it from the summary become jumps inside the dossier
}

export interface DossierMeta {
  title: string;
  subject: string;
  date: Date;
  summaryTitle: string;
  sheetsTitle: string;
  pageLabel?: string; // "Dossier page {n} of {total}", stamped under each page's footer
}

/** Pages of a PDF we wrote. */
export async function pageCount(bytes: Uint8Array): Promise<number> {
  return (await PDFDocument.load(bytes, { updateMetadata: false })).getPageCount();
}

interface OutlineNode {
  title: string;
  page: PDFRef;
  children: OutlineNode[];
}

/** Merge the summary and the sheets into one PDF with bookmarks. */
export async function mergeDossier(summary: DossierPart, sheets: DossierPart[], meta: DossierMeta): Promise<Uint8Array> {
  const out = await PDFDocument.create({ updateMetadata: false });
  const firstPages: PDFRef[] = [];
  for (const part of [summary, ...sheets]) {
    const doc = await PDFDocument.load(part.bytes, { updateMetadata: false });
    const pages = await out.copyPages(doc, doc.getPageIndices());
    pages.forEach((p) => out.addPage(p));
    firstPages.push(pages[0].ref);
  }
  if (meta.pageLabel) await stampPageNumbers(out, meta.pageLabel);
  const summaryPages = (await PDFDocument.load(summary.bytes, { updateMetadata: false })).getPageCount();
  const targets = new Map<string, PDFRef>();
  sheets.forEach((s, i) => {
    if (s.file) targets.set(s.file, firstPages[i + 1]!);
  });
  linkWithinDossier(out, summaryPages, targets);
  writeOutline(out, [
    { title: meta.summaryTitle, page: firstPages[0], children: [] },
    ...(sheets.length
      ? [{ title: meta.sheetsTitle, page: firstPages[1], children: sheets.map((s, i) => ({ title: s.title, page: firstPages[i + 1], children: [] })) }]
      : []),
  ]);
  out.setTitle(meta.title);
  out.setSubject(meta.subject);
  out.setCreator('faultsheet');
  out.setProducer('faultsheet');
  out.setCreationDate(meta.date);
  out.setModificationDate(meta.date);
  return out.save({ useObjectStreams: false, addDefaultPage: false, updateFieldAppearances: false });
}

/**
 * The dossier's own page number under each page's footer, so that the index's page numbers can be
 * followed in print. Helvetica is one of the standard fonts of PDF (32000-1:2008 9.6.2.2): nothing is
 * embedded, and the bytes stay the same from build to build.
 */
async function stampPageNumbers(doc: PDFDocument, pattern: string): Promise<void> {
  const font = await doc.embedFont(StandardFonts.Helvetica);
  const pages = doc.getPages();
  const size = 6.5;
  pages.forEach((page, i) => {
    const text = pattern.replace('{n}', String(i + 1)).replace('{total}', String(pages.length));
    const { width } = page.getSize();
    page.drawText(text, { x: (width - font.widthOfTextAtSize(text, size)) / 2, y: 14, size, font, color: rgb(0.45, 0.5, 0.56) });
  });
}

/**
 * The summary links each circuit to its sheet's file (a URI action, PDF 32000-1:2008 12.6.4.7); inside
 * the dossier the sheet is a page away, so each such link becomes a destination on that page (12.3.2).
 */
function linkWithinDossier(doc: PDFDocument, summaryPages: number, targets: Map<string, PDFRef>): void {
  for (const page of doc.getPages().slice(0, summaryPages)) {
    const annots = page.node.lookupMaybe(PDFName.of('Annots'), PDFArray);
    if (!annots) continue;
    for (let i = 0; i < annots.size(); i++) {
      const annot = annots.lookupMaybe(i, PDFDict);
      const action = annot?.lookupMaybe(PDFName.of('A'), PDFDict);
      const uri = action?.lookupMaybe(PDFName.of('URI'), PDFString, PDFHexString);
      const target = uri ? targets.get(uri.decodeText()) : undefined;
      if (!annot || !target) continue;
      const dest = PDFArray.withContext(doc.context);
      dest.push(target);
      dest.push(PDFName.of('Fit'));
      annot.delete(PDFName.of('A'));
      annot.set(PDFName.of('Dest'), dest);
    }
  }
}

/** Write /Outlines into the catalog (PDF 32000-1:2008, 12.3.3), every level open. */
function writeOutline(doc: PDFDocument, nodes: OutlineNode[]): void {
  const ctx = doc.context;
  const rootRef = ctx.nextRef();
  const build = (items: OutlineNode[], parent: PDFRef): { first: PDFRef; last: PDFRef; count: number } => {
    const refs = items.map(() => ctx.nextRef());
    let count = 0;
    items.forEach((item, i) => {
      const dict = ctx.obj({}) as PDFDict;
      dict.set(PDFName.of('Title'), PDFHexString.fromText(item.title));
      dict.set(PDFName.of('Parent'), parent);
      if (i > 0) dict.set(PDFName.of('Prev'), refs[i - 1]);
      if (i < items.length - 1) dict.set(PDFName.of('Next'), refs[i + 1]);
      const dest = PDFArray.withContext(ctx);
      dest.push(item.page);
      dest.push(PDFName.of('Fit'));
      dict.set(PDFName.of('Dest'), dest);
      count += 1;
      if (item.children.length) {
        const sub = build(item.children, refs[i]);
        dict.set(PDFName.of('First'), sub.first);
        dict.set(PDFName.of('Last'), sub.last);
        dict.set(PDFName.of('Count'), PDFNumber.of(sub.count));
        count += sub.count;
      }
      ctx.assign(refs[i], dict);
    });
    return { first: refs[0], last: refs[refs.length - 1], count };
  };
  const root = ctx.obj({ Type: 'Outlines' }) as PDFDict;
  if (nodes.length) {
    const top = build(nodes, rootRef);
    root.set(PDFName.of('First'), top.first);
    root.set(PDFName.of('Last'), top.last);
    root.set(PDFName.of('Count'), PDFNumber.of(top.count));
  }
  ctx.assign(rootRef, root);
  doc.catalog.set(PDFName.of('Outlines'), rootRef);
  doc.catalog.set(PDFName.of('PageMode'), PDFName.of('UseOutlines'));
}
