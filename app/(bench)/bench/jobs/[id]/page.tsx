import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { z } from "@/lib/engine/zod";
import { JobWorkspace } from "@/components/bench/job-workspace";
import { getJobDetailForStaff } from "@/db/queries/bench";
import { jobNumber } from "@/lib/engine/jobs/states";
import { can } from "@/lib/engine/permissions";
import { requirePermission } from "@/lib/server/session";
import { JobDocuments } from "@/app/(portal)/portal/jobs/[id]/_components/job-documents";

type Props = { params: Promise<{ id: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { id } = await params;
  const parsed = z.uuid().safeParse(id);
  if (!parsed.success) return { title: "Job" };
  const row = await getJobDetailForStaff({ jobId: parsed.data });
  return { title: row ? `${jobNumber(row.job.number)} · ${row.set.maker} ${row.set.model}` : "Job" };
}

export default async function BenchJobPage({ params }: Props) {
  const { id } = await params;
  const viewer = await requirePermission("bench.use", `/bench/jobs/${id}`);
  const parsed = z.uuid().safeParse(id);
  if (!parsed.success) notFound();
  const row = await getJobDetailForStaff({ jobId: parsed.data });
  if (!row) notFound();
  return (
    <div className="space-y-6">
      <JobWorkspace jobId={parsed.data} canCancel={can(viewer.role, "job.cancel")} canRecord={can(viewer.role, "decision.record")} />
      {/* The office (shop owner) downloads the job's estimate, receipts and invoice here too. */}
      {can(viewer.role, "document.download") ? <JobDocuments jobId={parsed.data} /> : null}
    </div>
  );
}
