import type { JobState } from "@/lib/engine/jobs/states";
import { ownerStateLabel, STATE_LABEL, staffStateLabel, type ReturnMethod } from "@/lib/engine/jobs/states";

const TONE: Partial<Record<JobState, string>> = {
  estimate_sent: "border-ember text-ember-dark",
  awaiting_owner: "border-ember text-ember-dark",
  approved: "border-ember text-ember-dark",
  balance_due: "border-ember text-ember-dark",
  returned: "border-pass text-pass",
  declined_by_owner: "border-bakelite-muted text-bakelite-muted",
  declined_by_shop: "border-bakelite-muted text-bakelite-muted",
  cancelled: "border-bakelite-muted text-bakelite-muted",
};

export function StateBadge({
  state,
  audience,
  returnMethod,
  setAtShop = false,
}: {
  state: JobState;
  audience: "owner" | "staff";
  returnMethod?: ReturnMethod | null;
  setAtShop?: boolean;
}) {
  const label = STATE_LABEL[state];
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border bg-white px-2 py-0.5 text-xs font-semibold ${TONE[state] ?? "border-bakelite-soft text-bakelite"}`}
    >
      <span aria-hidden="true">{label.icon}</span>
      {audience === "owner" ? ownerStateLabel(state, returnMethod, setAtShop) : staffStateLabel(state, setAtShop)}
    </span>
  );
}
