import { route } from "@/lib/server/route-handler";
import { loadSettingsForOffice, saveSettings } from "@/lib/server/services/settings";
import { settingsFormSchema } from "@/lib/validation/office";

// The office settings: identity, rates, policy, warranty wording, tolerances. Owner only (others get 404).
export const GET = route({ permission: "settings.edit" }, async () => loadSettingsForOffice());

// A stale version answers 409 and writes nothing; a save writes one audit row.
export const PUT = route({ permission: "settings.edit", body: settingsFormSchema }, async ({ body, viewer }) =>
  saveSettings({ values: body, actorId: viewer.id }),
);
