import { threadId } from "node:worker_threads";
import { fileURLToPath } from "node:url";
import { afterEach, describe, expect, it, vi } from "vitest";
import { certificatePdfFailure } from "@/lib/server/pdf/certificate-pdf-pool";
import { RenderPool, RenderPoolError } from "@/lib/server/pdf/render-pool";

type Task = { value?: number; wait?: number; hang?: boolean; exit?: number; uncaught?: boolean; reject?: string };
type Answer = { threadId: number; value?: number };

const ECHO = fileURLToPath(new URL("./support/render-workers/echo.mjs", import.meta.url));
const pools: RenderPool<Task, Answer>[] = [];

function pool(options: Partial<ConstructorParameters<typeof RenderPool>[0]> = {}) {
  const p = new RenderPool<Task, Answer>({ filename: ECHO, threads: 1, maxQueue: 1, timeoutMs: 10_000, ...options });
  pools.push(p);
  return p;
}

async function failure(promise: Promise<unknown>): Promise<RenderPoolError> {
  const e = await promise.then(
    () => null,
    (err: unknown) => err,
  );
  expect(e).toBeInstanceOf(RenderPoolError);
  return e as RenderPoolError;
}

afterEach(async () => {
  await Promise.all(pools.splice(0).map((p) => p.close()));
});

describe("the render pool", () => {
  it("runs tasks on worker threads, not the calling thread", async () => {
    const p = pool({ threads: 2, maxQueue: 4 });
    const answers = await Promise.all([1, 2, 3, 4, 5].map((value) => p.run({ value })));
    expect(answers.map((a) => a.value)).toEqual([1, 2, 3, 4, 5]);
    for (const a of answers) expect(a.threadId).not.toBe(threadId);
    expect(p.admitted).toBe(0);
  });

  it("refuses at once, as busy and retryable, beyond its threads plus its waiting line", async () => {
    const p = pool({ threads: 1, maxQueue: 2 });
    const admitted = [1, 2, 3].map((value) => p.run({ value, wait: 50 }));
    const refused = await failure(p.run({ value: 4 }));
    expect(refused.reason).toBe("busy");
    expect(refused.retryable).toBe(true);
    expect((await Promise.all(admitted)).map((a) => a.value)).toEqual([1, 2, 3]);
    // Room again once the line has drained.
    expect((await p.run({ value: 5 })).value).toBe(5);
  });

  it("gives up on a task that never answers, and the next task gets a fresh thread", async () => {
    const p = pool({ timeoutMs: 2_000 });
    const first = await p.run({ value: 1 });
    const slow = await failure(p.run({ hang: true }));
    expect(slow.reason).toBe("timeout");
    expect(slow.retryable).toBe(true);
    const after = await p.run({ value: 2 });
    expect(after.value).toBe(2);
    expect(after.threadId).not.toBe(first.threadId);
  });

  it("times out a task still waiting in line behind a stuck one", async () => {
    const p = pool({ timeoutMs: 2_000, maxQueue: 1 });
    const [running, waiting] = await Promise.all([failure(p.run({ hang: true })), failure(p.run({ value: 1 }))]);
    expect(running.reason).toBe("timeout");
    expect(waiting.reason).toBe("timeout");
    expect((await p.run({ value: 3 })).value).toBe(3);
  });

  it("reports a thread that exits mid-task as failed and replaces the thread", async () => {
    const p = pool();
    const first = await p.run({ value: 1 });
    const crashed = await failure(p.run({ exit: 3 }));
    expect(crashed.reason).toBe("failed");
    expect(crashed.retryable).toBe(false);
    expect(crashed.message).toMatch(/exited with code: 3/);
    const after = await p.run({ value: 2 });
    expect(after.value).toBe(2);
    expect(after.threadId).not.toBe(first.threadId);
  });

  it("reports an uncaught error in the thread and a rejected task as failed, with their messages", async () => {
    const p = pool();
    expect((await failure(p.run({ uncaught: true }))).message).toMatch(/the renderer blew up/);
    const rejected = await failure(p.run({ reject: "no such font" }));
    expect(rejected.reason).toBe("failed");
    expect(rejected.message).toMatch(/no such font/);
    expect((await p.run({ value: 7 })).value).toBe(7);
  });

  it("says plainly when the worker module was never built", async () => {
    const p = pool({ filename: fileURLToPath(new URL("./support/render-workers/not-built.mjs", import.meta.url)) });
    const missing = await failure(p.run({ value: 1 }));
    expect(missing.reason).toBe("failed");
    expect(missing.message).toMatch(/not-built\.mjs does not exist/);
  });
});

describe("what the certificate route answers when a PDF cannot be had", () => {
  it("busy and timed out: 503 'unavailable' with a Retry-After; failed: 500 'internal', its cause logged", () => {
    const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
    const error = vi.spyOn(console, "error").mockImplementation(() => {});
    const busy = certificatePdfFailure(new RenderPoolError("busy", "full"));
    expect(busy.error.status).toBe(503);
    expect(busy.error.toJSON()).toEqual({ error: { code: "unavailable", message: expect.stringMatching(/try again in a few seconds/) } });
    expect(busy.retryAfterSeconds).toBeGreaterThan(0);

    const slow = certificatePdfFailure(new RenderPoolError("timeout", "slow"));
    expect(slow.error.status).toBe(503);
    expect(slow.error.toJSON().error).toMatchObject({ code: "unavailable", message: expect.stringMatching(/took too long/) });
    expect(slow.retryAfterSeconds).toBeGreaterThan(0);

    const failed = certificatePdfFailure(new RenderPoolError("failed", "worker exited with code: 1"));
    expect(failed.error.status).toBe(500);
    expect(failed.error.toJSON().error).toMatchObject({ code: "internal", message: expect.stringMatching(/could not be prepared/) });
    expect(failed.error.message).not.toMatch(/worker/);
    expect(failed.retryAfterSeconds).toBeNull();
    expect(warn).toHaveBeenCalledTimes(1);
    expect(error).toHaveBeenCalledTimes(1);
    expect(String(error.mock.calls[0]?.[1])).toMatch(/worker exited with code: 1/);
    warn.mockRestore();
    error.mockRestore();
  });
});
