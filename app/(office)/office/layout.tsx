import type { ReactNode } from "react";
import { AreaShell } from "@/components/area-shell";
import { requirePermission } from "@/lib/server/session";
import { shopTimeZone } from "@/lib/server/services/shop";
import { withUnreadCount } from "@/lib/server/services/notifications";

const OFFICE_NAV = [
  { href: "/office", label: "Overview" },
  { href: "/office/settings", label: "Rates & policy" },
  { href: "/office/staff", label: "Staff" },
  { href: "/office/instruments", label: "Instruments" },
  { href: "/office/parts", label: "Parts" },
  { href: "/office/payments", label: "Payments" },
  { href: "/office/certificates", label: "Certificates" },
  { href: "/office/audit", label: "Audit log" },
  { href: "/office/reports", label: "Reports" },
];

export default async function OfficeLayout({ children }: { children: ReactNode }) {
  const viewer = await requirePermission("office.use", "/office");
  return (
    <AreaShell viewer={await withUnreadCount(viewer)} timeZone={await shopTimeZone()} title="Office" nav={OFFICE_NAV}>
      {children}
    </AreaShell>
  );
}
