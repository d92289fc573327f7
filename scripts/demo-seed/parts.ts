import { and, eq, isNull, sql } from "drizzle-orm";
import { parts } from "@/db/schema";
import type { TxContext } from "@/db/transaction";

// The demo shop's own parts beside the ones the checklist calls for (those come with the migration):
// some counted, one retired. Invented supplier references (Tillwater Electric, Port Alder Instruments).
const DEMO_PARTS: {
  name: string;
  supplierRef: string | null;
  costMinor: number;
  markupBp?: number;
  stock: number | null;
  retired?: boolean;
}[] = [
  { name: "Dial cord, braided nylon, 2 m", supplierRef: "TW-DC-200", costMinor: 380, stock: 4 },
  { name: "Pilot lamp 6.3 V 0.15 A", supplierRef: "TW-PL-063", costMinor: 90, markupBp: 5000, stock: 12 },
  { name: "Knob set screws, pack of 10", supplierRef: "PA-SS-10", costMinor: 120, stock: 3 },
  { name: "Grille cloth, per 30 cm", supplierRef: "TW-GC-30", costMinor: 850, stock: null },
  { name: "Dial glass, Aurelian 5T (old stock)", supplierRef: null, costMinor: 1400, stock: 0, retired: true },
];

// Counts for two of the checklist's parts, so the builder's search shows stock on the common ones.
const CHECKLIST_STOCK: Record<string, number> = { "cap.electrolytic": 24, fuse: 30 };

export async function seedDemoParts(ctx: TxContext): Promise<number> {
  let created = 0;
  for (const p of DEMO_PARTS) {
    const [existing] = await ctx.tx
      .select({ id: parts.id })
      .from(parts)
      .where(sql`lower(${parts.name}) = lower(${p.name})`)
      .limit(1);
    if (existing) continue;
    await ctx.tx.insert(parts).values({
      name: p.name,
      supplierRef: p.supplierRef,
      costMinor: p.costMinor,
      markupBp: p.markupBp ?? null,
      stock: p.stock,
      retiredAt: p.retired ? new Date() : null,
    });
    created++;
  }
  for (const [code, stock] of Object.entries(CHECKLIST_STOCK))
    await ctx.tx
      .update(parts)
      .set({ stock })
      .where(and(eq(parts.code, code), isNull(parts.stock)));
  return created;
}
