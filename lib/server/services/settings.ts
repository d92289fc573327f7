import "server-only";
import {
  countOpenEstimatesForOwner,
  getSettingsEditorForOwner,
  getShopSettingsRowForOwner,
  updateShopSettingsIfVersion,
} from "@/db/queries/office";
import { transaction } from "@/db/transaction";
import { audit } from "@/lib/server/audit";
import { isEngineError } from "@/lib/engine/engine-error";
import { formatDateTime } from "@/lib/engine/dates";
import { currencyChangeRefusal } from "@/lib/engine/pricing/currency-change";
import { AppError } from "@/lib/server/errors";
import { getShop } from "@/lib/server/services/shop";
import { countCatalogueParts } from "@/lib/server/services/parts";
import { settingsFromForm, settingsToForm, type SettingsFormValues } from "@/lib/validation/office";

export type SettingsSnapshot = {
  values: SettingsFormValues;
  version: number;
  updatedAt: string | null;
  updatedByName: string | null;
};

export async function loadSettingsForOffice(): Promise<SettingsSnapshot> {
  const [shop, row] = await Promise.all([getShop(), getShopSettingsRowForOwner()]);
  return {
    values: settingsToForm(shop),
    version: shop.version,
    updatedAt: row?.updatedAt.toISOString() ?? null,
    updatedByName: await getSettingsEditorForOwner({ userId: row?.updatedBy ?? null }),
  };
}

type Flat = Record<string, unknown>;

// Leaf-level differences, keyed by dotted path, so the audit log shows exactly what moved.
function flatten(value: unknown, prefix: string, out: Flat): Flat {
  if (value && typeof value === "object" && !Array.isArray(value)) {
    for (const [k, v] of Object.entries(value as Record<string, unknown>)) flatten(v, prefix ? `${prefix}.${k}` : k, out);
  } else {
    out[prefix] = value;
  }
  return out;
}

export function diffForAudit(before: Record<string, unknown>, after: Record<string, unknown>): { before: Flat; after: Flat } {
  const a = flatten(before, "", {});
  const b = flatten(after, "", {});
  const changedBefore: Flat = {};
  const changedAfter: Flat = {};
  for (const key of new Set([...Object.keys(a), ...Object.keys(b)])) {
    if (JSON.stringify(a[key]) !== JSON.stringify(b[key])) {
      changedBefore[key] = a[key] ?? null;
      changedAfter[key] = b[key] ?? null;
    }
  }
  return { before: changedBefore, after: changedAfter };
}

/**
 * Saves the office settings if nobody saved since the editor loaded them (version check in the UPDATE);
 * otherwise a 409 that names who saved and when, and nothing is written. One audit row per save.
 */
export async function saveSettings({ values, actorId }: { values: SettingsFormValues; actorId: string }): Promise<SettingsSnapshot> {
  let converted: ReturnType<typeof settingsFromForm>;
  try {
    converted = settingsFromForm(values);
  } catch (e) {
    if (isEngineError(e)) throw new AppError("invalid_input", "Some fields need attention.", { [e.field ?? "_"]: e.message });
    throw e;
  }

  await transaction(async (ctx) => {
    const current = await getShopSettingsRowForOwner({ tx: ctx.tx, lock: true });
    if (!current) throw new AppError("not_found", "The shop settings row is missing; run the seed first.");
    const stored = await getShop(ctx.tx);
    const refusal = currencyChangeRefusal(stored.policy.currency, converted.policy.currency, {
      catalogueParts: await countCatalogueParts(ctx.tx),
      openEstimates: await countOpenEstimatesForOwner({ tx: ctx.tx }),
    });
    if (refusal) throw new AppError("conflict", refusal, { "currency.code": refusal });
    if (current.version !== values.version) {
      const who = (await getSettingsEditorForOwner({ userId: current.updatedBy })) ?? "someone";
      const when = formatDateTime(current.updatedAt, { timeZone: stored.timeZone, style: "compact", showZone: true });
      throw new AppError(
        "stale",
        `These settings were saved by ${who} at ${when} after you opened them. Nothing was saved; your changes are still in the form. Compare, then save again.`,
      );
    }
    const updated = await updateShopSettingsIfVersion(ctx, {
      expectedVersion: values.version,
      values: {
        ...converted.identity,
        policy: converted.policy as unknown as Record<string, unknown>,
        warrantyTerms: converted.warrantyTerms as unknown as Record<string, unknown>,
      },
      actorId,
    });
    if (!updated)
      throw new AppError(
        "stale",
        "These settings were saved by someone else a moment ago. Nothing was saved; your changes are still in the form.",
      );
    // Compared as the office saw them (stored values over the defaults), so the row lists only real changes.
    const effective = settingsFromForm(settingsToForm(stored));
    const beforeDoc = { ...effective.identity, policy: effective.policy, warrantyTerms: effective.warrantyTerms };
    const afterDoc = { ...converted.identity, policy: converted.policy, warrantyTerms: converted.warrantyTerms };
    const diff = diffForAudit(beforeDoc, afterDoc);
    await audit(ctx, {
      actorId,
      action: "settings.update",
      entity: "shop_settings",
      entityId: "shop",
      before: { version: current.version, ...diff.before },
      after: { version: updated.version, ...diff.after },
    });
  });
  return loadSettingsForOffice();
}
