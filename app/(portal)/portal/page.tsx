import type { Metadata } from "next";
import Link from "next/link";
import { StateBadge } from "@/components/state-badge";
import { listJobsForCustomer } from "@/db/queries/jobs";
import { jobNumber } from "@/lib/engine/jobs/states";
import { canAccess } from "@/lib/engine/permissions";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "My jobs" };

export default async function PortalPage() {
  const viewer = await requirePermission("portal.use", "/portal");
  const jobs = await listJobsForCustomer({ customerId: viewer.id });
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-3xl font-bold">My jobs</h1>
          <p className="text-bakelite-soft">Every set you have sent us, where it is, and what we need from you.</p>
        </div>
        {canAccess(viewer, "quote.request") ? (
          <Link href="/portal/request" className="btn-primary">
            Request a quote
          </Link>
        ) : null}
      </div>
      {jobs.length === 0 ? (
        <div className="card p-6">
          <p>You have no jobs yet. Tell us about your set and we will send an estimate.</p>
        </div>
      ) : (
        <ul className="space-y-3">
          {jobs.map((j) => (
            <li key={j.id} className="card flex flex-wrap items-center justify-between gap-3 p-4">
              <div>
                <p className="figure text-xs text-bakelite-muted">
                  {jobNumber(j.number)}
                  {j.isWarranty ? " · warranty job" : ""}
                </p>
                <h2 className="text-lg font-semibold">
                  <Link href={`/portal/jobs/${j.id}`}>
                    {j.maker} {j.model}
                    {j.year ? ` (${j.year})` : ""}
                  </Link>
                </h2>
              </div>
              <div className="flex flex-wrap items-center gap-2">
                {j.unread > 0 ? (
                  <Link
                    href={`/portal/jobs/${j.id}#messages-title`}
                    className="rounded-full border border-ember px-2 py-0.5 text-sm font-semibold text-ember-dark"
                    data-testid="unread-messages"
                  >
                    {j.unread === 1 ? "1 new message" : `${j.unread} new messages`}
                  </Link>
                ) : null}
                <StateBadge state={j.state} audience="owner" returnMethod={j.returnMethod} setAtShop={j.receivedAt !== null} />
              </div>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
