/**
 * What must be undone when the process is stopped from outside (Ctrl-C, SIGTERM, the death of
 * the process that started it): an unfinished staging folder, the browser, the shard workers.
 * Each is registered while it exists. Cleanups are synchronous, because a signal handler runs
 * them and exits at once; each returns what it did, in words, or nothing.
 */
export type Cleanup = () => string | undefined;

const pending: Cleanup[] = [];

/** Registers a cleanup until the returned function is called. */
export function onInterrupt(cleanup: Cleanup): () => void {
  pending.push(cleanup);
  return () => {
    const at = pending.indexOf(cleanup);
    if (at >= 0) pending.splice(at, 1);
  };
}

/** Runs every registered cleanup, the latest first, once; returns what they did. */
export function cleanUpNow(): string[] {
  const said: string[] = [];
  for (const cleanup of pending.splice(0).reverse()) {
    try {
      const line = cleanup();
      if (line) said.push(line);
    } catch (error) {
      said.push(`cleanup failed: ${(error as Error).message}`);
    }
  }
  return said;
}
