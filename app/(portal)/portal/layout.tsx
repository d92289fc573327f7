import type { ReactNode } from "react";
import { AreaShell } from "@/components/area-shell";
import { canAccess } from "@/lib/engine/permissions";
import { requirePermission } from "@/lib/server/session";
import { shopTimeZone } from "@/lib/server/services/shop";

export default async function PortalLayout({ children }: { children: ReactNode }) {
  const viewer = await requirePermission("portal.use", "/portal");
  return (
    <AreaShell
      viewer={viewer}
      timeZone={await shopTimeZone()}
      title="My sets"
      nav={[
        { href: "/portal", label: "My jobs" },
        // A staff account that keeps its own sets answers them here; new requests come from owners' accounts.
        ...(canAccess(viewer, "quote.request") ? [{ href: "/portal/request", label: "Request a quote" }] : []),
        { href: "/portal/claims", label: "Warranty claims" },
        ...(canAccess(viewer, "account.manage") ? [{ href: "/portal/account", label: "My account" }] : []),
      ]}
    >
      {children}
    </AreaShell>
  );
}
