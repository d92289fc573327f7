import type { Metadata } from "next";
import { QueueTable } from "@/components/bench/queue-table";
import { requirePermission } from "@/lib/session";

export const metadata: Metadata = { title: "Bench queue" };

export default async function BenchQueuePage() {
  const viewer = await requirePermission("bench.use", "/bench");
  return (
    <div className="space-y-3">
      <h1 className="text-2xl font-bold">Queue</h1>
      <QueueTable viewerId={viewer.id} />
    </div>
  );
}
