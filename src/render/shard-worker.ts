// A shard worker of the build (src/render/build-site.ts): loads the validated project,
// receives its task over IPC and builds the shards it names, reporting progress and
// outcomes back.
import { rowsByProduct } from '../model/by-product.ts';
import { loadProject } from '../model/project.ts';
import { hasErrors, ToolError } from '../problems.ts';
import { buildShard, type WorkerMessage, type WorkerTask } from './build-site.ts';

const send = (message: WorkerMessage): Promise<void> => new Promise((resolve, reject) => process.send!(message, undefined, {}, (error) => (error ? reject(error) : resolve())));
const task = new Promise<WorkerTask>((resolve) => process.once('message', (message) => resolve(message as WorkerTask)));

// The build that started this worker has gone (killed, or stopped by a signal): so does the worker.
process.on('disconnect', () => process.exit(1));

const [dataDir, outDir] = process.argv.slice(2);
try {
  const [{ project, problems }, { shards, pdfs, context, uncertainty }] = await Promise.all([loadProject(dataDir!), task]);
  // The parent validated the same files a moment ago; a change in between is a failure, not a different build.
  if (!project || hasErrors(problems)) throw new Error('the data folder changed during the build and no longer validates');
  if (uncertainty) project.declaration.uncertainty = uncertainty;
  const all = rowsByProduct(project);
  for (const indices of shards) {
    await send({ kind: 'shard', outcomes: await buildShard(project, problems, outDir!, indices.map((index) => ({ rows: all[index]!, index })), pdfs, context) });
  }
  await send({ kind: 'done', peakRssMb: process.resourceUsage().maxRSS / 1024 });
  process.exit(0);
} catch (error) {
  await send({ kind: 'failed', message: (error as Error).message, input: error instanceof ToolError && error.kind === 'input' });
  process.exit(1);
}
