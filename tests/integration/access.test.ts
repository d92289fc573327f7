import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { PERMISSIONS } from "@/lib/engine/permissions";
import { DEMO } from "../support/accounts";
import { sql } from "../support/db";
import { TestClient } from "../support/http";
import { fixturesFromSeed, pathOf, storePhoto } from "./access/fixtures";
import { actionInventory, pageInventory, routeInventory } from "./access/inventory";
import { ACTIONS, LOCAL_DEMO_PAGES, PAGES, ROUTES, type Fixtures, type Role, type RouteEntry } from "./access/matrix";

const ROLES: Role[] = ["anonymous", "customerA", "customerB", "technician", "owner"];
const LOGINS: Record<Exclude<Role, "anonymous">, { email: string; password: string }> = {
  customerA: DEMO.customer,
  customerB: DEMO.customer2,
  technician: DEMO.tech,
  owner: DEMO.owner,
};

let fixtures: Fixtures;

function expected(entry: RouteEntry, role: Role): "allow" | "deny" | "public" {
  const rule = entry.rules[role];
  if (rule === "own") return role === "customerA" ? "allow" : "deny";
  return rule;
}

async function clients(extraHeaders: Record<string, string>) {
  const out = {} as Record<Role, TestClient>;
  out.anonymous = new TestClient();
  for (const r of Object.keys(LOGINS) as (keyof typeof LOGINS)[]) {
    out[r] = new TestClient();
    await out[r].signIn(LOGINS[r].email, LOGINS[r].password);
  }
  for (const c of Object.values(out)) c.extraHeaders = extraHeaders;
  return out;
}

beforeAll(async () => {
  fixtures = await fixturesFromSeed();
});

describe("the access matrix covers the whole app", () => {
  it("lists every route handler and method", () => {
    const listed = new Set(ROUTES.map((r) => `${r.method} ${r.route}`));
    const missing = routeInventory()
      .map((r) => `${r.method} ${r.route}`)
      .filter((k) => !listed.has(k));
    expect(missing, "routes missing from tests/integration/access/matrix.ts").toEqual([]);
    const present = new Set(routeInventory().map((r) => `${r.method} ${r.route}`));
    expect(
      ROUTES.map((r) => `${r.method} ${r.route}`).filter((k) => !present.has(k)),
      "matrix entries with no route",
    ).toEqual([]);
  });

  it("lists every server action, wrapped with the permission the matrix names", () => {
    const found = actionInventory();
    for (const a of found) {
      const entry = ACTIONS.find((x) => x.file === a.file && x.name === a.name);
      expect(entry, `server action ${a.file}#${a.name} is missing from the matrix`).toBeDefined();
      expect(a.wrappedWith, `${a.name} must be wrapped with action(permission, …)`).toBe(entry!.permission);
    }
    for (const entry of ACTIONS) {
      expect(
        found.some((a) => a.file === entry.file && a.name === entry.name),
        `${entry.name} no longer exists`,
      ).toBe(true);
      const granted = (PERMISSIONS as Record<string, readonly string[]>)[entry.permission] ?? [];
      expect([...granted].sort()).toEqual(entry.roles.filter((r) => r !== "anonymous").sort());
    }
  });
});

describe("every page, development pages included", () => {
  it("is listed in the page matrix", () => {
    const listed = new Set(PAGES.map((p) => p.route));
    const found = pageInventory();
    expect(
      found.filter((p) => !listed.has(p.route)).map((p) => p.file),
      "pages missing from PAGES in tests/integration/access/matrix.ts",
    ).toEqual([]);
    expect(PAGES.map((p) => p.route).filter((r) => !found.some((p) => p.route === r))).toEqual([]);
    // Development pages live in the (dev) group and are all marked as local-demo pages.
    for (const p of found.filter((f) => f.file.includes("(dev)"))) expect(LOCAL_DEMO_PAGES.has(p.route), p.file).toBe(true);
  });

  let byRole: Record<Role, TestClient>;
  beforeAll(async () => {
    byRole = await clients({});
  });
  for (const entry of PAGES) {
    it(`${entry.route} answers each role as listed`, async () => {
      const problems: string[] = [];
      let path = entry.route;
      for (const [k, v] of Object.entries(entry.params?.(fixtures) ?? {})) path = path.replace(`[${k}]`, encodeURIComponent(v));
      for (const role of ROLES) {
        const res = await byRole[role].get(path);
        const location = res.headers.get("location") ?? "";
        const toSignIn = res.status >= 300 && res.status < 400 && location.includes("/sign-in");
        const rule = entry.rules[role];
        const want = rule === "own" ? (role === "customerA" ? "allow" : "deny") : rule;
        if (res.status >= 500) problems.push(`${role}: ${res.status}`);
        else if ((want === "allow" || want === "public") && (toSignIn || [401, 403, 404].includes(res.status)))
          problems.push(`${role}: expected the page, got ${res.status} ${location}`);
        else if (want === "deny" && role === "anonymous" && !toSignIn) problems.push(`anonymous: expected sign-in, got ${res.status}`);
        else if (want === "deny" && role !== "anonymous" && res.status !== 404)
          problems.push(`${role}: expected 404, got ${res.status} ${location}`);
      }
      expect(problems).toEqual([]);
    });
  }
});

for (const variant of [
  { name: "plain requests", headers: {} as Record<string, string> },
  {
    name: "with a client-sent x-middleware-subrequest header",
    headers: { "x-middleware-subrequest": "middleware:middleware:middleware:middleware:middleware" },
  },
]) {
  describe(`role × route × ownership (${variant.name})`, () => {
    let byRole: Record<Role, TestClient>;
    beforeAll(async () => {
      byRole = await clients(variant.headers);
    });

    for (const entry of ROUTES) {
      it(`${entry.method} ${entry.route} — ${entry.action}`, async () => {
        const problems: string[] = [];
        for (const role of ROLES) {
          const client = byRole[role];
          const path = pathOf(entry, fixtures);
          const res = await client.request(path, { method: entry.method, ...(entry.body ? { json: entry.body(fixtures) } : {}) });
          const text = await res.text();
          const want = expected(entry, role);
          if (res.status >= 500) problems.push(`${role}: ${res.status} ${text.slice(0, 200)}`);
          if (/at .+\(.+:\d+:\d+\)/.test(text)) problems.push(`${role}: answer contains a stack trace`);
          if (want === "allow" && [401, 403, 404].includes(res.status))
            problems.push(`${role}: expected to get past authorization, got ${res.status} ${text.slice(0, 120)}`);
          const denied = role === "anonymous" && !entry.hiddenFromVisitors ? 401 : 404;
          if (want === "deny" && res.status !== denied) problems.push(`${role}: expected ${denied}, got ${res.status}`);
        }
        expect(problems).toEqual([]);
      });
    }
  });
}

describe("field-level access", () => {
  it("never sends a customer cost prices, markups or internal notes", async () => {
    await sql(
      "insert into message (job_id, author_id, body, internal) values ($1, 'demo-tech-tomas', 'Internal: bought the caps from the cheap supplier', true)",
      [fixtures.jobA],
    );
    const a = new TestClient();
    await a.signIn(DEMO.customer.email, DEMO.customer.password);
    for (const path of [`/api/portal/jobs/${fixtures.jobA}`, `/api/portal/jobs/${fixtures.jobA}/messages`]) {
      const text = await (await a.get(path)).text();
      expect(text).not.toMatch(/partCostMinor|markupBp|part_cost_minor|markup_bp/);
      expect(text).not.toContain("cheap supplier");
    }
  });

  it("never lets the owner of a job read a workshop note, its photo or its existence through any route or page", async () => {
    // A note (and a photo tied to it, as a stored row) on the owner's open job; the one thing the owner must
    // never learn is its text, its photo or even that one was written (unread counts).
    const secret = `Workshop only: owner seemed unsure about paying ${randomUUID().slice(0, 8)}`;
    const [note] = await sql<{ id: string }>(
      "insert into message (job_id, author_id, body, internal) values ($1, 'demo-tech-tomas', $2, true) returning id",
      [fixtures.jobOpenA, secret],
    );
    const photoId = await storePhoto({ uploaderId: "demo-tech-tomas", jobId: fixtures.jobOpenA, displayName: "note-photo.jpg" });
    await sql("update photo set message_id = $1 where id = $2", [note!.id, photoId]);
    const a = new TestClient();
    await a.signIn(DEMO.customer.email, DEMO.customer.password);
    const before = (await (await a.get(`/api/portal/jobs/${fixtures.jobOpenA}/messages`)).json()) as { unread: number };
    for (const path of [
      `/api/portal/jobs/${fixtures.jobOpenA}`,
      `/api/portal/jobs/${fixtures.jobOpenA}/messages`,
      "/api/portal/jobs",
      `/portal/jobs/${fixtures.jobOpenA}`,
      "/portal",
    ]) {
      const res = await a.get(path);
      expect(res.status, path).toBe(200);
      const text = await res.text();
      expect(text, path).not.toContain(secret);
      expect(text, path).not.toContain(note!.id);
      expect(text, path).not.toContain(photoId);
    }
    // The note's photo answers as if it did not exist; staff see it.
    expect((await a.get(`/api/photos/${photoId}`)).status).toBe(404);
    expect((await a.get(`/api/photos/${photoId}?size=thumb`)).status).toBe(404);
    const tech = new TestClient();
    await tech.signIn(DEMO.tech.email, DEMO.tech.password);
    expect((await tech.get(`/api/photos/${photoId}`)).status).toBe(200);
    // Marking the thread read up to the note is refused as if the message were not there.
    const mark = await a.post(`/api/portal/jobs/${fixtures.jobOpenA}/messages/read`, { lastMessageId: note!.id });
    expect(mark.status).toBe(400);
    // Staff see the note on the bench thread, marked workshop only.
    const thread = (await (await tech.get(`/api/bench/jobs/${fixtures.jobOpenA}/messages`)).json()) as {
      messages: { id: string; internal: boolean; photos: { id: string }[] }[];
    };
    const seen = thread.messages.find((m) => m.id === note!.id);
    expect(seen?.internal).toBe(true);
    expect(seen?.photos.map((p) => p.id)).toEqual([photoId]);
    // And the note does not count as a new message for the owner.
    const after = (await (await a.get(`/api/portal/jobs/${fixtures.jobOpenA}/messages`)).json()) as { unread: number };
    expect(after.unread).toBe(before.unread);
  });

  it("ignores fields a customer should not set", async () => {
    const a = new TestClient();
    await a.signIn(DEMO.customer.email, DEMO.customer.password);
    const res = await a.post(`/api/portal/jobs/${fixtures.jobOpenA}/messages`, {
      body: "When will it be ready?",
      idempotencyKey: randomUUID(),
      internal: true,
      authorId: "demo-owner-odile",
      jobId: fixtures.jobA,
    });
    expect(res.status).toBeLessThan(300);
    const [row] = await sql<{ author_id: string; internal: boolean; job_id: string }>(
      "select author_id, internal, job_id from message where body = 'When will it be ready?' order by created_at desc limit 1",
    );
    expect(row).toEqual({ author_id: "demo-cust-mira", internal: false, job_id: fixtures.jobOpenA });
    const [state] = await sql<{ state: string }>("select state from job where id = $1", [fixtures.jobOpenA]);
    expect(state!.state).toBe("final_checks");
  });
});
