import nunjucks from 'nunjucks';
import type { AuditGroup, AuditLink } from '../report/audit-view.ts';
import { valuesAnchor } from '../report/audit-view.ts';
import { fragment } from '../report/figure-links.ts';

// Nunjucks' own escaping (the one autoescape uses); its type declarations leave it out.
const { escape } = nunjucks.lib as unknown as { escape: (text: string) => string };

/**
 * One group of an audit page (src/report/audit-view.ts): a section per step, then the
 * group's values table. An audit page holds hundreds of steps and thousands of values; as
 * Nunjucks loops they were most of the build's time (each iteration sets several loop
 * variables), as a string writer a fraction. Only formats: every text is escaped here, and
 * the template marks the result safe so that it is not escaped twice.
 */
export function auditGroupHtml(group: AuditGroup, indicators: readonly string[], groupTitle = group.title): string {
  let html = '';
  const links = (list: AuditLink[]) => list.map((u) => `<a href="${escape(u.href)}">${escape(u.text)}</a>`).join(', ');
  for (const step of group.steps) {
    const id = escape(step.id);
    html += `<article class="figure" id="${id}"><h3><code>${id}</code>`;
    if (step.value !== undefined) html += ` = ${escape(step.value)} ${escape(step.unit ?? '')}`;
    if (step.vector) html += ` <a class="to-values" href="#${escape(fragment(valuesAnchor(step.id)))}">values</a>`;
    html += `</h3><p>${escape(step.description)}</p><p class="formula"><code>${escape(step.formula)}</code></p>`;
    if (step.terms.length > 0) {
      html += '<ul class="terms">';
      for (const t of step.terms) html += `<li><code>${escape(t.symbol)}</code> → <a href="${escape(t.target.href)}">${escape(t.target.text)}</a>${t.value === undefined ? '' : ` = ${escape(t.value)}`}</li>`;
      html += '</ul>';
    }
    if (step.usedBy.length > 0) html += `<p class="used-by">Used by: ${links(step.usedBy)}</p>`;
    html += '</article>';
  }
  if (group.values.length === 0) return html;
  html += `<div class="scroll" tabindex="0" role="region" aria-label="Values per indicator: ${escape(groupTitle)}"><table class="grid values"><caption>Values per indicator (six significant figures; units as listed above)</caption><thead><tr><th scope="col">Step</th>`;
  for (const code of indicators) html += `<th scope="col">${escape(code)}</th>`;
  html += '</tr></thead><tbody>';
  for (const row of group.values) {
    html += `<tr id="${escape(valuesAnchor(row.step))}"><th scope="row"><a href="#${escape(fragment(row.step))}">${escape(row.step)}</a></th>`;
    row.cells.forEach((cell, i) => {
      html += cell.anchor === undefined ? `<td>${escape(cell.text)}</td>` : `<td id="${escape(cell.anchor)}" data-code="${escape(indicators[i]!)}">${escape(cell.text)}</td>`;
    });
    html += '</tr>';
  }
  return `${html}</tbody></table></div>`;
}
