// Eleventy configuration for the declaration site. loopsheet runs Eleventy itself
// (src/render/site.ts) with the view model as global data `site`; templates only lay out
// what the view model already formatted (each page's front matter gives its `root`, the
// relative path to the site's top, so that out/ opens from disk as well as from a server).
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const PACKAGE_ROOT = path.dirname(fileURLToPath(import.meta.url));

export default function (eleventyConfig) {
  // Eleventy takes the working directory (the user's folder) as its project: its paths are
  // written relative to it, and nothing of that folder may reach the site. The user's
  // .gitignore is not ours to follow, and the templates sit inside node_modules once
  // loopsheet is installed, which Eleventy ignores by default.
  eleventyConfig.setUseGitIgnore(false);
  eleventyConfig.ignores.delete('**/node_modules/**');
  eleventyConfig.addPassthroughCopy({ [path.relative(process.cwd(), path.join(PACKAGE_ROOT, 'templates', 'assets'))]: 'assets' });
  // Input text reaches the page escaped: autoescape stays on, and no `| safe` on input text.
  eleventyConfig.setNunjucksEnvironmentOptions({ autoescape: true, throwOnUndefined: false });
  eleventyConfig.setQuietMode(true);
  return {
    templateFormats: ['njk'],
    htmlTemplateEngine: 'njk',
    // Input and output folders are given by loopsheet on each run (src/render/site.ts).
    dir: { includes: '_includes' },
  };
}
