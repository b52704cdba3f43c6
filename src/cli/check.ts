import { loadProject } from '../model/project.ts';
import { printProblems } from './report-problems.ts';
import { EXIT, type Io } from './io.ts';
import { hasErrors } from '../problems.ts';

export async function runCheck(options: { data: string; json: boolean }, io: Io): Promise<number> {
  const { problems } = await loadProject(options.data);
  if (options.json) io.out(JSON.stringify(problems, null, 2));
  else printProblems(problems, options.data, io);
  return hasErrors(problems) ? EXIT.input : EXIT.ok;
}
