import { createHash } from "node:crypto";
import { and, asc, desc, eq, ilike, inArray, isNull, notInArray, or, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { db, type Database } from "@/db";
import { estimateRevisions, jobs, jobStateHistory, jobTasks, messageReads, messages, photos, radioSets, readings, user } from "@/db/schema";
import type { JobState } from "@/db/schema/enums";
import { parseJobNumber, type QueueQuery } from "@/lib/engine/jobs/queue-query";

const CLOSED: JobState[] = ["returned", "declined_by_owner", "declined_by_shop", "cancelled"];
const technician = alias(user, "technician");

function escapeLike(s: string): string {
  return s.replace(/[\\%_]/g, (c) => `\\${c}`);
}

// The set owner's messages this staff member has not read yet on the outer query's job (colleagues' messages
// and notes are not counted: the marker says the owner wrote).
function staffUnread(viewerId: ReturnType<typeof sql.placeholder>) {
  return sql<number>`(select count(*)::int from ${messages} m
    where m.job_id = ${jobs.id} and m.author_id = ${jobs.customerId}
      and m.created_at > coalesce((select r.read_up_to from ${messageReads} r where r.job_id = ${jobs.id} and r.user_id = ${viewerId}), '-infinity'))`;
}

// The bench queue: every job (staff see all of them), filtered, sorted and paged in SQL.
//
// The queue is the page staff keep open and poll, so its statement is built and prepared once per shape of
// filter (which filters are present, the sort and its direction) with every value a parameter; each request
// only binds values. The shapes are few (a few hundred at most, each prepared on first use per connection).
type QueueShape = {
  states: boolean;
  includeClosed: boolean;
  technician: "" | "me" | "none" | "id";
  q: "" | "text" | "number";
  sort: QueueQuery["sort"];
  dir: QueueQuery["dir"];
};

function shapeOf(query: QueueQuery): QueueShape {
  return {
    states: query.states.length > 0,
    includeClosed: query.includeClosed,
    technician: query.technician === "" || query.technician === "me" || query.technician === "none" ? query.technician : "id",
    q: query.q ? (parseJobNumber(query.q) !== null ? "number" : "text") : "",
    sort: query.sort,
    dir: query.dir,
  };
}

function queueFilter(shape: QueueShape): SQL | undefined {
  const where: SQL[] = [];
  if (shape.states) where.push(sql`${jobs.state} = any(${sql.placeholder("states")}::job_state[])`);
  else if (!shape.includeClosed) where.push(notInArray(jobs.state, CLOSED));
  if (shape.technician === "me" || shape.technician === "id") where.push(eq(jobs.technicianId, sql.placeholder("technician")));
  else if (shape.technician === "none") where.push(isNull(jobs.technicianId));
  if (shape.q) {
    const like = sql.placeholder("like");
    const text = or(
      ilike(user.name, like),
      ilike(user.email, like),
      ilike(radioSets.maker, like),
      ilike(radioSets.model, like),
      ilike(sql`${radioSets.maker} || ' ' || ${radioSets.model}`, like),
    )!;
    where.push(shape.q === "number" ? or(eq(jobs.number, sql.placeholder("number")), text)! : text);
  }
  return where.length ? and(...where) : undefined;
}

function prepareQueue(shape: QueueShape, name: string) {
  const order = shape.dir === "asc" ? asc : desc;
  const sortColumn = {
    number: jobs.number,
    updatedAt: jobs.updatedAt,
    createdAt: jobs.createdAt,
    state: jobs.state,
    customer: user.name,
    set: sql`${radioSets.maker} || ' ' || ${radioSets.model}`,
    technician: technician.name,
  }[shape.sort];
  // One round trip: the page of rows with the filtered total beside each (count over the whole filter,
  // before limit/offset). Only a page past the end, which has no row to carry it, asks for the total apart.
  return db
    .select({
      id: jobs.id,
      number: jobs.number,
      state: jobs.state,
      isWarranty: jobs.isWarranty,
      setAtShop: sql<boolean>`${jobs.receivedAt} is not null`,
      createdAt: jobs.createdAt,
      updatedAt: jobs.updatedAt,
      maker: radioSets.maker,
      model: radioSets.model,
      year: radioSets.year,
      kind: radioSets.kind,
      customerName: user.name,
      customerEmail: user.email,
      technicianId: jobs.technicianId,
      technicianName: technician.name,
      unread: staffUnread(sql.placeholder("viewer")),
      total: sql<number>`(count(*) over ())::int`,
    })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .leftJoin(technician, eq(technician.id, jobs.technicianId))
    .where(queueFilter(shape))
    .orderBy(order(sortColumn), desc(jobs.number))
    .limit(sql.placeholder("limit"))
    .offset(sql.placeholder("offset"))
    .prepare(name);
}

function prepareQueueCount(shape: QueueShape, name: string) {
  return db
    .select({ n: sql<number>`count(*)::int` })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .where(queueFilter(shape))
    .prepare(name);
}

const preparedQueues = new Map<string, { page: ReturnType<typeof prepareQueue>; count: ReturnType<typeof prepareQueueCount> }>();
function queueStatements(shape: QueueShape) {
  const key = `${shape.states ? "s" : ""}${shape.includeClosed ? "c" : ""}|${shape.technician}|${shape.q}|${shape.sort}|${shape.dir}`;
  let statements = preparedQueues.get(key);
  if (!statements) {
    // Named after the shape itself: the server bundles this module more than once (route handlers, pages) over
    // one shared pool, and a connection refuses one name for two different statements.
    const name = createHash("sha256").update(key).digest("hex").slice(0, 24);
    statements = { page: prepareQueue(shape, `bandedge_queue_${name}`), count: prepareQueueCount(shape, `bandedge_queue_count_${name}`) };
    preparedQueues.set(key, statements);
  }
  return statements;
}

export async function listQueueForStaff({ query, viewerId }: { query: QueueQuery; viewerId: string }) {
  const shape = shapeOf(query);
  const values = {
    states: query.states,
    technician: query.technician === "me" ? viewerId : query.technician,
    like: `%${escapeLike(query.q)}%`,
    number: parseJobNumber(query.q) ?? 0,
    viewer: viewerId,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  };
  const statements = queueStatements(shape);
  const rows = await statements.page.execute(values);
  let total = rows[0]?.total;
  if (total === undefined) {
    const [count] = await statements.count.execute(values);
    total = count?.n ?? 0;
  }
  return { rows: rows.map(({ total: _total, ...row }) => row), total };
}

// People who can take a job: active technicians and the shop owner.
export async function listAssignableStaff(tx: Database = db) {
  return tx
    .select({ id: user.id, name: user.name, role: user.role })
    .from(user)
    .where(and(inArray(user.role, ["technician", "owner"]), or(isNull(user.banned), eq(user.banned, false))))
    .orderBy(asc(user.name));
}

export async function getJobDetailForStaff({ jobId }: { jobId: string }, tx: Database = db) {
  const [row] = await tx
    .select({
      job: jobs,
      set: radioSets,
      customer: { id: user.id, name: user.name, email: user.email, phone: user.phone, contactOnly: user.contactOnly },
      technicianName: technician.name,
    })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .leftJoin(technician, eq(technician.id, jobs.technicianId))
    .where(eq(jobs.id, jobId))
    .limit(1);
  return row ?? null;
}

export async function listMessagesForStaff({ jobId }: { jobId: string }, tx: Database = db) {
  return tx
    .select({
      id: messages.id,
      body: messages.body,
      internal: messages.internal,
      isQuestion: messages.isQuestion,
      createdAt: messages.createdAt,
      authorId: messages.authorId,
      authorName: user.name,
      authorRole: user.role,
    })
    .from(messages)
    .innerJoin(user, eq(user.id, messages.authorId))
    .where(eq(messages.jobId, jobId))
    .orderBy(asc(messages.createdAt));
}

export async function listPhotosForStaff({ jobId }: { jobId: string }, tx: Database = db) {
  return tx
    .select({
      id: photos.id,
      displayName: photos.displayName,
      width: photos.width,
      height: photos.height,
    })
    .from(photos)
    .where(and(eq(photos.jobId, jobId), isNull(photos.messageId)))
    .orderBy(asc(photos.createdAt));
}

export async function listHistoryForStaff({ jobId }: { jobId: string }, tx: Database = db) {
  return tx
    .select({
      id: jobStateHistory.id,
      fromState: jobStateHistory.fromState,
      toState: jobStateHistory.toState,
      note: jobStateHistory.note,
      at: jobStateHistory.at,
      actorName: user.name,
    })
    .from(jobStateHistory)
    .leftJoin(user, eq(user.id, jobStateHistory.actorId))
    .where(eq(jobStateHistory.jobId, jobId))
    .orderBy(asc(jobStateHistory.at));
}

export async function listReadingsForStaff({ jobId }: { jobId: string }, tx: Database = db) {
  return tx
    .select({
      key: readings.key,
      value: readings.value,
      unit: readings.unit,
      note: readings.note,
      verdict: readings.verdict,
      toleranceText: readings.toleranceText,
      recordedAt: readings.recordedAt,
      recordedByName: user.name,
    })
    .from(readings)
    .leftJoin(user, eq(user.id, readings.recordedBy))
    .where(eq(readings.jobId, jobId));
}

export async function listTasksForStaff({ jobId }: { jobId: string }, tx: Database = db) {
  return tx
    .select({ id: jobTasks.id, code: jobTasks.code, title: jobTasks.title, doneAt: jobTasks.doneAt, doneByName: user.name })
    .from(jobTasks)
    .leftJoin(user, eq(user.id, jobTasks.doneBy))
    .where(eq(jobTasks.jobId, jobId));
}

const recorder = alias(user, "recorder");

/** Each revision's decision, with who recorded it when staff took the owner's answer in person or by phone. */
export async function listRevisionDecisionsForStaff({ jobId }: { jobId: string }, tx: Database = db) {
  return tx
    .select({
      id: estimateRevisions.id,
      revision: estimateRevisions.revision,
      status: estimateRevisions.status,
      totalMinor: estimateRevisions.totalMinor,
      depositMinor: estimateRevisions.depositMinor,
      currency: estimateRevisions.currency,
      decidedAt: estimateRevisions.decidedAt,
      declineReason: estimateRevisions.declineReason,
      decisionMedium: estimateRevisions.decisionMedium,
      decisionNote: estimateRevisions.decisionNote,
      recordedByName: recorder.name,
    })
    .from(estimateRevisions)
    .leftJoin(recorder, eq(recorder.id, estimateRevisions.decisionRecordedBy))
    .where(eq(estimateRevisions.jobId, jobId))
    .orderBy(asc(estimateRevisions.revision));
}
