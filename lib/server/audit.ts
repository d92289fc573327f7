import "server-only";
import { db } from "@/db";
import { auditEvents } from "@/db/schema";
import type { TxContext } from "@/db/transaction";

export type AuditInput = {
  actorId: string | null;
  action: string;
  entity: string;
  entityId: string;
  before?: Record<string, unknown> | null;
  after?: Record<string, unknown> | null;
};

// Audit rows are written inside the transaction of the change they describe.
export async function audit(ctx: TxContext, input: AuditInput): Promise<void> {
  await ctx.tx.insert(auditEvents).values({
    actorId: input.actorId,
    action: input.action,
    entity: input.entity,
    entityId: input.entityId,
    before: input.before ?? null,
    after: input.after ?? null,
  });
}

/** For events with no transaction of their own (sign-in, sign-out, the sign-in service's admin calls). */
export async function auditNow(input: AuditInput): Promise<void> {
  await db.insert(auditEvents).values({
    actorId: input.actorId,
    action: input.action,
    entity: input.entity,
    entityId: input.entityId,
    before: input.before ?? null,
    after: input.after ?? null,
  });
}
