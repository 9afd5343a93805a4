import fs from 'node:fs';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { buildTemplates, type TemplateLocations } from './database-templates';

declare module 'vitest' {
  export interface ProvidedContext {
    templates: TemplateLocations;
  }
}

/**
 * Builds the migrated database templates once per run, so each test file starts from a copy in
 * about half a second. TEST_DATABASE_URL runs the suites against a PostgreSQL server instead.
 */
export default async function setup(project: TestProject) {
  const templates = await buildTemplates(process.env['TEST_DATABASE_URL']);
  project.provide('templates', templates);
  return () => {
    const folder = templates.images ? path.dirname(templates.images.empty) : undefined;
    if (folder) fs.rmSync(folder, { recursive: true, force: true });
  };
}
