import { loadProject, type Project } from '../model/project.ts';
import { rowsByProduct } from '../model/by-product.ts';
import { productStatus } from '../model/verification-status.ts';
import type { SiteAllocation } from '../model/sites.ts';
import { formatShare } from '../format.ts';
import { printProblems } from './report-problems.ts';
import { EXIT, type Io } from './io.ts';
import { hasErrors } from '../problems.ts';

export async function runCheck(options: { data: string; json: boolean }, io: Io): Promise<number> {
  const { project, problems } = await loadProject(options.data);
  if (options.json) io.out(JSON.stringify(problems, null, 2));
  else {
    printProblems(problems, options.data, io);
    if (project) for (const line of siteShares(project.allocation)) io.out(line);
    if (project) for (const line of verificationLines(project)) io.out(line);
  }
  return hasErrors(problems) ? EXIT.input : EXIT.ok;
}

/**
 * Each product's verification status, where the data folder has a verifier's record: verified,
 * or a draft and why (the build also compares each results.json with the one verified).
 */
export function verificationLines(project: Project): string[] {
  if (project.verification.state.kind === 'none') return [];
  return rowsByProduct(project).map((rows) => {
    const status = productStatus(project, rows);
    const id = rows.product.value.product_id;
    return status.status === 'verified' ? `verification: ${id} verified by ${status.verifier} on ${status.date}` : `verification: ${id} draft: ${status.reasons.join('; ')}`;
  });
}

/** The share of each product in every site period's keys, for the practitioner to look over. */
export function siteShares(allocation: SiteAllocation): string[] {
  const lines: string[] = [];
  for (const group of allocation.groups) {
    for (const key of group.keys.values()) {
      const shares = [...key.values.entries()].map(([product, value]) => `${product} ${formatShare(value / key.total)}`);
      lines.push(`site ${group.site}, ${group.period}, shared by ${key.name} (ISO 14044 §4.3.4): ${shares.join(', ')}`);
    }
  }
  return lines;
}
