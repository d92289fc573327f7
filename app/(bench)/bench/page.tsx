import type { Metadata } from "next";
import Link from "next/link";
import { canAccess } from "@/lib/engine/permissions";
import { QueueTable } from "@/components/bench/queue-table";
import { initialQueue } from "@/lib/server/services/bench-queue";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "Bench queue" };

export default async function BenchQueuePage() {
  const viewer = await requirePermission("bench.use", "/bench");
  const initial = await initialQueue({ viewerId: viewer.id });
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl font-bold">Queue</h1>
        {canAccess(viewer, "job.intake") ? (
          <Link href="/bench/intake" className="btn-primary no-underline">
            Take in a set
          </Link>
        ) : null}
      </div>
      <QueueTable viewerId={viewer.id} initial={initial} />
    </div>
  );
}
