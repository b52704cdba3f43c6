// Eleventy configuration for the declaration site. loopsheet runs Eleventy itself
// (src/render/site.ts) with the view model as global data `site`; templates only lay out
// what the view model already formatted.
import nunjucks from 'nunjucks';

const { escape } = nunjucks.lib;

/**
 * The rows of an audit value table (src/report/audit-view.ts AuditNode.rows): one row per
 * indicator, its value and the per-indicator values of its terms. An audit page holds tens
 * of thousands of such rows; as a Nunjucks loop they were most of the build's time (each
 * loop iteration sets seven loop variables), as a filter a fraction. Every text is escaped
 * here; the result is marked safe so that it is not escaped twice.
 */
function auditValueRows(rows) {
  let html = '';
  for (const row of rows) {
    html += `<tr id="${escape(row.anchor)}"><th>${escape(row.code)}</th><td>${escape(row.value)}</td>`;
    for (const cell of row.cells) html += cell.href ? `<td><a href="${escape(cell.href)}">${escape(cell.text)}</a></td>` : `<td>${escape(cell.text)}</td>`;
    html += '</tr>';
  }
  return new nunjucks.runtime.SafeString(html);
}

export default function (eleventyConfig) {
  eleventyConfig.addPassthroughCopy({ 'templates/assets': 'assets' });
  // Input text reaches the page escaped: autoescape stays on, and no `| safe` on input text.
  eleventyConfig.setNunjucksEnvironmentOptions({ autoescape: true, throwOnUndefined: false });
  eleventyConfig.setQuietMode(true);
  eleventyConfig.addFilter('auditValueRows', auditValueRows);
  // Eleventy warns on stderr when one filter takes more than 8 % of a run; auditValueRows
  // does by design (it renders most of an audit page). Timing is npm run bench's job.
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
