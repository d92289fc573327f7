import { z } from "@/lib/engine/zod";
import "./field-words";
import { EngineError } from "@/lib/engine/engine-error";
import { toMinor } from "@/lib/engine/pricing/money";
import { partCodeSchema } from "@/lib/engine/pricing/parts";
import { priceEstimate, type EstimateLineInput, type PricedEstimate } from "@/lib/engine/pricing/price-estimate";
import type { ShopPolicy } from "@/lib/engine/shop-policy";

// The estimate builder's working draft, shared by the form (react-hook-form + zod resolver) and the server.
// Lines are flat: labour lines come from the checklist (or are added by hand); part lines carry a cost and a
// markup. Money is typed as a decimal string ("4.50") and converted to minor units by the engine.

export const DRAFT_CATEGORIES = ["inspection", "safety", "recap", "alignment", "mechanical", "test", "parts"] as const;
export type DraftCategory = (typeof DRAFT_CATEGORIES)[number];

export const CATEGORY_LABEL: Record<DraftCategory, string> = {
  inspection: "Inspection",
  safety: "Safety",
  recap: "Recap",
  alignment: "Alignment",
  mechanical: "Mechanical",
  test: "Tests",
  parts: "Parts",
};

// One message per number field, whatever is wrong with it: the field's name and the whole range allowed.
const whole = (label: string, min: number, max: number) =>
  z.coerce
    .number({ error: `${label}: enter a whole number from ${min} to ${max}.` })
    .refine((n) => Number.isInteger(n) && n >= min && n <= max, `${label}: enter a whole number from ${min} to ${max}.`);

export const draftLineSchema = z
  .object({
    key: z.string().min(1).max(64),
    kind: z.enum(["labour", "part"]),
    code: z.string().trim().min(1, "Code: give the line a code.").max(80, "Code: keep it under 80 characters."),
    title: z.string().trim().min(1, "Title: give the line a title.").max(160, "Title: keep it under 160 characters."),
    category: z.enum(DRAFT_CATEGORIES),
    minutes: whole("Minutes", 0, 6000),
    quantity: whole("Quantity", 1, 1000),
    reason: z.string().trim().max(1000, "Reason: keep it under 1000 characters."),
    readings: z.array(z.string().max(60)).max(60),
    // Part lines only: unit cost in the shop currency and markup in percent.
    unitCost: z.string().trim().max(12),
    markupPercent: z.string().trim().max(8),
    covered: z.boolean(),
    /** A part line priced from the shop's catalogue names its part (stock, history); a part of its own has none. */
    partId: z.uuid("Part: choose a part from the catalogue.").optional(),
  })
  .superRefine((line, ctx) => {
    if (line.kind !== "part") return;
    if (!/^\d+(\.\d{1,3})?$/.test(line.unitCost)) {
      ctx.addIssue({
        code: "custom",
        path: ["unitCost"],
        message: "Cost: enter an amount of 0 or more, digits with an optional decimal point, e.g. 4.50.",
      });
    }
    if (line.markupPercent !== "" && !/^\d{1,4}(\.\d{1,2})?$/.test(line.markupPercent)) {
      ctx.addIssue({
        code: "custom",
        path: ["markupPercent"],
        message: "Markup: enter a percentage from 0 to 9999, e.g. 35, or leave it empty for the usual.",
      });
    }
  });

export type DraftLine = z.infer<typeof draftLineSchema>;
export type DraftLineInput = z.input<typeof draftLineSchema>;

export const draftSchema = z.object({
  lines: z
    .array(draftLineSchema)
    .max(200, "Lines: an estimate has at most 200.")
    .superRefine((lines, ctx) => {
      const seen = new Set<string>();
      lines.forEach((l, i) => {
        if (seen.has(l.code)) ctx.addIssue({ code: "custom", path: [i, "code"], message: "Code: each line needs its own code." });
        seen.add(l.code);
      });
    }),
});
export type Draft = z.infer<typeof draftSchema>;

export const saveEstimateSchema = draftSchema.extend({
  // The version the editor started from; a stale one is refused with 409.
  version: z
    .number()
    .int()
    .min(0)
    .max(2 ** 31 - 1),
});
export type SaveEstimateInput = z.infer<typeof saveEstimateSchema>;

export const sendEstimateSchema = z.object({
  version: z
    .number()
    .int()
    .min(1, "Save the estimate before sending it.")
    .max(2 ** 31 - 1),
  changeSummary: z.string().trim().max(1000, "What changed: keep it under 1000 characters.").optional(),
});
export type SendEstimateInput = z.infer<typeof sendEstimateSchema>;

export const rebuildEstimateSchema = z.object({
  version: z
    .number()
    .int()
    .min(0)
    .max(2 ** 31 - 1),
});

/** "$1,234.56" from minor units; used on the bench, in e-mails and on the portal. */
export function moneyText(amountMinor: number, currency: string, exponent: number): string {
  const value = amountMinor / 10 ** exponent;
  try {
    return new Intl.NumberFormat("en-US", {
      style: "currency",
      currency,
      minimumFractionDigits: exponent,
      maximumFractionDigits: exponent,
    }).format(value);
  } catch {
    return `${value.toFixed(exponent)} ${currency}`;
  }
}

// ---- The draft in the engine's terms (pure: the builder prices live in the browser with the same code) ----

export function markupBpOf(line: DraftLine): number | undefined {
  if (line.markupPercent === "") return undefined;
  return Math.round(Number(line.markupPercent) * 100);
}

/** The line's own markup, else the shop's default (the builder fills in a catalogue part's own markup). */
export function effectiveMarkupBp(line: DraftLine, policy: ShopPolicy): number {
  return markupBpOf(line) ?? policy.parts.defaultMarkupBp;
}

export function partCodeOf(line: DraftLine): string {
  const bare = line.code.replace(/^part\./, "").replace(/\.\d+$/, "");
  return partCodeSchema.safeParse(bare).success ? bare : line.code;
}

/** Draft lines in the engine's terms: a part line is a zero-minute line carrying one part. */
export function draftToEngineLines(lines: readonly DraftLine[], policy: ShopPolicy): EstimateLineInput[] {
  return lines.map((line, i): EstimateLineInput => {
    if (line.kind === "labour") {
      return { code: line.code, title: line.title, minutes: line.minutes, quantity: line.quantity, covered: line.covered };
    }
    return {
      code: line.code,
      title: line.title,
      minutes: 0,
      quantity: 1,
      covered: line.covered,
      parts: [
        {
          code: partCodeOf(line),
          title: line.title,
          quantity: line.quantity,
          unitCostMinor: toMinor(line.unitCost, policy.currency.exponent, `lines.${i}.unitCost`),
          markupBp: markupBpOf(line),
        },
      ],
    };
  });
}

function engineFieldToDraftField(field: string | undefined): string {
  if (!field) return "_";
  const m = /^lines\.(\d+)\.parts\.0\.(unitCostMinor|quantity|markupBp)$/.exec(field);
  if (m) return `lines.${m[1]}.${m[2] === "unitCostMinor" ? "unitCost" : m[2] === "quantity" ? "quantity" : "markupPercent"}`;
  return field;
}

export type DraftPricing = { ok: true; priced: PricedEstimate } | { ok: false; message: string; fields: Record<string, string> };

export function tryPriceDraft(lines: readonly DraftLine[], policy: ShopPolicy): DraftPricing {
  try {
    return { ok: true, priced: priceEstimate(draftToEngineLines(lines, policy), policy) };
  } catch (e) {
    if (e instanceof EngineError) return { ok: false, message: e.message, fields: { [engineFieldToDraftField(e.field)]: e.message } };
    throw e;
  }
}
