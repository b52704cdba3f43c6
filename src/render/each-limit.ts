/**
 * Runs `task` on every item with at most `limit` running at once and returns the results in
 * the items' order. For file-system work (hard links, stats, reads of a thousand small files):
 * one await after another leaves the disk and libuv's thread pool idle between calls.
 */
export async function mapLimit<T, R>(items: readonly T[], limit: number, task: (item: T, index: number) => Promise<R>): Promise<R[]> {
  const results = new Array<R>(items.length);
  let next = 0;
  const lane = async () => {
    while (next < items.length) {
      const index = next++;
      results[index] = await task(items[index]!, index);
    }
  };
  await Promise.all(Array.from({ length: Math.max(1, Math.min(limit, items.length)) }, lane));
  return results;
}

/** How many file-system calls run at once (libuv's pool has 4 threads; more in flight keeps it fed). */
export const FS_CONCURRENCY = 16;
