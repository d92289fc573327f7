// Posting a message is idempotent: the author's key (one per composed message) makes a retried post return
// the first message, store nothing new and notify nobody twice; the same key with another text is refused.
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { seedJobWithEstimate } from "../fixtures/jobs";
import { createJob, userId } from "./bench-fixtures";

type Posted = { id: string; duplicate: boolean };
type ErrorBody = { error: { code: string; message: string; fields?: Record<string, string> } };

const messagesOf = (jobId: string) =>
  sql<{ id: string; author_id: string; body: string; idempotency_key: string | null }>(
    "select id, author_id, body, idempotency_key from message where job_id = $1 order by created_at, id",
    [jobId],
  );
const auditsOf = (messageIds: string[]) =>
  sql<{ n: number }>("select count(*)::int as n from audit_event where entity = 'message' and entity_id = any($1::text[])", [messageIds]);

let tech: TestClient;
let techId: string;
beforeAll(async () => {
  tech = new TestClient();
  await tech.signIn(DEMO.tech.email, DEMO.tech.password);
  techId = await userId(DEMO.tech.email);
});

afterAll(async () => {
  await closeTestPool();
});

describe("an owner's message with an idempotency key", () => {
  it("stores a repeat of the same post once and answers with the same message", async () => {
    const { client, email } = await newCustomer("msg-repeat");
    const job = await seedJobWithEstimate({ email, state: "approved" });
    const post = { body: "Shall I send the original knobs with the set?", idempotencyKey: randomUUID() };

    const first = await client.post(`/api/portal/jobs/${job.jobId}/messages`, post);
    expect(first.status).toBe(201);
    const a = (await first.json()) as Posted;
    expect(a.duplicate).toBe(false);

    const again = await client.post(`/api/portal/jobs/${job.jobId}/messages`, post);
    expect(again.status).toBe(200);
    const b = (await again.json()) as Posted;
    expect(b).toEqual({ id: a.id, duplicate: true });

    // Surrounding spaces are trimmed before the comparison, as before storing: still the same message.
    const spaced = await client.post(`/api/portal/jobs/${job.jobId}/messages`, { ...post, body: `  ${post.body}\n` });
    expect(spaced.status).toBe(200);
    expect(((await spaced.json()) as Posted).id).toBe(a.id);

    const rows = await messagesOf(job.jobId);
    expect(rows).toEqual([{ id: a.id, author_id: job.customerId, body: post.body, idempotency_key: post.idempotencyKey }]);
    expect((await auditsOf([a.id]))[0]!.n).toBe(1);
    const thread = (await (await client.get(`/api/portal/jobs/${job.jobId}/messages`)).json()) as { messages: { id: string }[] };
    expect(thread.messages.map((m) => m.id)).toEqual([a.id]);
  });

  it("moves a job the shop was waiting on back to triage once, however often the answer is retried", async () => {
    const { client, email } = await newCustomer("msg-answer");
    const job = await seedJobWithEstimate({ email, state: "awaiting_owner" });
    const post = { body: "The label on the back says 5T-48, chassis 4471.", idempotencyKey: randomUUID() };
    const answers = await Promise.all(Array.from({ length: 4 }, () => client.post(`/api/portal/jobs/${job.jobId}/messages`, post)));
    const statuses = answers.map((r) => r.status).sort();
    expect(statuses).toEqual([200, 200, 200, 201]);
    const ids = new Set(await Promise.all(answers.map(async (r) => ((await r.json()) as Posted).id)));
    expect(ids.size).toBe(1);
    expect(await messagesOf(job.jobId)).toHaveLength(1);
    const moves = await sql<{ n: number }>(
      "select count(*)::int as n from job_state_history where job_id = $1 and from_state = 'awaiting_owner' and to_state = 'in_triage'",
      [job.jobId],
    );
    expect(moves[0]!.n).toBe(1);
    expect((await sql<{ state: string }>("select state from job where id = $1", [job.jobId]))[0]!.state).toBe("in_triage");
  });

  it("refuses the same key with a different text and keeps the first message", async () => {
    const { client, email } = await newCustomer("msg-reuse");
    const job = await seedJobWithEstimate({ email, state: "approved" });
    const key = randomUUID();
    const first = await client.post(`/api/portal/jobs/${job.jobId}/messages`, {
      body: "Is the dial glass covered by the estimate?",
      idempotencyKey: key,
    });
    expect(first.status).toBe(201);
    const { id } = (await first.json()) as Posted;

    const other = await client.post(`/api/portal/jobs/${job.jobId}/messages`, {
      body: "Please also look at the dial lamp.",
      idempotencyKey: key,
    });
    expect(other.status).toBe(409);
    const err = (await other.json()) as ErrorBody;
    expect(err.error.code).toBe("conflict");
    expect(err.error.message).toMatch(/already used for a different message/);
    expect(err.error.fields?.idempotencyKey).toMatch(/already used/);

    expect((await messagesOf(job.jobId)).map((m) => ({ id: m.id, body: m.body }))).toEqual([
      { id, body: "Is the dial glass covered by the estimate?" },
    ]);
    // A new key sends the second text as a message of its own.
    const fresh = await client.post(`/api/portal/jobs/${job.jobId}/messages`, {
      body: "Please also look at the dial lamp.",
      idempotencyKey: randomUUID(),
    });
    expect(fresh.status).toBe(201);
    expect(await messagesOf(job.jobId)).toHaveLength(2);
  });

  it("requires a key in UUID form", async () => {
    const { client, email } = await newCustomer("msg-nokey");
    const job = await seedJobWithEstimate({ email, state: "approved" });
    for (const body of [{ body: "No key with this one." }, { body: "A key that is not a UUID.", idempotencyKey: "retry-1" }]) {
      const res = await client.post(`/api/portal/jobs/${job.jobId}/messages`, body);
      expect(res.status).toBe(400);
      const err = (await res.json()) as ErrorBody;
      expect(err.error.code).toBe("invalid_input");
      expect(err.error.fields?.idempotencyKey).toBeTruthy();
    }
    expect(await messagesOf(job.jobId)).toHaveLength(0);
  });

  it("keeps keys apart per author: another person's same key is a message of its own", async () => {
    const a = await newCustomer("msg-key-a");
    const b = await newCustomer("msg-key-b");
    const jobA = await seedJobWithEstimate({ email: a.email, state: "approved" });
    const jobB = await seedJobWithEstimate({ email: b.email, state: "approved" });
    const key = randomUUID();

    const fromA = await a.client.post(`/api/portal/jobs/${jobA.jobId}/messages`, {
      body: "A: when does the set ship back?",
      idempotencyKey: key,
    });
    const fromB = await b.client.post(`/api/portal/jobs/${jobB.jobId}/messages`, {
      body: "B: can I drop it off on Saturday?",
      idempotencyKey: key,
    });
    expect([fromA.status, fromB.status]).toEqual([201, 201]);
    const idA = ((await fromA.json()) as Posted).id;
    const idB = ((await fromB.json()) as Posted).id;
    expect(idA).not.toBe(idB);
    // B cannot reach A's job with that key (or any): not found, and nothing stored.
    expect(
      (await b.client.post(`/api/portal/jobs/${jobA.jobId}/messages`, { body: "A: when does the set ship back?", idempotencyKey: key }))
        .status,
    ).toBe(404);

    // A technician's note on A's job under the very same key is independent of A's message.
    const note = await tech.post(`/api/bench/jobs/${jobA.jobId}/notes`, {
      body: "Owner asked about shipping; check the carton.",
      idempotencyKey: key,
    });
    expect(note.status).toBe(200);
    const noteAnswer = (await note.json()) as { messageId: string; duplicate: boolean };
    expect(noteAnswer.duplicate).toBe(false);
    expect(noteAnswer.messageId).not.toBe(idA);

    const rowsA = await messagesOf(jobA.jobId);
    expect(rowsA.map((m) => [m.author_id, m.idempotency_key]).sort()).toEqual(
      [
        [jobA.customerId, key],
        [techId, key],
      ].sort(),
    );
    expect((await messagesOf(jobB.jobId)).map((m) => m.id)).toEqual([idB]);
  });
});

describe("the shop's messages with an idempotency key", () => {
  it("asks the owner a question once: one message, one e-mail, one move, however often it is retried", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const post = { question: "Is the back cover still fitted with its original screws?", idempotencyKey: randomUUID() };
    const first = await tech.post(`/api/bench/jobs/${jobId}/question`, post);
    expect(first.status).toBe(200);
    const a = (await first.json()) as { messageId: string; duplicate: boolean };
    expect(a.duplicate).toBe(false);
    // The job is now waiting on the owner, yet the repeat is recognised rather than refused as a second question.
    const again = await tech.post(`/api/bench/jobs/${jobId}/question`, post);
    expect(again.status).toBe(200);
    expect(await again.json()).toEqual({ messageId: a.messageId, duplicate: true });

    expect((await messagesOf(jobId)).map((m) => m.id)).toEqual([a.messageId]);
    const allMails = await sql<{ n: number }>(
      "select count(*)::int as n from email_outbox where dedupe_key in (select 'shop-question:' || id::text from message where job_id = $1)",
      [jobId],
    );
    expect(allMails[0]!.n).toBe(1);
    const moves = await sql<{ n: number }>(
      "select count(*)::int as n from job_state_history where job_id = $1 and to_state = 'awaiting_owner'",
      [jobId],
    );
    expect(moves[0]!.n).toBe(1);

    const changed = await tech.post(`/api/bench/jobs/${jobId}/question`, { ...post, question: "Is the dial cord original?" });
    expect(changed.status).toBe(409);
    expect(((await changed.json()) as ErrorBody).error.fields?.idempotencyKey).toMatch(/already used/);
    expect(await messagesOf(jobId)).toHaveLength(1);
  });

  it("adds a bench note once per key", async () => {
    const { jobId } = await createJob({ state: "on_bench" });
    const note = { body: "Filter can bulging; replacement ordered.", idempotencyKey: randomUUID() };
    const answers = await Promise.all(Array.from({ length: 3 }, () => tech.post(`/api/bench/jobs/${jobId}/notes`, note)));
    expect(answers.map((r) => r.status)).toEqual([200, 200, 200]);
    const bodies = await Promise.all(answers.map(async (r) => (await r.json()) as { messageId: string; duplicate: boolean }));
    expect(new Set(bodies.map((b) => b.messageId)).size).toBe(1);
    expect(bodies.filter((b) => !b.duplicate)).toHaveLength(1);
    expect(await messagesOf(jobId)).toHaveLength(1);
    const other = await tech.post(`/api/bench/jobs/${jobId}/notes`, { ...note, body: "Another note under the same key." });
    expect(other.status).toBe(409);
    expect(await messagesOf(jobId)).toHaveLength(1);
  });
});
