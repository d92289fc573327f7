import type { Metadata } from "next";
import { QueueTable } from "@/components/bench/queue-table";
import { initialQueue } from "@/lib/server/services/bench-queue";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "Bench queue" };

export default async function BenchQueuePage() {
  const viewer = await requirePermission("bench.use", "/bench");
  const initial = await initialQueue({ viewerId: viewer.id });
  return (
    <div className="space-y-3">
      <h1 className="text-2xl font-bold">Queue</h1>
      <QueueTable viewerId={viewer.id} initial={initial} />
    </div>
  );
}
