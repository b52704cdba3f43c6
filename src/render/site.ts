import Eleventy from '@11ty/eleventy';
import path from 'node:path';
import { hashText, type HashedFile } from './verification.ts';
import type { SiteView } from '../report/site-view.ts';
import { ELEVENTY_CONFIG, TEMPLATES_DIR } from './paths.ts';

/** The templates of the catalogue-wide pages, written by the last render of a build only. */
const CATALOGUE_TEMPLATES = ['index.njk', 'factors.njk', 'verification.njk', 'checklist.njk'];

/**
 * Renders the HTML pages with Eleventy: one template per page kind, paginated over products.
 * Returns each page it wrote with its SHA-256, hashed from the text Eleventy wrote, so the
 * verification manifest need not read the pages again.
 */
export async function renderSite(view: SiteView, outDir: string): Promise<HashedFile[]> {
  const eleventy = new Eleventy(TEMPLATES_DIR, outDir, {
    configPath: ELEVENTY_CONFIG,
    quietMode: true,
    config: (config) => {
      config.addGlobalData('site', view);
      // A shard's render writes its products' pages only; the catalogue-wide pages come last, once.
      // Eleventy's ignores are paths relative to the working directory.
      if (!view.writesCatalogue) for (const template of CATALOGUE_TEMPLATES) config.ignores.add(path.relative(process.cwd(), path.join(TEMPLATES_DIR, template)));
    },
  });
  // The build reports its own progress; Eleventy's summary line would land on stdout.
  eleventy.disableLogger();
  const [, pages] = await eleventy.write();
  return pages.flatMap((page) => (page.outputPath ? [hashText(path.relative(outDir, page.outputPath).split(path.sep).join('/'), page.content)] : []));
}
