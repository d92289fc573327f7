import { and, desc, eq, gte, isNull, lt, sql, type SQL } from "drizzle-orm";
import { db } from "@/db";
import { auditEvents, user } from "@/db/schema";

/** The checked audit-log filter (lib/validation/office.ts parses it from the query string). */
export type AuditFilter = { actor?: string; entity?: string; action?: string; from?: string; to?: string; page: number };

export const AUDIT_PAGE_SIZE = 40;

/** "system" stands for rows written without a person (webhooks, the worker). */
export const SYSTEM_ACTOR = "system";

function nextDay(isoDay: string): Date {
  const d = new Date(`${isoDay}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d;
}

function conditions(f: AuditFilter): SQL | undefined {
  const parts: (SQL | undefined)[] = [];
  if (f.actor === SYSTEM_ACTOR) parts.push(isNull(auditEvents.actorId));
  else if (f.actor) parts.push(eq(auditEvents.actorId, f.actor));
  if (f.entity) parts.push(eq(auditEvents.entity, f.entity));
  if (f.action) parts.push(eq(auditEvents.action, f.action));
  if (f.from) parts.push(gte(auditEvents.at, new Date(`${f.from}T00:00:00Z`)));
  if (f.to) parts.push(lt(auditEvents.at, nextDay(f.to)));
  const present = parts.filter((p): p is SQL => !!p);
  return present.length ? and(...present) : undefined;
}

export async function listAuditEventsForOwner({ filter }: { filter: AuditFilter }) {
  const rows = await db
    .select({
      id: auditEvents.id,
      at: auditEvents.at,
      actorId: auditEvents.actorId,
      actorName: user.name,
      actorEmail: user.email,
      action: auditEvents.action,
      entity: auditEvents.entity,
      entityId: auditEvents.entityId,
      before: auditEvents.before,
      after: auditEvents.after,
    })
    .from(auditEvents)
    .leftJoin(user, eq(user.id, auditEvents.actorId))
    .where(conditions(filter))
    .orderBy(desc(auditEvents.at), desc(auditEvents.id))
    .limit(AUDIT_PAGE_SIZE + 1)
    .offset((filter.page - 1) * AUDIT_PAGE_SIZE);
  const [total] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(auditEvents)
    .where(conditions(filter));
  return { rows: rows.slice(0, AUDIT_PAGE_SIZE), hasMore: rows.length > AUDIT_PAGE_SIZE, total: total?.n ?? 0 };
}

/** The choices offered by the filter form: what actually occurs in the log. */
export async function auditFilterOptionsForOwner() {
  const [actors, entities, actions] = await Promise.all([
    db
      .selectDistinct({ id: auditEvents.actorId, name: user.name, email: user.email })
      .from(auditEvents)
      .leftJoin(user, eq(user.id, auditEvents.actorId))
      .orderBy(user.name),
    db.selectDistinct({ entity: auditEvents.entity }).from(auditEvents).orderBy(auditEvents.entity),
    db.selectDistinct({ action: auditEvents.action }).from(auditEvents).orderBy(auditEvents.action),
  ]);
  return {
    actors: actors.map((a) =>
      a.id
        ? { value: a.id, label: `${a.name ?? "Unknown"} (${a.email ?? a.id})` }
        : { value: SYSTEM_ACTOR, label: "System (webhooks, worker)" },
    ),
    entities: entities.map((e) => e.entity),
    actions: actions.map((a) => a.action),
  };
}
