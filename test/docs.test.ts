import { describe, expect, it } from 'vitest';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { columnReference, jsonSchemas, withGeneratedReference } from '../src/schema/reference-doc.ts';
import { resultsJsonSchema } from '../src/report/results-schema.ts';
import { ROOT } from './helpers.ts';

// The docs are generated from the zod schemas; these tests fail when a schema changed and
// `npm run docs` was not run, so the documentation cannot drift from the checks.
describe('generated documentation is current', () => {
  it('docs/input-format.md', async () => {
    const doc = await readFile(path.join(ROOT, 'docs/input-format.md'), 'utf8');
    expect(doc).toBe(withGeneratedReference(doc));
  });

  it('docs/schema/*', async () => {
    for (const [name, schema] of Object.entries({ ...jsonSchemas(), 'results.schema.json': resultsJsonSchema() })) {
      expect(JSON.parse(await readFile(path.join(ROOT, 'docs/schema', name), 'utf8')), name).toEqual(schema);
    }
    expect(await readFile(path.join(ROOT, 'docs/schema/columns.md'), 'utf8')).toContain(columnReference());
  });
});

describe('README', () => {
  it('opens with the job, then the two-command quick start', async () => {
    const readme = await readFile(path.join(ROOT, 'README.md'), 'utf8');
    const firstParagraph = readme.split('\n\n')[1] ?? '';
    expect(firstParagraph).toMatch(/declaration/i);
    const quickStart = readme.indexOf('npm ci && npm run build');
    expect(quickStart).toBeGreaterThan(0);
    expect(readme.indexOf('npm test')).toBeGreaterThan(quickStart);
    expect(readme).toContain('docs/input-format.md');
  });
});
