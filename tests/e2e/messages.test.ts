// The message composers under a lost answer: the server stores the message, the browser never hears back,
// and the composer tries again with the same idempotency key. The shop (or the owner) sees it once; the next
// message gets a key of its own.
import type { Browser, Page, Route } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer } from "../support/accounts";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import { seedJobWithEstimate } from "../fixtures/jobs";
import { createJob } from "../integration/bench-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestPool();
});

type Sent = { key: string; body: string; status: number | "lost" | "unsent" };

/**
 * Lets the first POST to `path` reach the server, then drops its answer; the next `unreachable` posts never
 * reach it (the connection is down); later ones pass. Records each attempt's key and text.
 */
async function loseFirstAnswer(page: Page, path: RegExp, field: string, { unreachable = 0 } = {}): Promise<Sent[]> {
  const sent: Sent[] = [];
  await page.route(path, async (route: Route) => {
    const req = route.request();
    if (req.method() !== "POST") return route.continue();
    const json = req.postDataJSON() as Record<string, unknown>;
    const attempt = { key: String(json.idempotencyKey), body: String(json[field]) };
    if (sent.length === 0) {
      await route.fetch();
      sent.push({ ...attempt, status: "lost" });
      return route.abort("connectionreset");
    }
    if (sent.length <= unreachable) {
      sent.push({ ...attempt, status: "unsent" });
      return route.abort("connectionrefused");
    }
    const response = await route.fetch();
    sent.push({ ...attempt, status: response.status() });
    return route.fulfill({ response });
  });
  return sent;
}

describe("a message whose answer was lost", () => {
  it("reaches the shop once from the owner's thread, and the next message is a new one", async () => {
    const owner = await newCustomer("msg-lost");
    const job = await seedJobWithEstimate({ email: owner.email, state: "approved" });
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, owner.email, owner.password);
    const sent = await loseFirstAnswer(page, /\/api\/portal\/jobs\/[0-9a-f-]+\/messages$/, "body");
    await page.goto(`/portal/jobs/${job.jobId}`);

    const text = "Shall I pack the original back cover, or keep it here?";
    await page.getByLabel("Write to the shop").fill(text);
    await page.getByRole("button", { name: "Send message" }).click();
    await expect.poll(() => page.getByLabel("Write to the shop").inputValue(), { timeout: 15_000 }).toBe("");
    expect(sent.map((s) => s.status)).toEqual(["lost", 200]);
    expect(sent[1]!.key).toBe(sent[0]!.key);
    expect(sent[0]!.key).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    await expect.poll(() => page.locator("ol li", { hasText: text }).count()).toBe(1);
    await snap(page, "messages-01-owner-lost-answer");
    const stored = await sql<{ n: number }>("select count(*)::int as n from message where job_id = $1 and body = $2", [job.jobId, text]);
    expect(stored[0]!.n).toBe(1);

    // The same words sent again on purpose are a new message, under a new key.
    await page.getByLabel("Write to the shop").fill(text);
    await page.getByRole("button", { name: "Send message" }).click();
    await expect.poll(() => page.locator("ol li", { hasText: text }).count()).toBe(2);
    expect(sent).toHaveLength(3);
    expect(sent[2]!.status).toBe(201);
    expect(sent[2]!.key).not.toBe(sent[0]!.key);
    await ctx.close();
  });

  it("asks the owner a question once from the triage panel: one message, one e-mail", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, DEMO.tech.email, DEMO.tech.password);
    const sent = await loseFirstAnswer(page, /\/api\/bench\/jobs\/[0-9a-f-]+\/question$/, "question");
    await page.goto(`/bench/jobs/${jobId}`);

    const question = "Does the tuning pointer move across the whole dial?";
    await page.getByLabel("Ask the owner a question").fill(question);
    await page.getByRole("button", { name: "Send question" }).click();
    await expect
      .poll(async () => (await sql<{ state: string }>("select state from job where id = $1", [jobId]))[0]!.state, { timeout: 15_000 })
      .toBe("awaiting_owner");
    await expect.poll(() => sent.length, { timeout: 15_000 }).toBe(2);
    expect(sent.map((s) => s.status)).toEqual(["lost", 200]);
    expect(sent[1]!.key).toBe(sent[0]!.key);
    await expect.poll(() => page.getByText(question).count()).toBe(1);
    await snap(page, "messages-02-question-lost-answer");

    const rows = await sql<{ id: string }>("select id from message where job_id = $1 and is_question", [jobId]);
    expect(rows).toHaveLength(1);
    const mails = await sql<{ n: number }>("select count(*)::int as n from email_outbox where dedupe_key = 'shop-question:' || $1", [
      rows[0]!.id,
    ]);
    expect(mails[0]!.n).toBe(1);
    await ctx.close();
  });

  it("tells the owner when an edited text meets an earlier version that did arrive, and sends the edit as a new message", async () => {
    const owner = await newCustomer("msg-edited");
    const job = await seedJobWithEstimate({ email: owner.email, state: "approved" });
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await signInPage(page, owner.email, owner.password);
    // The first try is stored but its answer lost; the two automatic retries find the connection down.
    const sent = await loseFirstAnswer(page, /\/api\/portal\/jobs\/[0-9a-f-]+\/messages$/, "body", { unreachable: 2 });
    await page.goto(`/portal/jobs/${job.jobId}`);

    const first = "Can you keep the old capacitors for me?";
    const box = page.getByLabel("Write to the shop");
    await box.fill(first);
    await page.getByRole("button", { name: "Send message" }).click();
    await expect.poll(() => page.getByText("We could not reach the shop's server").count(), { timeout: 20_000 }).toBe(1);
    expect(sent.map((s) => s.status)).toEqual(["lost", "unsent", "unsent"]);
    expect(new Set(sent.map((s) => s.key)).size).toBe(1);
    await expect.poll(() => box.inputValue()).toBe(first);

    // The owner rewords it and sends again: same key, other text — the server refuses, the page explains and
    // shows the version that arrived, and keeps the draft.
    const edited = "Can you keep the old capacitors and the dial cord for me?";
    await box.fill(edited);
    await page.getByRole("button", { name: "Send message" }).click();
    await expect
      .poll(() => page.getByText("An earlier version of this message already reached the shop").count(), { timeout: 15_000 })
      .toBe(1);
    expect(sent[3]).toMatchObject({ key: sent[0]!.key, body: edited, status: 409 });
    await expect.poll(() => page.locator("ol li", { hasText: first }).count()).toBe(1);
    expect(await box.inputValue()).toBe(edited);
    await snap(page, "messages-03-edited-after-lost-answer");

    await page.getByRole("button", { name: "Send message" }).click();
    await expect.poll(() => page.locator("ol li", { hasText: edited }).count(), { timeout: 15_000 }).toBe(1);
    expect(sent[4]).toMatchObject({ body: edited, status: 201 });
    expect(sent[4]!.key).not.toBe(sent[0]!.key);
    const stored = await sql<{ body: string }>("select body from message where job_id = $1 order by created_at", [job.jobId]);
    expect(stored.map((m) => m.body)).toEqual([first, edited]);
    await ctx.close();
  });
});
