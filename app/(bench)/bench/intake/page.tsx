import type { Metadata } from "next";
import { IntakeForm } from "@/components/bench/intake-form";
import { requirePermission } from "@/lib/server/session";

export const metadata: Metadata = { title: "Take in a set" };

// Counter and phone intake: staff open a job for someone who brings a set in or calls the shop.
export default async function IntakePage() {
  await requirePermission("job.intake", "/bench/intake");
  return (
    <div className="mx-auto max-w-4xl space-y-4">
      <h1 className="text-2xl font-bold">Take in a set</h1>
      <p className="text-bakelite-soft">
        For a customer at the counter or on the phone. The job starts in triage; a set handed over here is marked as received.
      </p>
      <IntakeForm />
    </div>
  );
}
