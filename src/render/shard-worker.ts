// A shard worker of the build (src/render/build-site.ts): loads the validated project and
// builds every `workers`-th shard of products, reporting progress and outcomes over IPC.
import { rowsByProduct } from '../model/by-product.ts';
import { loadProject } from '../model/project.ts';
import { hasErrors } from '../problems.ts';
import { buildShard, type ShardOutcome, type WorkerMessage, type WorkerTask } from './build-site.ts';

const send = (message: WorkerMessage): Promise<void> => new Promise((resolve, reject) => process.send!(message, undefined, {}, (error) => (error ? reject(error) : resolve())));

const [dataDir, outDir, taskJson] = process.argv.slice(2);
try {
  const task = JSON.parse(taskJson!) as WorkerTask;
  const { project, problems } = await loadProject(dataDir!);
  // The parent validated the same files a moment ago; a change in between is a failure, not a different build.
  if (!project || hasErrors(problems)) throw new Error('the data folder changed during the build and no longer validates');
  const all = rowsByProduct(project).map((rows, index) => ({ rows, index }));
  const outcomes: ShardOutcome[] = [];
  for (let start = task.worker * task.shardSize; start < all.length; start += task.workers * task.shardSize) {
    const shard = all.slice(start, start + task.shardSize);
    outcomes.push(...(await buildShard(project, problems, outDir!, shard, task.pdfs)));
    await send({ kind: 'shard', products: shard.length });
  }
  await send({ kind: 'done', outcomes, peakRssMb: process.resourceUsage().maxRSS / 1024 });
  process.exit(0);
} catch (error) {
  await send({ kind: 'failed', message: (error as Error).message });
  process.exit(1);
}
