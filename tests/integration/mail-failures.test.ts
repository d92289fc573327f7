import { randomUUID } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql, testPool } from "../support/db";
import { testEnv } from "../support/env";
import { TestClient } from "../support/http";
import { waitForMail } from "../support/mail";
import { waitFor } from "./office-fixtures";

// E-mail the provider will not take. The provider's contract (Resend API docs, errors): 422 validation_error
// for a message it refuses (an address it will not deliver to) — no retry changes that; 5xx is a passing
// outage worth retrying. The stand-in answers both per address.

afterAll(async () => {
  await closeTestPool();
});

async function mailControl(path: string, params: Record<string, string>) {
  const res = await fetch(`${testEnv.mailUrl}/control/${path}?${new URLSearchParams(params)}`, { method: "POST" });
  if (!res.ok) throw new Error(`mail stand-in ${path}: ${res.status}`);
}

async function outboxFor(address: string) {
  return sql<{ id: string; status: string; attempts: number; last_error: string | null }>(
    `select id, status, attempts, last_error from email_outbox where to_address = $1 order by created_at`,
    [address],
  );
}

/** Outbox rows and their queue jobs written together in one transaction, as a change writes them. */
async function queueDirectly(addresses: string[]): Promise<string[]> {
  const client = await testPool().connect();
  try {
    await client.query("begin");
    const ids: string[] = [];
    for (const to of addresses) {
      const { rows } = await client.query<{ id: string }>(
        `insert into email_outbox (dedupe_key, to_address, template, props) values ($1, $2, 'shop-question', $3) returning id`,
        [
          `test-batch:${randomUUID()}`,
          to,
          JSON.stringify({
            name: "Test owner",
            jobNumber: "KL-9999",
            setName: "Aurelian 5T-40",
            url: `${testEnv.appUrl}/portal`,
            question: "Which knob?",
          }),
        ],
      );
      ids.push(rows[0]!.id);
      await client.query(
        `insert into pgboss.job (name, data, retry_limit, retry_delay, retry_backoff, expire_in) values ('email', $1, 8, 5, true, interval '120 seconds')`,
        [JSON.stringify({ outboxId: rows[0]!.id })],
      );
    }
    await client.query("commit");
    return ids;
  } finally {
    client.release();
  }
}

describe("e-mail that cannot be sent", () => {
  it("is marked failed with the provider's reason, listed in the office, and sent when the owner sends it again", async () => {
    const owner = await signedIn(DEMO.owner);
    const email = `bounce-${randomUUID().slice(0, 8)}@example.com`;
    await mailControl("reject", { to: email });
    const client = new TestClient();
    expect((await client.signUp("Test bounce", email, "tuning-fork-991")).ok).toBe(true);
    const [failed] = await waitFor(
      async () => {
        const rows = await outboxFor(email);
        return rows[0]?.status === "failed" ? rows : null;
      },
      { what: "the refused message to be marked failed" },
    );
    // Refused for good: no retries spent on it.
    expect(failed!.attempts).toBe(1);
    expect(failed!.last_error).toMatch(/Refused by the mail provider — validation_error/);

    const list = (await (await owner.get("/api/office/emails")).json()) as { rows: { id: string; lastError: string }[] };
    expect(list.rows.find((r) => r.id === failed!.id)?.lastError).toMatch(/validation_error/);
    expect(await (await owner.get("/office")).text()).toContain(email);
    for (const who of [DEMO.tech, DEMO.customer]) {
      const other = await signedIn(who);
      expect((await other.post(`/api/office/emails/${failed!.id}/resend`)).status).toBe(404);
    }

    await mailControl("reject", { to: email, off: "1" });
    const started = Date.now();
    const resend = await owner.post(`/api/office/emails/${failed!.id}/resend`);
    expect(resend.status).toBe(202);
    await waitForMail(email, "Confirm your e-mail", { after: started - 1000 });
    await waitFor(async () => (await outboxFor(email))[0]?.status === "sent", { what: "the row to be marked sent" });
    // Sending again something that is not failed is refused.
    expect((await owner.post(`/api/office/emails/${failed!.id}/resend`)).status).toBe(409);
    const [a] = await sql<{ actor_id: string }>(`select actor_id from audit_event where action = 'email.resend' and entity_id = $1`, [
      failed!.id,
    ]);
    expect(a!.actor_id).toBe("demo-owner-odile");
  });

  it("one message that fails does not hold back or cost retries for the others in its batch", async () => {
    const down = `down-${randomUUID().slice(0, 8)}@example.com`;
    const good = Array.from({ length: 4 }, (_, i) => `fine-${i}-${randomUUID().slice(0, 6)}@example.com`);
    await mailControl("fail-for", { to: down, count: "100" });
    const [bad, ...rest] = await queueDirectly([down, ...good]);
    for (const to of good) await waitForMail(to, "KL-9999", { timeoutMs: 10_000 });
    const jobs = await sql<{ outbox: string; retry_count: number }>(
      `select data->>'outboxId' as outbox, retry_count from pgboss.job where name = 'email' and data->>'outboxId' = any($1)`,
      [rest],
    );
    expect(jobs.map((j) => j.retry_count)).toEqual([0, 0, 0, 0]);
    const rows = await sql<{ status: string; attempts: number }>(`select status, attempts from email_outbox where id = any($1)`, [rest]);
    expect(rows.every((r) => r.status === "sent" && r.attempts === 1)).toBe(true);
    // The failing one waits for its own retry, with the reason kept.
    const [b] = await sql<{ status: string; last_error: string }>(`select status, last_error from email_outbox where id = $1`, [bad]);
    expect(b!.status).toBe("queued");
    expect(b!.last_error).toMatch(/internal_server_error/);
    await mailControl("fail-for", { to: down, count: "0" });
  });

  it("a sweeper queues again what a crash left behind, and gives up on a message whose tries are spent", async () => {
    const orphan = `orphan-${randomUUID().slice(0, 8)}@example.com`;
    const spent = `spent-${randomUUID().slice(0, 8)}@example.com`;
    const props = JSON.stringify({
      name: "Test owner",
      jobNumber: "KL-9998",
      setName: "Corvane 7",
      url: `${testEnv.appUrl}/portal`,
      question: "Which band?",
    });
    // Rows whose queue job was lost: written an hour ago, no job left in the queue.
    await sql(
      `insert into email_outbox (dedupe_key, to_address, template, props, created_at) values ($1, $2, 'shop-question', $3, now() - interval '1 hour')`,
      [`test-orphan:${randomUUID()}`, orphan, props],
    );
    await sql(
      `insert into email_outbox (dedupe_key, to_address, template, props, attempts, last_error, created_at)
       values ($1, $2, 'shop-question', $3, 9, 'internal_server_error: down', now() - interval '1 hour')`,
      [`test-spent:${randomUUID()}`, spent, props],
    );
    await waitForMail(orphan, "KL-9998", { timeoutMs: 40_000 });
    const [gaveUp] = await waitFor(
      async () => {
        const rows = await outboxFor(spent);
        return rows[0]?.status === "failed" ? rows : null;
      },
      { timeoutMs: 40_000, what: "the spent message to be marked failed" },
    );
    expect(gaveUp!.last_error).toMatch(/Gave up after 9 tries/);
  });
});
