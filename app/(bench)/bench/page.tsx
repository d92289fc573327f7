import type { Metadata } from "next";
import Link from "next/link";
import { desc, eq } from "drizzle-orm";
import { StateBadge } from "@/components/state-badge";
import { db } from "@/db";
import { jobs, radioSets, user } from "@/db/schema";
import { jobNumber } from "@/lib/jobs/states";
import { requirePermission } from "@/lib/session";

export const metadata: Metadata = { title: "Bench queue" };

export default async function BenchQueuePage() {
  await requirePermission("bench.use", "/bench");
  const rows = await db
    .select({ id: jobs.id, number: jobs.number, state: jobs.state, maker: radioSets.maker, model: radioSets.model, customer: user.name, updatedAt: jobs.updatedAt })
    .from(jobs)
    .innerJoin(radioSets, eq(radioSets.id, jobs.setId))
    .innerJoin(user, eq(user.id, jobs.customerId))
    .orderBy(desc(jobs.updatedAt))
    .limit(100);
  return (
    <div className="space-y-3">
      <h1 className="text-2xl font-bold">Queue</h1>
      <div className="card overflow-x-auto">
        <table className="dense-table">
          <thead>
            <tr>
              <th scope="col">Job</th>
              <th scope="col">Set</th>
              <th scope="col">Owner</th>
              <th scope="col">State</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id}>
                <td className="figure">
                  <Link href={`/bench/jobs/${r.id}`}>{jobNumber(r.number)}</Link>
                </td>
                <td>
                  {r.maker} {r.model}
                </td>
                <td>{r.customer}</td>
                <td>
                  <StateBadge state={r.state} audience="staff" />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
