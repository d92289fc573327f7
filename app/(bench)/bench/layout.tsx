import type { ReactNode } from "react";
import { AreaShell } from "@/components/area-shell";
import { canAccess } from "@/lib/engine/permissions";
import { requirePermission } from "@/lib/server/session";
import { shopTimeZone } from "@/lib/server/services/shop";
import { withUnreadCount } from "@/lib/server/services/notifications";

export default async function BenchLayout({ children }: { children: ReactNode }) {
  const viewer = await requirePermission("bench.use", "/bench");
  return (
    <AreaShell
      viewer={await withUnreadCount(viewer)}
      timeZone={await shopTimeZone()}
      dense
      title="Bench"
      nav={[
        { href: "/bench", label: "Queue" },
        ...(canAccess(viewer, "job.intake") ? [{ href: "/bench/intake", label: "Take in a set" }] : []),
        { href: "/bench/calculator", label: "Alignment calculator" },
        { href: "/bench/claims", label: "Claims" },
      ]}
    >
      {children}
    </AreaShell>
  );
}
