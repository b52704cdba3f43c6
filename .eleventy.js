// Eleventy configuration for the declaration site. loopsheet runs Eleventy itself
// (src/render/site.ts) with the view model as global data `site`; templates only lay out
// what the view model already formatted.
export default function (eleventyConfig) {
  eleventyConfig.addPassthroughCopy({ 'templates/assets': 'assets' });
  // Input text reaches the page escaped: autoescape stays on, and no `| safe` on input text.
  eleventyConfig.setNunjucksEnvironmentOptions({ autoescape: true, throwOnUndefined: false });
  eleventyConfig.setQuietMode(true);
  // Eleventy warns on stderr when one part takes more than 8 % of a run; timing is npm run
  // bench's job.
  eleventyConfig.benchmarkManager.get('Configuration').setMinimumThresholdPercent(100);
  // Relative links, so that out/ opens from disk (file://) as well as from a server.
  eleventyConfig.addFilter('rootPath', (depth) => (depth > 0 ? '../'.repeat(depth) : './'));
  return {
    templateFormats: ['njk'],
    htmlTemplateEngine: 'njk',
    // Input and output folders are given by loopsheet on each run (src/render/site.ts).
    dir: { includes: '_includes' },
  };
}
