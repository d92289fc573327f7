import { randomInt } from "node:crypto";
import { transaction } from "@/db/transaction";
import { computeChecklist } from "@/lib/engine/checklist";
import type { SetProfile } from "@/lib/engine/checklist/profile";
import { getBoss } from "@/lib/server/queue";
import { issueCertificate } from "@/lib/server/services/certificates";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";
import { defaultPartsCatalogue } from "@/lib/engine/pricing/parts";
import { judgeReading, listRequiredReadings } from "@/lib/engine/verdicts";
import { sql } from "../support/db";
import { aurelianTableSet, haldaneConsole } from "../unit/support/demo-sets";

export const IDS = { mira: "demo-cust-mira", jonah: "demo-cust-jonah", tomas: "demo-tech-tomas", odile: "demo-owner-odile" } as const;

export type CompletedJob = {
  jobId: string;
  setId: string;
  readings: { key: string; value: number; unit: string; verdict: string; tolerance_text: string }[];
  tasks: { code: string; title: string }[];
  partCodes: string[];
};

const DAY = 86_400_000;

/**
 * A job that went through the whole flow, written straight into the tables: set, returned job, ticked
 * checklist, an approved revision with labour and part lines, and a reading for every required key
 * (slightly off the nominal, each judged by the engine as the bench sheet would).
 */
export async function createReturnedJob({
  customerId = IDS.mira,
  profile = aurelianTableSet,
  maker = "Aurelian",
  model = "Model 5T",
  serial = `AU-52-${randomInt(1000, 9999)}`,
  returnedDaysAgo = 0,
}: {
  customerId?: string;
  profile?: SetProfile;
  maker?: string;
  model?: string;
  serial?: string;
  returnedDaysAgo?: number;
} = {}): Promise<CompletedJob> {
  const returnedAt = new Date(Date.now() - returnedDaysAgo * DAY);
  const [set] = await sql<{ id: string }>(
    "insert into radio_set (owner_id, maker, model, year, serial, kind, profile) values ($1, $2, $3, 1952, $4, $5, $6) returning id",
    [customerId, maker, model, serial, profile.kind, JSON.stringify(profile)],
  );
  const [job] = await sql<{ id: string }>(
    `insert into job (set_id, customer_id, technician_id, state, symptoms, completed_at, returned_at, return_method)
     values ($1, $2, $3, 'returned', 'Hums, then goes quiet', $4, $4, 'shipped') returning id`,
    [set!.id, customerId, IDS.tomas, returnedAt],
  );
  const jobId = job!.id;
  const lines = computeChecklist(profile, defaultShopPolicy);
  const tasks = lines.map((l) => ({ code: l.code, title: l.title }));
  for (const t of tasks) {
    await sql("insert into job_task (job_id, code, title, done_by, done_at) values ($1, $2, $3, $4, $5)", [
      jobId,
      t.code,
      t.title,
      IDS.tomas,
      returnedAt,
    ]);
  }
  const [estimate] = await sql<{ id: string }>(
    "insert into estimate (job_id, draft, current_revision) values ($1, '{\"lines\":[]}', 1) returning id",
    [jobId],
  );
  const [rev] = await sql<{ id: string }>(
    `insert into estimate_revision (estimate_id, job_id, revision, status, currency, labour_minor, parts_minor, tax_minor, total_minor, deposit_minor, pricing, sent_by)
     values ($1, $2, 1, 'approved', 'USD', 40000, 6000, 480, 46480, 13944, '{}', $3) returning id`,
    [estimate!.id, jobId, IDS.tomas],
  );
  let position = 1;
  const partCodes: string[] = [];
  for (const l of lines) {
    await sql(
      "insert into estimate_line (revision_id, position, code, title, category, minutes, quantity, reason, labour_minor) values ($1, $2, $3, $4, $5, $6, $7, $8, 1500)",
      [rev!.id, position++, l.code, l.title, l.category, l.minutes, l.quantity, l.reason],
    );
    for (const p of l.parts) {
      const entry = defaultPartsCatalogue[p.code];
      partCodes.push(p.code);
      await sql(
        "insert into estimate_line (revision_id, position, code, title, category, minutes, quantity, reason, part_cost_minor, markup_bp, parts_minor) values ($1, $2, $3, $4, 'parts', 0, $5, $6, $7, 3500, 900)",
        [rev!.id, position++, `part.${p.code}`, entry.title, p.quantity, `For: ${l.title}`, entry.costMinor],
      );
    }
  }
  const requirements = listRequiredReadings(profile, defaultShopPolicy.tolerances);
  const readings = requirements.map((r, i) => {
    // Edges a few kHz off their marks, leakage well under its limit, B+ recorded.
    const value = r.unit === "mA" ? 0.11 + i / 1000 : r.unit === "V" ? 118.5 : (r.nominal ?? 0) + ((i % 5) - 2) * 0.75;
    const j = judgeReading(r, value);
    return { key: r.key, value, unit: r.unit, verdict: j.verdict, tolerance_text: j.toleranceText };
  });
  for (const r of readings) {
    await sql("insert into reading (job_id, key, value, unit, verdict, tolerance_text, recorded_by) values ($1, $2, $3, $4, $5, $6, $7)", [
      jobId,
      r.key,
      r.value,
      r.unit,
      r.verdict,
      r.tolerance_text,
      IDS.tomas,
    ]);
  }
  return { jobId, setId: set!.id, readings, tasks, partCodes };
}

export async function issueFor(jobId: string, actorId: string = IDS.tomas) {
  return transaction((ctx) => issueCertificate(ctx, { jobId, actorId }));
}

export async function createCertificate(opts: Parameters<typeof createReturnedJob>[0] = {}) {
  const job = await createReturnedJob(opts);
  const cert = await issueFor(job.jobId);
  return { ...job, ...cert };
}

export { haldaneConsole };

/** The test process queues e-mail through pg-boss too; stop it so the run can end. */
export async function stopQueue(): Promise<void> {
  const boss = await getBoss();
  await boss.stop({ graceful: false, wait: false });
}
