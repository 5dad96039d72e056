// JSON Schemas (draft 2020-12) of the three kinds of input file, generated from the same zod
// schemas the loader validates with, so that an editor's hints and the loader never disagree
// on field names. Unit-bearing values are strings; their description and pattern say so.

import * as z from 'zod';
import { circuitFileSchema, devicesFileSchema, projectFileSchema } from './schema.js';

export type InputFileKind = 'project' | 'devices' | 'circuit';

const TITLES: Record<InputFileKind, { title: string; description: string }> = {
  project: {
    title: 'faultsheet project.yaml',
    description: 'Project metadata, settings, supplies, assumptions and sign-off of a faultsheet project folder.',
  },
  devices: {
    title: 'faultsheet devices/*.yaml',
    description: 'Protective devices, as a list under "devices:". Device data must come from the maker\'s current datasheet.',
  },
  circuit: {
    title: 'faultsheet circuits/*.yaml',
    description: 'One circuit per file, or a list of circuits under "circuits:".',
  },
};

function generate(kind: InputFileKind, schema: z.ZodType): object {
  const generated = z.toJSONSchema(schema, { target: 'draft-2020-12', io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
  const { $schema, ...rest } = generated;
  return { $schema, ...TITLES[kind], ...rest };
}

export function jsonSchemas(): Record<InputFileKind, object> {
  return {
    project: generate('project', projectFileSchema),
    devices: generate('devices', devicesFileSchema),
    circuit: generate('circuit', circuitFileSchema),
  };
}
