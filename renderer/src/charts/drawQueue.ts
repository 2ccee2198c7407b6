/**
 * Chart redraws, one per task. Four plots of a thousand runs each take tens of milliseconds to draw;
 * drawn together they made one task the window could not answer a click during. Queued here, each
 * chart draws in its own task (a fresh timer turn), so clicks and key presses get in between.
 * A chart queued again before its turn keeps its place and draws only its latest state.
 */
export interface DrawQueue {
  /** Run `draw` in a task of its own, after those queued before it; replaces `owner`'s waiting draw. */
  queue(owner: object, draw: () => void): void;
  /** Drop `owner`'s waiting draw (a chart being removed). */
  cancel(owner: object): void;
  /** Draws waiting. */
  readonly waiting: number;
  /**
   * What the last draw of every chart took together, ms: a chart waits a few times this between its
   * redraws, so while runs keep arriving the plots take a bounded share of the page's time.
   */
  readonly cost: number;
}

export function createDrawQueue(schedule: (run: () => void) => void = (run) => setTimeout(run, 0), now: () => number = () => performance.now()): DrawQueue {
  // insertion order is the order of turns; replacing a value keeps the key's place
  const waiting = new Map<object, () => void>();
  const costs = new Map<object, number>();
  let scheduled = false;
  function turn(): void {
    scheduled = false;
    const next = waiting.entries().next();
    if (next.done) return;
    const [owner, draw] = next.value;
    waiting.delete(owner);
    // schedule the next turn first, so a draw that throws does not stall the others
    if (waiting.size > 0) arm();
    const t0 = now();
    try {
      draw();
    } finally {
      costs.set(owner, now() - t0);
    }
  }
  function arm(): void {
    if (scheduled) return;
    scheduled = true;
    schedule(turn);
  }
  return {
    queue(owner, draw) {
      waiting.set(owner, draw);
      arm();
    },
    cancel(owner) {
      waiting.delete(owner);
      costs.delete(owner);
    },
    get waiting() {
      return waiting.size;
    },
    get cost() {
      let sum = 0;
      for (const c of costs.values()) sum += c;
      return sum;
    },
  };
}

/** The window's one queue: every plot on screen takes its turn in it. */
export const drawQueue = createDrawQueue();
