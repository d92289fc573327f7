import "server-only";
import { and, asc, count, eq, ilike, isNotNull, isNull, or, sql } from "drizzle-orm";
import { db, type Database } from "@/db";
import { estimateLines, estimateRevisions, estimates, parts, partStockTakes, type Part } from "@/db/schema";
import { transaction, type TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { AppError } from "@/lib/server/errors";
import { getShop } from "@/lib/server/services/shop";
import { isEngineError } from "@/lib/engine/engine-error";
import { toMinor } from "@/lib/engine/pricing/money";
import { partUnitPriceMinor, type PartsCatalogue } from "@/lib/engine/pricing/parts";
import { percentToBp, type PartFormValues, type PartUpdate } from "@/lib/validation/parts";

// The shop's parts catalogue: the office keeps it, the bench searches it, estimates price from it.

export type PartView = {
  id: string;
  /** Set on the parts the checklist rules call for; never shown, only kept. */
  checklist: boolean;
  name: string;
  supplierRef: string | null;
  costMinor: number;
  markupBp: number | null;
  /** The markup that applies: the part's own, else the shop's default. */
  effectiveMarkupBp: number;
  unitPriceMinor: number;
  stock: number | null;
  retired: boolean;
  usedOnEstimates: number;
  updatedAt: string;
};

function view(row: Part, defaultMarkupBp: number, used = 0): PartView {
  const effective = row.markupBp ?? defaultMarkupBp;
  return {
    id: row.id,
    checklist: row.code !== null,
    name: row.name,
    supplierRef: row.supplierRef,
    costMinor: row.costMinor,
    markupBp: row.markupBp,
    effectiveMarkupBp: effective,
    unitPriceMinor: partUnitPriceMinor(row.costMinor, effective),
    stock: row.stock,
    retired: row.retiredAt !== null,
    usedOnEstimates: used,
    updatedAt: row.updatedAt.toISOString(),
  };
}

function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

function matches(q: string) {
  if (!q) return undefined;
  const p = likePattern(q);
  return or(ilike(parts.name, p), ilike(parts.supplierRef, p));
}

/** How many sent estimate lines name each part. */
async function usesByPart(tx: Database): Promise<Map<string, number>> {
  const used = await tx
    .select({ partId: estimateLines.partId, n: count() })
    .from(estimateLines)
    .where(isNotNull(estimateLines.partId))
    .groupBy(estimateLines.partId);
  return new Map(used.map((u) => [u.partId!, Number(u.n)]));
}

/** The office list: every part matching the search, in the catalogue first, by name. */
export async function listParts({
  q = "",
  show = "active",
  tx = db,
}: { q?: string; show?: "active" | "retired" | "all"; tx?: Database } = {}): Promise<PartView[]> {
  const shop = await getShop(tx);
  const uses = await usesByPart(tx);
  const rows = await tx
    .select()
    .from(parts)
    .where(and(matches(q), show === "active" ? isNull(parts.retiredAt) : show === "retired" ? isNotNull(parts.retiredAt) : undefined))
    .orderBy(sql`${parts.retiredAt} is not null`, asc(sql`lower(${parts.name})`));
  return rows.map((r) => view(r, shop.policy.parts.defaultMarkupBp, uses.get(r.id) ?? 0));
}

export type PartSearchHit = Pick<
  PartView,
  "id" | "name" | "supplierRef" | "costMinor" | "effectiveMarkupBp" | "unitPriceMinor" | "stock"
> & {
  /** The checklist's code of the part, kept in the line's code (data, never shown). */
  code: string | null;
};

/** The builder's type-ahead: parts still in the catalogue whose name or supplier reference holds the text. */
export async function searchParts({ q, limit, tx = db }: { q: string; limit: number; tx?: Database }): Promise<PartSearchHit[]> {
  const shop = await getShop(tx);
  const rows = await tx
    .select()
    .from(parts)
    .where(and(isNull(parts.retiredAt), matches(q)))
    // Names that start with the text first, then the rest, each by name.
    .orderBy(
      sql`lower(${parts.name}) like ${`${q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`} desc`,
      asc(sql`lower(${parts.name})`),
    )
    .limit(limit);
  return rows.map((r) => {
    const v = view(r, shop.policy.parts.defaultMarkupBp);
    return {
      id: v.id,
      code: r.code,
      name: v.name,
      supplierRef: v.supplierRef,
      costMinor: v.costMinor,
      effectiveMarkupBp: v.effectiveMarkupBp,
      unitPriceMinor: v.unitPriceMinor,
      stock: v.stock,
    };
  });
}

/** The checklist's parts by code, as the automatic part lines price them (retired ones are not offered). */
export async function checklistCatalogue(
  tx: Database = db,
  { includeRetired = false }: { includeRetired?: boolean } = {},
): Promise<{ catalogue: PartsCatalogue; partIds: Record<string, string> }> {
  const rows = await tx
    .select()
    .from(parts)
    .where(and(isNotNull(parts.code), includeRetired ? undefined : isNull(parts.retiredAt)));
  const catalogue: Record<string, { title: string; costMinor: number; markupBp?: number }> = {};
  const ids: Record<string, string> = {};
  for (const r of rows) {
    catalogue[r.code!] = { title: r.name, costMinor: r.costMinor, ...(r.markupBp !== null ? { markupBp: r.markupBp } : {}) };
    ids[r.code!] = r.id;
  }
  return { catalogue, partIds: ids };
}

/** Stock and names of the given parts, for the builder's warnings and the lines of parts since retired. */
export async function partsByIds(ids: readonly string[], tx: Database = db) {
  if (ids.length === 0) return {};
  const rows = await tx
    .select({ id: parts.id, name: parts.name, stock: parts.stock, retiredAt: parts.retiredAt })
    .from(parts)
    .where(sql`${parts.id} in ${ids}`);
  return Object.fromEntries(rows.map((r) => [r.id, { name: r.name, stock: r.stock, retired: r.retiredAt !== null }]));
}

/** The number of parts priced in the shop currency, for the currency-change rule. */
export async function countCatalogueParts(tx: Database = db): Promise<number> {
  const [row] = await tx.select({ n: count() }).from(parts);
  return Number(row?.n ?? 0);
}

function columnsFrom(input: Partial<PartFormValues>, exponent: number, currency: string) {
  const out: Partial<Pick<Part, "name" | "supplierRef" | "costMinor" | "markupBp" | "stock">> = {};
  if (input.name !== undefined) out.name = input.name;
  if (input.supplierRef !== undefined) out.supplierRef = input.supplierRef === "" ? null : input.supplierRef;
  if (input.cost !== undefined) {
    try {
      out.costMinor = toMinor(input.cost, exponent, "cost");
    } catch (e) {
      if (!isEngineError(e)) throw e;
      const m =
        e.code === "amount-precision"
          ? `Cost: ${currency} has ${exponent === 0 ? "no" : exponent} decimal place${exponent === 1 ? "" : "s"}.`
          : "Cost: that is above what the payment processor accepts.";
      throw new AppError("invalid_input", m, { cost: m });
    }
  }
  if (input.markupPercent !== undefined) out.markupBp = input.markupPercent === "" ? null : percentToBp(input.markupPercent);
  if (input.stock !== undefined) out.stock = input.stock === "" ? null : Number(input.stock);
  return out;
}

function auditDoc(row: Part) {
  return {
    name: row.name,
    supplierRef: row.supplierRef,
    costMinor: row.costMinor,
    markupBp: row.markupBp,
    stock: row.stock,
    retired: row.retiredAt !== null,
  };
}

function changed(before: Record<string, unknown>, after: Record<string, unknown>) {
  const b: Record<string, unknown> = {};
  const a: Record<string, unknown> = {};
  for (const k of Object.keys(after))
    if (JSON.stringify(before[k]) !== JSON.stringify(after[k])) {
      b[k] = before[k];
      a[k] = after[k];
    }
  return { before: b, after: a };
}

export async function createPart({ input, actorId }: { input: PartFormValues; actorId: string }): Promise<PartView> {
  return transaction(async (ctx) => {
    const shop = await getShop(ctx.tx);
    const cols = columnsFrom(input, shop.policy.currency.exponent, shop.policy.currency.code);
    const [row] = await ctx.tx
      .insert(parts)
      .values({ name: input.name, costMinor: cols.costMinor!, ...cols, createdBy: actorId, updatedBy: actorId })
      .returning();
    await audit(ctx, { actorId, action: "part.add", entity: "part", entityId: row!.id, before: null, after: auditDoc(row!) });
    return view(row!, shop.policy.parts.defaultMarkupBp);
  });
}

async function lockPart(ctx: TxContext, id: string): Promise<Part> {
  const [row] = await ctx.tx.select().from(parts).where(eq(parts.id, id)).for("update").limit(1);
  if (!row) throw new AppError("not_found", "That part is not in the catalogue.");
  return row;
}

/** Edits a part, retires it (kept for the estimates that show it, no longer offered) or returns it. */
export async function updatePart(ctx: TxContext, { id, input, actorId }: { id: string; input: PartUpdate; actorId: string }) {
  const before = await lockPart(ctx, id);
  const shop = await getShop(ctx.tx);
  const { retired, ...fields } = input;
  const patch: Partial<Part> = columnsFrom(fields, shop.policy.currency.exponent, shop.policy.currency.code);
  if (retired !== undefined) patch.retiredAt = retired ? (before.retiredAt ?? new Date()) : null;
  const [row] = await ctx.tx
    .update(parts)
    .set({ ...patch, updatedAt: new Date(), updatedBy: actorId })
    .where(eq(parts.id, id))
    .returning();
  const diff = changed(auditDoc(before), auditDoc(row!));
  const action =
    retired === true && !before.retiredAt ? "part.retire" : retired === false && before.retiredAt ? "part.return" : "part.edit";
  await audit(ctx, { actorId, action, entity: "part", entityId: id, ...diff });
  return view(row!, shop.policy.parts.defaultMarkupBp, (await usesByPart(ctx.tx)).get(id) ?? 0);
}

/** Only a mistaken entry can be deleted: a part an estimate or a checklist rule uses is retired instead. */
export async function deletePart(ctx: TxContext, { id, actorId }: { id: string; actorId: string }) {
  const row = await lockPart(ctx, id);
  if (row.code !== null)
    throw new AppError("conflict", "The checklist calls for this part, so it stays in the catalogue. Retire it instead.");
  const [onLines] = await ctx.tx.select({ n: count() }).from(estimateLines).where(eq(estimateLines.partId, id));
  const [inDrafts] = await ctx.tx
    .select({ n: count() })
    .from(estimates)
    .where(sql`${estimates.draft}::text like ${`%"partId": "${id}"%`} or ${estimates.draft}::text like ${`%"partId":"${id}"%`}`);
  const [taken] = await ctx.tx.select({ n: count() }).from(partStockTakes).where(eq(partStockTakes.partId, id));
  if (Number(onLines?.n) + Number(inDrafts?.n) + Number(taken?.n) > 0)
    throw new AppError("conflict", "An estimate uses this part, so it stays in the catalogue for it. Retire it instead.");
  await ctx.tx.delete(parts).where(eq(parts.id, id));
  await audit(ctx, { actorId, action: "part.delete", entity: "part", entityId: id, before: auditDoc(row), after: null });
  return { id, deleted: true };
}

// ---- Stock ----
// Stock is counted only for parts with a count. It is taken when the owner approves a revision (the shop
// sets the parts aside for that job), as the difference from what the job's earlier approved revision took,
// and given back when the job is cancelled before the bench. The count may go below zero: an approval is
// never refused for stock, the builder warns instead. Each change is one UPDATE of the part row (a row lock),
// so two approvals at once both count.

async function moveStock(
  ctx: TxContext,
  { jobId, want, actorId, why }: { jobId: string; want: Map<string, number>; actorId: string | null; why: string },
) {
  const had = await ctx.tx
    .select({ partId: partStockTakes.partId, quantity: partStockTakes.quantity })
    .from(partStockTakes)
    .where(eq(partStockTakes.jobId, jobId))
    .for("update");
  const before = new Map(had.map((h) => [h.partId, h.quantity]));
  const ids = new Set([...before.keys(), ...want.keys()]);
  const moved: Record<string, number> = {};
  for (const partId of [...ids].sort()) {
    const delta = (want.get(partId) ?? 0) - (before.get(partId) ?? 0);
    if (delta === 0) continue;
    const [row] = await ctx.tx
      .update(parts)
      .set({ stock: sql`${parts.stock} - ${delta}` })
      .where(and(eq(parts.id, partId), isNotNull(parts.stock)))
      .returning({ stock: parts.stock });
    if (want.get(partId)) {
      await ctx.tx
        .insert(partStockTakes)
        .values({ jobId, partId, quantity: want.get(partId)! })
        .onConflictDoUpdate({ target: [partStockTakes.jobId, partStockTakes.partId], set: { quantity: want.get(partId)! } });
    } else {
      await ctx.tx.delete(partStockTakes).where(and(eq(partStockTakes.jobId, jobId), eq(partStockTakes.partId, partId)));
    }
    if (row) moved[partId] = -delta;
  }
  if (Object.keys(moved).length)
    await audit(ctx, { actorId, action: "part.stock", entity: "job", entityId: jobId, before: null, after: { why, moved } });
}

/** On approval: the job holds the counted parts of this revision (covered lines' parts too: they are fitted all the same). */
export async function takeStockForRevision(
  ctx: TxContext,
  { jobId, revisionId, actorId }: { jobId: string; revisionId: string; actorId: string | null },
) {
  const lines = await ctx.tx
    .select({ partId: estimateLines.partId, quantity: estimateLines.quantity })
    .from(estimateLines)
    .innerJoin(estimateRevisions, eq(estimateRevisions.id, estimateLines.revisionId))
    .where(and(eq(estimateLines.revisionId, revisionId), isNotNull(estimateLines.partId)));
  const want = new Map<string, number>();
  for (const l of lines) want.set(l.partId!, (want.get(l.partId!) ?? 0) + l.quantity);
  await moveStock(ctx, { jobId, want, actorId, why: "approved" });
}

/** On cancellation before the bench: everything the job held goes back on the shelf. */
export async function returnStockForJob(ctx: TxContext, { jobId, actorId }: { jobId: string; actorId: string | null }) {
  await moveStock(ctx, { jobId, want: new Map(), actorId, why: "cancelled" });
}
