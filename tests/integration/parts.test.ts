import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import type { TestClient } from "../support/http";
import { createJob } from "./bench-fixtures";

// The shop's parts catalogue through the routes: the office keeps it, the bench searches it, estimates keep
// the price they were built with, and counted stock follows approvals and cancellations.

let owner: TestClient;
let tech: TestClient;
let customer: TestClient;
beforeAll(async () => {
  owner = await signedIn(DEMO.owner);
  tech = await signedIn(DEMO.tech);
  customer = await signedIn(DEMO.customer);
});
afterAll(async () => {
  await closeTestPool();
});

type Part = {
  id: string;
  name: string;
  supplierRef: string | null;
  costMinor: number;
  markupBp: number | null;
  effectiveMarkupBp: number;
  unitPriceMinor: number;
  stock: number | null;
  retired: boolean;
};
type Hit = Pick<Part, "id" | "name" | "supplierRef" | "costMinor" | "effectiveMarkupBp" | "unitPriceMinor" | "stock">;

const patch = (c: TestClient, path: string, json: unknown) => c.request(path, { method: "PATCH", json });
const del = (c: TestClient, path: string) => c.request(path, { method: "DELETE" });

async function addPart(fields: Record<string, string> = {}): Promise<Part> {
  const res = await owner.post("/api/office/parts", {
    name: `Dial lamp 6.3 V ${randomUUID().slice(0, 6)}`,
    supplierRef: `PA-${randomUUID().slice(0, 6)}`,
    cost: "4.50",
    markupPercent: "35",
    stock: "",
    ...fields,
  });
  expect(res.status, await res.clone().text()).toBe(200);
  return ((await res.json()) as { part: Part }).part;
}

async function search(client: TestClient, q: string): Promise<Hit[]> {
  const res = await client.get(`/api/bench/parts?q=${encodeURIComponent(q)}&limit=8`);
  expect(res.status, await res.clone().text()).toBe(200);
  return ((await res.json()) as { parts: Hit[] }).parts;
}

/** A part line as the builder adds it from a search answer. */
function partLine(hit: Hit, quantity: number, exponent = 2) {
  return {
    key: `k-${randomUUID().slice(0, 8)}`,
    kind: "part",
    code: `part.c-${hit.id.slice(0, 8)}`,
    title: hit.name,
    category: "parts",
    minutes: 0,
    quantity,
    reason: "",
    readings: [],
    unitCost: (hit.costMinor / 10 ** exponent).toFixed(exponent),
    markupPercent: String(hit.effectiveMarkupBp / 100),
    covered: false,
    partId: hit.id,
  };
}
const labourLine = {
  key: "k-labour",
  kind: "labour",
  code: "custom.1",
  title: "Clean the wave-change switch",
  category: "mechanical",
  minutes: 30,
  quantity: 1,
  reason: "",
  readings: [],
  unitCost: "",
  markupPercent: "",
  covered: false,
};

/** Saves and sends an estimate with these lines; answers the sent revision's id. */
async function sendEstimate(jobId: string, lines: unknown[]): Promise<string> {
  const put = await tech.request(`/api/bench/jobs/${jobId}/estimate`, { method: "PUT", json: { version: 0, lines } });
  expect(put.status, await put.clone().text()).toBe(200);
  const { version } = (await put.json()) as { version: number };
  const send = await tech.post(`/api/bench/jobs/${jobId}/estimate/send`, { version });
  expect(send.status, await send.clone().text()).toBe(200);
  const [rev] = await sql<{ id: string }>("select id from estimate_revision where job_id = $1 and status = 'sent'", [jobId]);
  return rev!.id;
}

const stockOf = async (id: string) => (await sql<{ stock: number | null }>("select stock from part where id = $1", [id]))[0]!.stock;

describe("the catalogue, kept by the owner", () => {
  it("adds a part priced at cost × markup: 4.50 at 35 % sells at 6.08 (worked by hand, half up), audited", async () => {
    const p = await addPart();
    // Worked by hand: 4.50 × 1.35 = 6.075 → 6.08 with the half cent rounded up.
    expect(p).toMatchObject({ costMinor: 450, markupBp: 3500, unitPriceMinor: 608, stock: null, retired: false });
    const [row] = await sql<{ cost_minor: number; created_by: string | null; updated_by: string | null }>(
      "select cost_minor, created_by, updated_by from part where id = $1",
      [p.id],
    );
    expect(row!.cost_minor).toBe(450);
    expect(row!.created_by).not.toBeNull();
    const audits = await sql<{ action: string }>("select action from audit_event where entity = 'part' and entity_id = $1", [p.id]);
    expect(audits).toEqual([{ action: "part.add" }]);
  });

  it("refuses bad fields with messages that name each field and what is allowed", async () => {
    const res = await owner.post("/api/office/parts", { name: "", supplierRef: "", cost: "four", markupPercent: "lots", stock: "-2" });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(error.fields.name).toMatch(/^Name: /);
    expect(error.fields.cost).toMatch(/^Cost: enter an amount/);
    expect(error.fields.markupPercent).toMatch(/^Markup: enter a percentage from 0 to 1000/);
    expect(error.fields.stock).toMatch(/^In stock: enter a whole number/);
    // USD has two decimal places (ISO 4217): a third is refused on the cost field, nothing is stored.
    const before = await sql("select count(*)::int as n from part");
    const third = await owner.post("/api/office/parts", {
      name: "Knob set screw",
      supplierRef: "",
      cost: "0.125",
      markupPercent: "",
      stock: "",
    });
    expect(third.status).toBe(400);
    expect(((await third.json()) as { error: { fields: Record<string, string> } }).error.fields.cost).toBe(
      "Cost: USD has 2 decimal places.",
    );
    expect(await sql("select count(*)::int as n from part")).toEqual(before);
  });

  it("edits a part, audits what changed, and the search answers the new price", async () => {
    const p = await addPart({ stock: "4" });
    const res = await patch(owner, `/api/office/parts/${p.id}`, { cost: "2.00", markupPercent: "" });
    expect(res.status, await res.clone().text()).toBe(200);
    const { part } = (await res.json()) as { part: Part };
    // No markup of its own: the shop default (35 % in the demo policy): 2.00 × 1.35 = 2.70 (worked by hand).
    expect(part).toMatchObject({ costMinor: 200, markupBp: null, effectiveMarkupBp: 3500, unitPriceMinor: 270, stock: 4 });
    const [audit] = await sql<{ before: Record<string, unknown>; after: Record<string, unknown> }>(
      "select before, after from audit_event where entity = 'part' and entity_id = $1 and action = 'part.edit'",
      [p.id],
    );
    expect(audit).toEqual({ before: { costMinor: 450, markupBp: 3500 }, after: { costMinor: 200, markupBp: null } });
    const hits = await search(tech, p.supplierRef!);
    expect(hits).toEqual([expect.objectContaining({ id: p.id, unitPriceMinor: 270, stock: 4 })]);
  });

  it("a retired part is not offered for new estimates but stays listed as retired; it can come back", async () => {
    const p = await addPart();
    expect((await search(tech, p.name)).map((h) => h.id)).toEqual([p.id]);
    const res = await patch(owner, `/api/office/parts/${p.id}`, { retired: true });
    expect(res.status).toBe(200);
    expect(await search(tech, p.name)).toEqual([]);
    const active = (await (await owner.get(`/api/office/parts?q=${encodeURIComponent(p.name)}`)).json()) as { parts: Part[] };
    expect(active.parts).toEqual([]);
    const retired = (await (await owner.get(`/api/office/parts?q=${encodeURIComponent(p.name)}&show=retired`)).json()) as {
      parts: Part[];
    };
    expect(retired.parts.map((x) => [x.id, x.retired])).toEqual([[p.id, true]]);
    const [audit] = await sql("select action from audit_event where entity_id = $1 and action = 'part.retire'", [p.id]);
    expect(audit).toEqual({ action: "part.retire" });
    expect((await patch(owner, `/api/office/parts/${p.id}`, { retired: false })).status).toBe(200);
    expect((await search(tech, p.name)).map((h) => h.id)).toEqual([p.id]);
  });

  it("deletes only a mistaken entry: a part the checklist calls for, or one on an estimate, is retired instead", async () => {
    const unused = await addPart();
    expect((await del(owner, `/api/office/parts/${unused.id}`)).status).toBe(200);
    expect(await sql("select id from part where id = $1", [unused.id])).toEqual([]);
    const [fuse] = await sql<{ id: string }>("select id from part where code = 'fuse'");
    const coded = await del(owner, `/api/office/parts/${fuse!.id}`);
    expect(coded.status).toBe(409);
    expect(((await coded.json()) as { error: { message: string } }).error.message).toMatch(/Retire it instead/);
    const used = await addPart();
    const { jobId } = await createJob({ state: "in_triage" });
    await sendEstimate(jobId, [labourLine, partLine(used, 1)]);
    const refused = await del(owner, `/api/office/parts/${used.id}`);
    expect(refused.status).toBe(409);
    expect(await sql("select id from part where id = $1", [used.id])).toHaveLength(1);
  });

  it("the bench searches but cannot change the catalogue; a set owner gets 404 for both", async () => {
    const p = await addPart();
    expect((await tech.get("/api/office/parts")).status).toBe(404);
    expect((await tech.post("/api/office/parts", { name: "X", supplierRef: "", cost: "1", markupPercent: "", stock: "" })).status).toBe(
      404,
    );
    expect((await patch(tech, `/api/office/parts/${p.id}`, { cost: "0.01" })).status).toBe(404);
    expect((await del(tech, `/api/office/parts/${p.id}`)).status).toBe(404);
    expect((await customer.get(`/api/bench/parts?q=${encodeURIComponent(p.name)}`)).status).toBe(404);
    expect((await customer.get("/api/office/parts")).status).toBe(404);
    expect((await patch(customer, `/api/office/parts/${p.id}`, { cost: "0.01" })).status).toBe(404);
    expect(await stockOf(p.id)).toBeNull();
    expect((await sql<{ cost_minor: number }>("select cost_minor from part where id = $1", [p.id]))[0]!.cost_minor).toBe(450);
  });

  it("the search has a limit, and finds by supplier reference as well as by name", async () => {
    const over = await tech.get("/api/bench/parts?q=cap&limit=500");
    expect(over.status).toBe(400);
    expect(((await over.json()) as { error: { fields: Record<string, string> } }).error.fields.limit).toMatch(/^Limit: /);
    const p = await addPart({ supplierRef: `ZX-${randomUUID().slice(0, 6)}` });
    expect((await search(tech, p.supplierRef!.toLowerCase())).map((h) => h.id)).toEqual([p.id]);
    // "%" is a search character, not a wildcard.
    expect(await search(tech, "%%%")).toEqual([]);
  });
});

describe("estimates price from the catalogue and keep their price", () => {
  it("a sent estimate keeps the price it was sent with after the part's cost is edited", async () => {
    const p = await addPart();
    const [hit] = await search(tech, p.name);
    const { jobId } = await createJob({ state: "in_triage" });
    const revisionId = await sendEstimate(jobId, [labourLine, partLine(hit!, 3)]);
    const line = async () =>
      (
        await sql<{ part_cost_minor: number; markup_bp: number; parts_minor: number; part_id: string }>(
          "select part_cost_minor, markup_bp, parts_minor, part_id from estimate_line where revision_id = $1 and category = 'parts'",
          [revisionId],
        )
      )[0];
    // 3 × 6.08 = 18.24 (worked by hand from 4.50 at 35 %).
    expect(await line()).toEqual({ part_cost_minor: 450, markup_bp: 3500, parts_minor: 1824, part_id: p.id });
    const [totalBefore] = await sql("select total_minor from estimate_revision where id = $1", [revisionId]);
    expect((await patch(owner, `/api/office/parts/${p.id}`, { cost: "9.00", markupPercent: "50" })).status).toBe(200);
    expect(await line()).toEqual({ part_cost_minor: 450, markup_bp: 3500, parts_minor: 1824, part_id: p.id });
    expect(await sql("select total_minor from estimate_revision where id = $1", [revisionId])).toEqual([totalBefore]);
    // The saved draft keeps its own price too; retiring the part leaves the estimate showing it.
    expect((await patch(owner, `/api/office/parts/${p.id}`, { retired: true })).status).toBe(200);
    const view = (await (await tech.get(`/api/bench/jobs/${jobId}/estimate`)).json()) as {
      lines: { partId?: string; unitCost: string; title: string }[];
      partsInStock: Record<string, { retired: boolean }>;
    };
    expect(view.lines.find((l) => l.partId === p.id)).toMatchObject({ unitCost: "4.50", title: p.name });
    expect(view.partsInStock[p.id]).toMatchObject({ retired: true });
  });

  it("the checklist's automatic part lines price from the part table", async () => {
    const [cap] = await sql<{ id: string; cost_minor: number; markup_bp: number | null; name: string }>(
      "select id, cost_minor, markup_bp, name from part where code = 'cap.electrolytic'",
    );
    try {
      expect(
        (await patch(owner, `/api/office/parts/${cap!.id}`, { name: "Electrolytic, 105 °C", cost: "5.10", markupPercent: "20" })).status,
      ).toBe(200);
      // The Aurelian profile has two electrolytics: the checklist calls for the part, priced from the table.
      const { jobId } = await createJob({ state: "in_triage" });
      const view = (await (await tech.get(`/api/bench/jobs/${jobId}/estimate`)).json()) as {
        lines: { code: string; title: string; unitCost: string; markupPercent: string; partId?: string; quantity: number }[];
        priced: { lines: { code: string; partsMinor: number }[] };
      };
      const line = view.lines.find((l) => l.code === "part.cap.electrolytic");
      expect(line).toMatchObject({ title: "Electrolytic, 105 °C", unitCost: "5.10", markupPercent: "20", partId: cap!.id });
      // 5.10 × 1.20 = 6.12 each (worked by hand), times the quantity the checklist asks for.
      const priced = view.priced.lines.find((l) => l.code === "part.cap.electrolytic");
      expect(priced!.partsMinor).toBe(612 * line!.quantity);
    } finally {
      await sql("update part set name = $2, cost_minor = $3, markup_bp = $4 where id = $1", [
        cap!.id,
        cap!.name,
        cap!.cost_minor,
        cap!.markup_bp,
      ]);
    }
  });
});

describe("counted stock", () => {
  it("warns but never refuses an estimate asking for more than in stock; approval takes it, cancelling before the bench gives it back", async () => {
    const p = await addPart({ stock: "2" });
    const [hit] = await search(tech, p.name);
    expect(hit!.stock).toBe(2);
    const { jobId } = await createJob({ state: "in_triage" });
    const revisionId = await sendEstimate(jobId, [labourLine, partLine(hit!, 3)]);
    const view = (await (await tech.get(`/api/bench/jobs/${jobId}/estimate`)).json()) as {
      partsInStock: Record<string, { stock: number | null }>;
    };
    expect(view.partsInStock[p.id]).toMatchObject({ stock: 2 });
    expect(await stockOf(p.id)).toBe(2); // sending takes nothing
    const ok = await customer.post(`/api/portal/jobs/${jobId}/estimate/approve`, { revisionId });
    expect(ok.status, await ok.clone().text()).toBe(200);
    // Taken on approval, below zero: one short, for the shop to order.
    expect(await stockOf(p.id)).toBe(-1);
    const cancel = await owner.post(`/api/bench/jobs/${jobId}/cancel`, { reason: "The owner collected the set unrepaired.", refund: true });
    expect(cancel.status, await cancel.clone().text()).toBe(200);
    expect(await stockOf(p.id)).toBe(2);
    expect(await sql("select * from part_stock_take where job_id = $1", [jobId])).toEqual([]);
  });

  it("two approvals at the same moment both count", async () => {
    const p = await addPart({ stock: "10" });
    const [hit] = await search(tech, p.name);
    const jobs = await Promise.all([createJob({ state: "in_triage" }), createJob({ state: "in_triage" })]);
    const revisions: string[] = [];
    for (const [i, j] of jobs.entries()) revisions.push(await sendEstimate(j.jobId, [labourLine, partLine(hit!, i + 2)]));
    const answers = await Promise.all(
      jobs.map((j, i) => customer.post(`/api/portal/jobs/${j.jobId}/estimate/approve`, { revisionId: revisions[i] })),
    );
    expect(answers.map((a) => a.status)).toEqual([200, 200]);
    // 10 − 2 − 3 = 5: no approval's take is lost to the other.
    expect(await stockOf(p.id)).toBe(5);
  });
});
