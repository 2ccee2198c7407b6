/**
 * Changes to the reactive state gathered and applied together: while a thousand runs are read and
 * reduced, each finishing run would otherwise set off its own round of recomputing the run list, the
 * styles and the plots (work that grows with the number of runs, so the square of it in all). Changes
 * made within one interval land in one go, so the page redraws once per batch.
 */
export interface CommitBatch {
  /** Apply `change` with the next batch (at most the interval from now), in the order given. */
  later(change: () => void): void;
  /** Apply every waiting change now. */
  flush(): void;
  /** Changes waiting. */
  readonly waiting: number;
}

export function createCommitBatch(intervalMs: number | (() => number) = 100): CommitBatch {
  const interval = typeof intervalMs === 'number' ? () => intervalMs : intervalMs;
  let pending: (() => void)[] = [];
  let timer: ReturnType<typeof setTimeout> | undefined;
  function flush(): void {
    if (timer !== undefined) clearTimeout(timer);
    timer = undefined;
    const list = pending;
    pending = [];
    for (const change of list) change();
  }
  return {
    later(change) {
      pending.push(change);
      timer ??= setTimeout(flush, interval());
    },
    flush,
    get waiting() {
      return pending.length;
    },
  };
}

/**
 * Runs steps at most `limit` at a time, in the order given. Reads of several files overlap (the page
 * reads one file while the worker parses another), yet a campaign of thousands never opens them all at once.
 */
export interface StepPool {
  run(step: () => Promise<void>): Promise<void>;
  /** Resolves when no step is running or waiting. */
  idle(): Promise<void>;
  readonly busy: boolean;
}

export function createStepPool(limit: number, onError: (err: unknown) => void): StepPool {
  const waiting: (() => void)[] = [];
  let running = 0;
  let idleWaiters: (() => void)[] = [];
  function next(): void {
    while (running < limit && waiting.length > 0) waiting.shift()!();
    if (running === 0 && waiting.length === 0) {
      const list = idleWaiters;
      idleWaiters = [];
      for (const w of list) w();
    }
  }
  return {
    run(step) {
      return new Promise<void>((resolve) => {
        waiting.push(() => {
          running++;
          // a step that throws is a bug: reported, and the next steps still run
          void Promise.resolve()
            .then(step)
            .catch(onError)
            .finally(() => {
              running--;
              resolve();
              next();
            });
        });
        next();
      });
    },
    idle() {
      if (running === 0 && waiting.length === 0) return Promise.resolve();
      return new Promise<void>((r) => idleWaiters.push(r));
    },
    get busy() {
      return running > 0 || waiting.length > 0;
    },
  };
}
