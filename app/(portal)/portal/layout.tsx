import type { ReactNode } from "react";
import { AreaShell } from "@/components/area-shell";
import { requirePermission } from "@/lib/server/session";

export default async function PortalLayout({ children }: { children: ReactNode }) {
  const viewer = await requirePermission("portal.use", "/portal");
  return (
    <AreaShell
      viewer={viewer}
      title="My sets"
      nav={[
        { href: "/portal", label: "My jobs" },
        { href: "/portal/request", label: "Request a quote" },
        { href: "/portal/claims", label: "Warranty claims" },
      ]}
    >
      {children}
    </AreaShell>
  );
}
