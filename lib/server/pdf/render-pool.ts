import "server-only";
import { existsSync } from "node:fs";
import Piscina from "piscina";

/**
 * Why a render did not produce a document:
 * - busy: every thread is rendering and the waiting line is full; refused at once, try again shortly;
 * - timeout: no result within the time allowed (waiting plus rendering); the thread is stopped and replaced;
 * - failed: the renderer threw, or its thread died (the pool starts a new one).
 */
export type RenderFailure = "busy" | "timeout" | "failed";

export class RenderPoolError extends Error {
  readonly reason: RenderFailure;

  constructor(reason: RenderFailure, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = "RenderPoolError";
    this.reason = reason;
  }

  /** Busy and timed-out renders are worth retrying as they are; a failed one may fail again. */
  get retryable(): boolean {
    return this.reason !== "failed";
  }
}

export type RenderPoolOptions = {
  /** Absolute path of the worker module; its default export renders one task. */
  filename: string;
  threads: number;
  /** Tasks allowed to wait for a thread; beyond threads + maxQueue, run() refuses with "busy". */
  maxQueue: number;
  /** The longest a task may take from run() to its result, waiting included. */
  timeoutMs: number;
  /** Lower scheduling priority of the render threads, so request handling on the main thread comes first. */
  niceIncrement?: number;
  /** A runaway render stops at this heap size instead of growing the whole process. */
  maxHeapMb?: number;
};

/**
 * A fixed set of worker threads for CPU-heavy rendering, off the event loop that answers requests.
 * The pool itself is piscina; this adds admission control (piscina does not bound tasks that carry an
 * abort signal), the time limit, and one error type the route handlers can answer from.
 */
export class RenderPool<I, O> {
  readonly options: RenderPoolOptions;
  #pool: Piscina<I, O> | null = null;
  #admitted = 0;

  constructor(options: RenderPoolOptions) {
    if (!(options.threads >= 1)) throw new Error("a render pool needs at least one thread");
    if (!(options.maxQueue >= 0)) throw new Error("maxQueue must not be negative");
    this.options = options;
  }

  /** Tasks running or waiting right now. */
  get admitted(): number {
    return this.#admitted;
  }

  get capacity(): number {
    return this.options.threads + this.options.maxQueue;
  }

  async run(input: I): Promise<O> {
    if (this.#admitted >= this.capacity) {
      throw new RenderPoolError(
        "busy",
        `all ${this.options.threads} render threads are busy and ${this.options.maxQueue} tasks are waiting`,
      );
    }
    const pool = this.#start();
    const signal = AbortSignal.timeout(this.options.timeoutMs);
    this.#admitted++;
    try {
      return await pool.run(input, { signal });
    } catch (e) {
      if (signal.aborted) throw new RenderPoolError("timeout", `no result within ${this.options.timeoutMs} ms`, { cause: e });
      throw new RenderPoolError("failed", `render failed: ${e instanceof Error ? e.message : String(e)}`, { cause: e });
    } finally {
      this.#admitted--;
    }
  }

  /** Stops the threads; tasks still waiting are refused. A later run() starts a fresh set. */
  async close(): Promise<void> {
    const pool = this.#pool;
    this.#pool = null;
    if (pool) await pool.destroy();
  }

  #start(): Piscina<I, O> {
    if (this.#pool) return this.#pool;
    const { filename, threads, niceIncrement = 0, maxHeapMb } = this.options;
    if (!existsSync(filename)) {
      throw new RenderPoolError(
        "failed",
        `the worker module ${filename} does not exist; \`next build\` writes it (scripts/build-pdf-worker.mjs)`,
      );
    }
    const pool = new Piscina<I, O>({
      filename,
      minThreads: threads,
      maxThreads: threads,
      concurrentTasksPerWorker: 1,
      niceIncrement,
      ...(maxHeapMb ? { resourceLimits: { maxOldGenerationSizeMb: maxHeapMb } } : {}),
    });
    // A thread that dies between tasks is replaced by piscina; without a listener the 'error' event
    // would take the whole server down.
    pool.on("error", (e: unknown) => console.error("[bandedge] a render thread failed between tasks", e));
    this.#pool = pool;
    return pool;
  }
}
