import { randomUUID } from "node:crypto";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import sharp from "sharp";
import { beforeAll, describe, expect, it } from "vitest";
import { PERMISSIONS } from "@/lib/permissions";
import { DEMO } from "../support/accounts";
import { sql } from "../support/db";
import { TestClient } from "../support/http";
import { actionInventory, routeInventory } from "./access/inventory";
import { ACTIONS, ROUTES, type Fixtures, type Role, type RouteEntry } from "./access/matrix";

const ROLES: Role[] = ["anonymous", "customerA", "customerB", "technician", "owner"];
const LOGINS: Record<Exclude<Role, "anonymous">, { email: string; password: string }> = {
  customerA: DEMO.customer,
  customerB: DEMO.customer2,
  technician: DEMO.tech,
  owner: DEMO.owner,
};

let fixtures: Fixtures;

async function fixturesFromSeed(): Promise<Fixtures> {
  const one = async <T extends Record<string, unknown>>(q: string, v: unknown[] = []) => {
    const rows = await sql<T>(q, v);
    if (!rows[0]) throw new Error(`fixture query found nothing: ${q}`);
    return rows[0];
  };
  const { id: jobA } = await one<{ id: string }>("select id from job where idempotency_key = 'demo-returned' and customer_id = 'demo-cust-mira'");
  const { id: jobOpenA } = await one<{ id: string }>("select id from job where idempotency_key = 'demo-final' and customer_id = 'demo-cust-mira'");
  const { id: revisionA } = await one<{ id: string }>("select id from estimate_revision where job_id = $1 order by revision desc limit 1", [jobA]);
  const { id: certificateA } = await one<{ id: string }>("select id from certificate where job_id = $1", [jobA]);
  const { id: claimA } = await one<{ id: string }>("select id from claim where certificate_id = $1", [certificateA]);
  const pay = await one<{ id: string; checkout_session_id: string }>("select id, checkout_session_id from payment where job_id = $1 and purpose = 'deposit'", [jobA]);
  // A photo of customer A's set, stored the way the upload path stores one.
  const photoId = randomUUID();
  const key = `photos/${randomUUID()}.jpg`;
  const dir = join(process.env.UPLOAD_DIR!, "store", "photos");
  mkdirSync(dir, { recursive: true });
  const jpeg = await sharp({ create: { width: 8, height: 8, channels: 3, background: "#884422" } }).jpeg().toBuffer();
  writeFileSync(join(process.env.UPLOAD_DIR!, "store", key), jpeg);
  await sql("insert into photo (id, uploader_id, job_id, storage_key, display_name, mime, width, height, bytes) values ($1, 'demo-cust-mira', $2, $3, 'front.jpg', 'image/jpeg', 8, 8, $4)", [photoId, jobA, key, jpeg.length]);
  return { jobA, jobOpenA, revisionA, certificateA, claimA, paymentA: pay.id, sessionA: pay.checkout_session_id, photoA: photoId };
}

function pathOf(entry: RouteEntry, f: Fixtures): string {
  let path = entry.route;
  for (const [k, v] of Object.entries(entry.params?.(f) ?? {})) path = path.replace(`[...${k}]`, v).replace(`[${k}]`, encodeURIComponent(v));
  return path + (entry.query ?? "");
}

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
    expect(ROUTES.map((r) => `${r.method} ${r.route}`).filter((k) => !present.has(k)), "matrix entries with no route").toEqual([]);
  });

  it("lists every server action, wrapped with the permission the matrix names", () => {
    const found = actionInventory();
    for (const a of found) {
      const entry = ACTIONS.find((x) => x.file === a.file && x.name === a.name);
      expect(entry, `server action ${a.file}#${a.name} is missing from the matrix`).toBeDefined();
      expect(a.wrappedWith, `${a.name} must be wrapped with action(permission, …)`).toBe(entry!.permission);
    }
    for (const entry of ACTIONS) {
      expect(found.some((a) => a.file === entry.file && a.name === entry.name), `${entry.name} no longer exists`).toBe(true);
      const granted = (PERMISSIONS as Record<string, readonly string[]>)[entry.permission] ?? [];
      expect([...granted].sort()).toEqual(entry.roles.filter((r) => r !== "anonymous").sort());
    }
  });
});

for (const variant of [
  { name: "plain requests", headers: {} as Record<string, string> },
  { name: "with a client-sent x-middleware-subrequest header", headers: { "x-middleware-subrequest": "middleware:middleware:middleware:middleware:middleware" } },
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
          if (want === "allow" && [401, 403, 404].includes(res.status)) problems.push(`${role}: expected to get past authorization, got ${res.status} ${text.slice(0, 120)}`);
          if (want === "deny" && res.status !== (role === "anonymous" ? 401 : 404)) problems.push(`${role}: expected ${role === "anonymous" ? 401 : 404}, got ${res.status}`);
        }
        expect(problems).toEqual([]);
      });
    }
  });
}

describe("field-level access", () => {
  it("never sends a customer cost prices, markups or internal notes", async () => {
    await sql("insert into message (job_id, author_id, body, internal) values ($1, 'demo-tech-tomas', 'Internal: bought the caps from the cheap supplier', true)", [fixtures.jobA]);
    const a = new TestClient();
    await a.signIn(DEMO.customer.email, DEMO.customer.password);
    for (const path of [`/api/portal/jobs/${fixtures.jobA}`, `/api/portal/jobs/${fixtures.jobA}/messages`]) {
      const text = await (await a.get(path)).text();
      expect(text).not.toMatch(/partCostMinor|markupBp|part_cost_minor|markup_bp/);
      expect(text).not.toContain("cheap supplier");
    }
  });

  it("ignores fields a customer should not set", async () => {
    const a = new TestClient();
    await a.signIn(DEMO.customer.email, DEMO.customer.password);
    const res = await a.post(`/api/portal/jobs/${fixtures.jobOpenA}/messages`, { body: "When will it be ready?", internal: true, authorId: "demo-owner-odile", jobId: fixtures.jobA });
    expect(res.status).toBeLessThan(300);
    const [row] = await sql<{ author_id: string; internal: boolean; job_id: string }>("select author_id, internal, job_id from message where body = 'When will it be ready?' order by created_at desc limit 1");
    expect(row).toEqual({ author_id: "demo-cust-mira", internal: false, job_id: fixtures.jobOpenA });
    const [state] = await sql<{ state: string }>("select state from job where id = $1", [fixtures.jobOpenA]);
    expect(state!.state).toBe("final_checks");
  });
});
