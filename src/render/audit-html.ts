import nunjucks from 'nunjucks';
import type { AuditStep, AuditView } from '../report/audit-view.ts';
import { fragment } from '../report/figure-links.ts';
import { formatFigure } from '../report/format.ts';

// Nunjucks' own escaping (the one autoescape uses); its type declarations leave it out.
const { escape } = nunjucks.lib as unknown as { escape: (text: string) => string };

/**
 * The body of an audit page (src/report/audit-view.ts) as HTML: a section per group with an
 * entry per step and the group's values table, then the input rows. An audit page holds
 * hundreds of steps and thousands of values: written here in one pass, as a string, it costs
 * a fraction of Nunjucks loops over the same view. Only formats: every text is escaped here;
 * the template takes the result as it is (a SafeString). Optional end tags (`</td>`, `</tr>`,
 * `</li>`) are left out, as HTML allows, to keep the page small.
 */
export function auditHtml(view: AuditView): nunjucks.runtime.SafeString {
  let html = '';
  const codes = view.indicators.map(escape);
  view.groups.forEach((group, g) => {
    html += `<section class="block" id="group-${g + 1}"><h2>${escape(group.title)}</h2>`;
    for (const step of group.steps) html += stepHtml(step);
    const rows = group.steps.filter((step) => step.values);
    if (rows.length > 0) {
      html += `<div class="scroll" tabindex="0" role="region" aria-label="Values per indicator: ${escape(group.title)}"><table class="grid values"><caption>Values per indicator, six significant figures (units above)</caption><thead><tr><th scope="col">Step`;
      for (const code of codes) html += `<th scope="col">${code}`;
      html += '<tbody>';
      for (const step of rows) {
        const values = step.values!;
        html += `<tr id="${escape(values.anchor)}"><th scope="row"><a href="#${escape(fragment(step.anchor))}">${escape(step.id)}</a>`;
        if (values.linked) {
          const prefix = escape(`${step.id}/`);
          for (let i = 0; i < codes.length; i++) html += `<td id="${prefix}${codes[i]}" data-code="${codes[i]}">${formatFigure(values.numbers[i]!)}`;
        } else {
          for (let i = 0; i < codes.length; i++) html += `<td>${formatFigure(values.numbers[i]!)}`;
        }
      }
      html += '</table></div>';
    }
    html += '</section>';
  });
  html += '<section class="block" id="inputs"><h2>Input rows</h2><p class="note">Each input row this product’s figures read, exactly as it appears in its file.</p>';
  for (const file of view.inputs) {
    html += `<h3>${escape(file.file)}</h3>`;
    for (const row of file.rows) html += `<div class="input-row" id="${escape(row.anchor)}"><p><code class="loc">${escape(file.file)}:${row.line}</code></p><pre>${escape(row.written)}</pre></div>`;
  }
  return new nunjucks.runtime.SafeString(`${html}</section>`);
}

function stepHtml(step: AuditStep): string {
  let html = `<div class="step" id="${escape(step.anchor)}"><h3><code>${escape(step.id)}</code>`;
  if (step.value !== undefined) html += ` = ${escape(step.value)} ${escape(step.unit ?? '')}`;
  if (step.values) html += ` <a class="to-values" href="#${escape(fragment(step.values.anchor))}">values</a>`;
  html += `</h3><p>${escape(step.description)} <code class="formula">${escape(step.formula)}</code>`;
  if (step.terms.length > 0) {
    html += '<ul class="terms">';
    for (const t of step.terms) html += `<li><a href="${escape(t.href)}">${escape(t.symbol)}</a>${escape(t.note)}`;
    html += '</ul>';
  }
  return `${html}</div>`;
}
