// One circuit's sheet from project + result to PDF bytes, and the build's template set. Shared by
// the build (in process) and the worker threads of the sheet pool.

import type { Project } from '../model/types.js';
import type { CircuitResult, ProjectResult } from '../calc/types.js';
import { defaultTemplatesDir, readTemplateFiles } from './assets.js';
import { sheetCharts } from './charts.js';
import type { Renderer } from './render.js';
import { SHEET_IMAGES, sheetDocument } from './sheet.js';
import { TemplateSet, type TemplateFiles } from './templates.js';

let defaultFiles: TemplateFiles | null = null;

/** The package templates with the project's templates/ folder laid over them, file by file. */
export function projectTemplates(project: Project): TemplateSet {
  defaultFiles ??= readTemplateFiles(defaultTemplatesDir);
  const own = project.templatesDir ? readTemplateFiles(project.templatesDir) : new Map<string, string>();
  return new TemplateSet(defaultFiles, own, project.templatesDir ?? 'templates');
}

/** Render one circuit's sheet (result.circuits[index]) to PDF bytes. */
export async function renderSheet(project: Project, result: ProjectResult, index: number, templates: TemplateSet, renderer: Renderer): Promise<Buffer> {
  return renderCircuitSheet(project, result.circuits[index], index, result.circuits.length, templates, renderer);
}

/** Render the sheet of `cr`, sheet `index + 1` of `count`, to PDF bytes. */
export async function renderCircuitSheet(project: Project, cr: CircuitResult, index: number, count: number, templates: TemplateSet, renderer: Renderer): Promise<Buffer> {
  const circuit = project.circuits.find((c) => c.id === cr.id);
  if (!circuit) throw new Error(`internal error: circuit ${cr.id} is in the result but not in the project`);
  const charts = sheetCharts(cr, circuit, templates.labels('sheet/labels.hbs'));
  const images = {
    [SHEET_IMAGES.energy]: renderer.chart(charts.energy),
    [SHEET_IMAGES.time]: renderer.chart(charts.time),
    [SHEET_IMAGES.length]: renderer.chart(charts.length),
  };
  const doc = sheetDocument(project, cr, { templates, index: index + 1, count });
  return renderer.pdf(doc, images);
}
