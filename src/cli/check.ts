import { loadProject } from '../model/project.ts';
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
  }
  return hasErrors(problems) ? EXIT.input : EXIT.ok;
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
