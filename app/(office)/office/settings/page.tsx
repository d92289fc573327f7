import type { Metadata } from "next";
import { SettingsForm } from "@/components/office/settings-form";
import { timeZoneChoices } from "@/lib/engine/dates";
import { requirePermission } from "@/lib/server/session";
import { loadSettingsForOffice } from "@/lib/server/services/settings";

export const metadata: Metadata = { title: "Rates & policy" };

export default async function SettingsPage() {
  await requirePermission("settings.edit", "/office/settings");
  const initial = await loadSettingsForOffice();
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-3xl font-bold">Rates &amp; policy</h1>
        <p className="max-w-prose text-bakelite-soft">
          The figures every estimate, bench verdict and certificate is computed from. A change applies to estimates priced after you save;
          estimates already sent keep the figures they were sent with.
        </p>
      </div>
      <SettingsForm initial={initial} timeZones={timeZoneChoices()} />
    </div>
  );
}
