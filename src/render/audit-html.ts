import nunjucks from 'nunjucks';
import type { AuditRun, AuditStep, AuditTerm, AuditView } from '../report/audit-view.ts';
import { fragment } from '../report/figure-links.ts';
import { formatFigure } from '../format.ts';

// Nunjucks' own escaping (the one autoescape uses); its type declarations leave it out.
const { escape } = nunjucks.lib as unknown as { escape: (text: string) => string };

/**
 * The body of an audit page (src/report/audit-view.ts) as HTML: a section per group with an
 * entry per step, a table per run of steps of one kind, and the group's values table for the
 * other steps with a value per indicator; then the input rows. An audit page holds hundreds of
 * steps and thousands of values: written here in one pass, as a string, it costs a fraction of
 * Nunjucks loops over the same view. Only formats: every text is escaped here; the template
 * takes the result as it is (a SafeString). Optional end tags (`</td>`, `</tr>`, `</li>`) are
 * left out, as HTML allows, to keep the page small.
 */
export function auditHtml(view: AuditView): nunjucks.runtime.SafeString {
  let html = '';
  const codes = view.indicators.map(escape);
  // Head cells of a table head are column heads without `scope`; the page's script finds an indicator's column by its code.
  const codeHeads = codes.map((code) => `<th>${code}`).join('');
  view.groups.forEach((group, g) => {
    html += `<section class="block" id="group-${g + 1}"><h2>${escape(group.title)}</h2>`;
    for (const item of group.items) html += item.run ? runHtml(item.run, codeHeads) : stepHtml(item.step);
    const rows = group.items.flatMap((item) => (item.step?.values ? [item.step] : []));
    if (rows.length > 0) {
      html += `<div class="scroll" tabindex="0" role="region" aria-label="Values per indicator: ${escape(group.title)}"><table class="grid values"><caption>Values per indicator, six significant figures (units above)</caption><thead><tr><th>Step${codeHeads}<tbody>`;
      for (const step of rows) {
        const values = step.values!;
        html += `<tr id="${escape(values.anchor)}"><th><a href="#${escape(fragment(step.anchor))}">${escape(step.id)}</a>`;
        if (values.linked) {
          const prefix = escape(`${step.id}/`);
          for (let i = 0; i < codes.length; i++) html += `<td id="${prefix}${codes[i]}">${formatFigure(values.numbers[i]!)}`;
        } else {
          html += valueCells(values.numbers);
        }
      }
      html += '</table></div>';
    }
    html += '</section>';
  });
  html += '<section class="block" id="inputs"><h2>Input rows</h2><p class="note">Each input row this product’s figures read: a CSV row cell by cell under its file’s header (the cells as written, quotes removed; the files themselves are in the verification pack), other lines exactly as they appear in their file.</p>';
  for (const file of view.inputs) {
    html += `<h3>${escape(file.file)}</h3>`;
    const tabled = file.rows.filter((row) => file.header && row.cells);
    if (tabled.length > 0) {
      html += `<div class="scroll" tabindex="0" role="region" aria-label="Rows of ${escape(file.file)}"><table class="grid input-rows"><thead><tr><th scope="col">Line</th>`;
      for (const name of file.header!) html += `<th scope="col">${escape(name)}</th>`;
      html += '</tr></thead><tbody>';
      for (const row of tabled) {
        html += `<tr class="input-row" id="${escape(row.anchor)}"><td id="${row.short}"><code class="loc">${escape(file.file)}:${row.line}</code></td>`;
        for (const cell of row.cells!) html += `<td>${escape(cell)}`;
        html += '</tr>';
      }
      html += '</tbody></table></div>';
    }
    for (const row of file.rows) if (!(file.header && row.cells)) html += `<div class="input-row" id="${escape(row.anchor)}"><code class="loc">${escape(file.file)}:${row.line}</code>${row.what ? ` <span class="what">${escape(row.what)}</span>` : ''}<pre id="${row.short}">${escape(row.written)}</pre></div>`;
  }
  return new nunjucks.runtime.SafeString(`${html}</section>`);
}

function valueCells(numbers: readonly number[]): string {
  let html = '';
  for (const n of numbers) html += `<td>${formatFigure(n)}`;
  return html;
}

function stepHtml(step: AuditStep): string {
  let html = `<div class="step" id="${escape(step.anchor)}"><h3><code>${escape(step.id)}</code>`;
  if (step.value !== undefined) html += ` = ${escape(step.value)} ${escape(step.unit ?? '')}`;
  if (step.values) html += ` <a class="to-values" href="#${escape(fragment(step.values.anchor))}">values</a>`;
  html += `</h3><p>${escape(step.description)} <code class="formula">${escape(step.formula)}</code>`;
  if (step.terms.length > 0) {
    html += '<ul class="terms">';
    for (const t of step.terms) html += `<li>${termLink(t)}`;
    html += '</ul>';
  }
  if (step.keyed) {
    html += '<table class="grid terms"><thead><tr><th>';
    for (const column of step.keyed.columns) html += `<th>${escape(column.symbol)}${column.qualifier ? ` <small>${escape(column.qualifier)}</small>` : ''}`;
    html += '<tbody>';
    for (const row of step.keyed.rows) {
      html += `<tr><th>${escape(row.key)}`;
      row.cells.forEach((term, i) => {
        html += term ? `<td>${termCell(term, step.keyed!.columns[i]!.qualifier)}` : '<td>';
      });
    }
    html += '</table>';
    if (step.keyed.after.length > 0) html += `<ul class="terms">${step.keyed.after.map((t) => `<li>${termLink(t)}`).join('')}</ul>`;
  }
  return `${html}</div>`;
}

/**
 * A run as one table: a row per step, anchored as the step; the terms every row shares are
 * said once above it, the head names the others once (with what their rows share); the cells
 * are the terms' values linked down, then the step's own value, or its values per indicator.
 * A row's head is what its id puts for the `*` of the run's (`L3` in `cutoff/A1/line:*`).
 */
function runHtml(run: AuditRun, codeHeads: string): string {
  const pattern = escape(run.pattern);
  let html = `<div class="run"><h3><code>${pattern}</code> · ${run.rows.length} steps</h3><p>${escape(run.description)} <code class="formula">${escape(run.formula)}</code></p>`;
  if (run.shared.length > 0) html += `<p class="shared">In every row: ${run.shared.map(termLink).join(' · ')}</p>`;
  html += `<div class="scroll" tabindex="0" role="region" aria-label="Steps ${pattern}"><table class="grid values run"><thead><tr><th>Step`;
  for (const subject of run.subjects) html += `<th>${subject}`;
  if (run.columns) {
    for (const column of run.columns) html += `<th>${escape(column.symbol)}${column.qualifier ? ` <small>${escape(column.qualifier)}</small>` : ''}`;
  } else {
    html += '<th>Terms';
  }
  html += run.vector ? codeHeads : `<th>= <small>${escape(run.unit ?? '')}</small>`;
  html += '<tbody>';
  for (const row of run.rows) {
    const step = row.step;
    html += `<tr id="${escape(step.anchor)}"><th>${escape(row.key)}`;
    for (const subject of row.subjects) html += `<td>${escape(subject)}`;
    if (run.columns) {
      step.terms.forEach((term, i) => {
        html += `<td>${termCell(term, run.columns![i]!.qualifier)}`;
      });
    } else {
      html += `<td>${step.terms.map(termLink).join(' · ')}`;
    }
    html += step.values ? valueCells(step.values.numbers) : `<td>${escape(step.value ?? '')}`;
  }
  return `${html}</table></div></div>`;
}

/** A term in a table cell: its value (or factor id) linked down, with its qualifier where the column's head does not give it. */
const termCell = (term: AuditTerm, shared: string): string => `<a href="${escape(term.href)}">${escape(term.text || term.symbol)}</a>${shared || !term.qualifier ? '' : ` ${escape(term.qualifier)}`}`;

const termLink = (t: AuditTerm): string => `<a href="${escape(t.href)}">${escape(t.symbol)}</a>${escape(t.note)}`;
