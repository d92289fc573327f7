import "server-only";
import { dayInZone } from "@/lib/engine/dates";
import { and, asc, count, eq, isNull, sql } from "drizzle-orm";
import { db, type Database } from "@/db";
import { instrumentChoices, instruments, readings, type Instrument } from "@/db/schema";
import { transaction, type TxContext } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { AppError } from "@/lib/server/errors";
import { INSTRUMENT_KIND_LABEL, isCalibrationOverdue, isInstrumentKind, type InstrumentKind } from "@/lib/engine/instruments";
import type { InstrumentCreate, InstrumentUpdate } from "@/lib/validation/instruments";

// The instrument register: the office keeps it, the bench reads it, each reading names one.

export function todayUtc(now = new Date()): string {
  return dayInZone(now, "UTC");
}

export type InstrumentView = {
  id: string;
  kind: InstrumentKind;
  kindLabel: string;
  maker: string;
  model: string;
  serial: string;
  calibratedOn: string;
  calibrationDueOn: string;
  overdue: boolean;
  retiredAt: string | null;
  readingsTaken: number;
};

function view(row: Instrument, readingsTaken: number, today: string): InstrumentView {
  const kind = isInstrumentKind(row.kind) ? row.kind : "meter";
  return {
    id: row.id,
    kind,
    kindLabel: INSTRUMENT_KIND_LABEL[kind],
    maker: row.maker,
    model: row.model,
    serial: row.serial,
    calibratedOn: row.calibratedOn,
    calibrationDueOn: row.calibrationDueOn,
    overdue: isCalibrationOverdue(row.calibrationDueOn, today),
    retiredAt: row.retiredAt?.toISOString() ?? null,
    readingsTaken,
  };
}

/** Every instrument, in service first, with how many readings name it. */
export async function listInstruments({ tx = db, today = todayUtc() }: { tx?: Database; today?: string } = {}): Promise<InstrumentView[]> {
  const used = await tx
    .select({ instrumentId: readings.instrumentId, n: count() })
    .from(readings)
    .where(sql`${readings.instrumentId} is not null`)
    .groupBy(readings.instrumentId);
  const uses = new Map(used.map((u) => [u.instrumentId, Number(u.n)]));
  const rows = await tx
    .select()
    .from(instruments)
    .orderBy(sql`${instruments.retiredAt} is not null`, asc(instruments.kind), asc(instruments.maker), asc(instruments.model));
  return rows.map((r) => view(r, uses.get(r.id) ?? 0, today));
}

/** The instruments the bench may choose from: every one not retired. */
export async function listOfferedInstruments({ tx = db, today = todayUtc() }: { tx?: Database; today?: string } = {}) {
  const rows = await tx
    .select()
    .from(instruments)
    .where(isNull(instruments.retiredAt))
    .orderBy(asc(instruments.kind), asc(instruments.maker), asc(instruments.model), asc(instruments.serial));
  return rows.map((r) => view(r, 0, today)).map(({ readingsTaken: _n, retiredAt: _r, ...rest }) => rest);
}
export type OfferedInstrument = Awaited<ReturnType<typeof listOfferedInstruments>>[number];

function isIdentityClash(e: unknown): boolean {
  const err = e as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string } };
  return (err.code ?? err.cause?.code) === "23505" && (err.constraint ?? err.cause?.constraint) === "instrument_identity_idx";
}

const CLASH = "The register already holds an instrument with this maker, model and serial.";

export async function createInstrument({ input, actorId }: { input: InstrumentCreate; actorId: string }): Promise<InstrumentView> {
  try {
    return await transaction(async (ctx) => {
      const [clash] = await ctx.tx
        .select({ id: instruments.id })
        .from(instruments)
        .where(
          and(
            sql`lower(${instruments.maker}) = lower(${input.maker})`,
            sql`lower(${instruments.model}) = lower(${input.model})`,
            sql`lower(${instruments.serial}) = lower(${input.serial})`,
          ),
        )
        .limit(1);
      if (clash) throw new AppError("conflict", CLASH, { serial: CLASH });
      const [row] = await ctx.tx
        .insert(instruments)
        .values({ ...input, createdBy: actorId })
        .returning();
      await audit(ctx, { actorId, action: "instrument.add", entity: "instrument", entityId: row!.id, before: null, after: { ...input } });
      return view(row!, 0, todayUtc());
    });
  } catch (e) {
    if (isIdentityClash(e)) throw new AppError("conflict", CLASH, { serial: CLASH });
    throw e;
  }
}

async function lockInstrument(ctx: TxContext, id: string): Promise<Instrument> {
  const [row] = await ctx.tx.select().from(instruments).where(eq(instruments.id, id)).for("update").limit(1);
  if (!row) throw new AppError("not_found", "That instrument is not in the register.");
  return row;
}

async function readingsTakenWith(tx: Database, id: string): Promise<number> {
  const [row] = await tx.select({ n: count() }).from(readings).where(eq(readings.instrumentId, id));
  return Number(row?.n ?? 0);
}

/** Retire (kept for history, no longer offered), return to service, or record a new calibration. */
export async function updateInstrument(ctx: TxContext, { id, input, actorId }: { id: string; input: InstrumentUpdate; actorId: string }) {
  const before = await lockInstrument(ctx, id);
  const patch: Partial<Instrument> = {};
  if (input.retired !== undefined) patch.retiredAt = input.retired ? (before.retiredAt ?? new Date()) : null;
  if (input.calibratedOn && input.calibrationDueOn) {
    patch.calibratedOn = input.calibratedOn;
    patch.calibrationDueOn = input.calibrationDueOn;
  }
  const [row] = await ctx.tx.update(instruments).set(patch).where(eq(instruments.id, id)).returning();
  await audit(ctx, {
    actorId,
    action: input.retired === true ? "instrument.retire" : input.retired === false ? "instrument.return" : "instrument.calibrate",
    entity: "instrument",
    entityId: id,
    before: { retired: before.retiredAt !== null, calibratedOn: before.calibratedOn, calibrationDueOn: before.calibrationDueOn },
    after: { retired: row!.retiredAt !== null, calibratedOn: row!.calibratedOn, calibrationDueOn: row!.calibrationDueOn },
  });
  return view(row!, await readingsTakenWith(ctx.tx, id), todayUtc());
}

/** Only an instrument no reading names can be deleted (a mistaken entry); one that was used is retired instead. */
export async function deleteInstrument(ctx: TxContext, { id, actorId }: { id: string; actorId: string }) {
  const row = await lockInstrument(ctx, id);
  const used = await readingsTakenWith(ctx.tx, id);
  if (used > 0)
    throw new AppError(
      "conflict",
      `This instrument was used for ${used} reading${used === 1 ? "" : "s"}, so it stays in the register for their history. Retire it instead.`,
    );
  await ctx.tx.delete(instrumentChoices).where(eq(instrumentChoices.instrumentId, id));
  await ctx.tx.delete(instruments).where(eq(instruments.id, id));
  await audit(ctx, {
    actorId,
    action: "instrument.delete",
    entity: "instrument",
    entityId: id,
    before: { kind: row.kind, maker: row.maker, model: row.model, serial: row.serial },
    after: null,
  });
  return { id, deleted: true };
}

/** The technician's last instrument per kind. */
export async function lastInstrumentChoices({ tx = db, userId }: { tx?: Database; userId: string }) {
  const rows = await tx
    .select({ kind: instrumentChoices.kind, instrumentId: instrumentChoices.instrumentId })
    .from(instrumentChoices)
    .where(eq(instrumentChoices.userId, userId));
  const out: Partial<Record<InstrumentKind, string>> = {};
  for (const r of rows) if (isInstrumentKind(r.kind)) out[r.kind] = r.instrumentId;
  return out;
}

export async function rememberInstrumentChoice(ctx: TxContext, { userId, instrument }: { userId: string; instrument: Instrument }) {
  await ctx.tx
    .insert(instrumentChoices)
    .values({ userId, kind: instrument.kind, instrumentId: instrument.id })
    .onConflictDoUpdate({
      target: [instrumentChoices.userId, instrumentChoices.kind],
      set: { instrumentId: instrument.id, chosenAt: new Date() },
    });
}

/** The instrument a reading names, checked: in the register, not retired, of a kind the reading is taken with. */
export async function instrumentForReading(
  tx: Database,
  { instrumentId, kinds }: { instrumentId: string; kinds: readonly InstrumentKind[] },
): Promise<Instrument> {
  const [row] = await tx.select().from(instruments).where(eq(instruments.id, instrumentId)).limit(1);
  const field = "The shop's register has no such instrument.";
  if (!row) throw new AppError("invalid_input", field, { instrumentId: field });
  if (row.retiredAt) {
    const m = `${row.maker} ${row.model} (${row.serial}) is retired and is not used for new readings.`;
    throw new AppError("invalid_input", m, { instrumentId: m });
  }
  if (!isInstrumentKind(row.kind) || !kinds.includes(row.kind)) {
    const m = `This reading is taken with a ${kinds.map((k) => INSTRUMENT_KIND_LABEL[k].toLowerCase()).join(" or ")}, not a ${
      isInstrumentKind(row.kind) ? INSTRUMENT_KIND_LABEL[row.kind].toLowerCase() : row.kind
    }.`;
    throw new AppError("invalid_input", m, { instrumentId: m });
  }
  return row;
}
