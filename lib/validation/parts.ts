import { z } from "@/lib/engine/zod";
import "./field-words";

// The parts catalogue: the office form and the office JSON routes share these. Money is typed as a decimal
// string in the shop currency ("4.50") and converted to minor units on the server with the currency's places.

const MAX_MARKUP_PERCENT = 1000;
const MAX_STOCK = 100_000;

const costText = z
  .string({ error: "Cost: enter an amount of 0 or more, digits with an optional decimal point, e.g. 4.50." })
  .trim()
  .regex(/^\d{1,8}(\.\d{1,3})?$/, "Cost: enter an amount of 0 or more, digits with an optional decimal point, e.g. 4.50.");

const markupText = z
  .string({ error: `Markup: enter a percentage from 0 to ${MAX_MARKUP_PERCENT}, e.g. 35, or leave it empty for the default.` })
  .trim()
  .refine(
    (s) => s === "" || (/^\d{1,4}(\.\d{1,2})?$/.test(s) && Number(s) <= MAX_MARKUP_PERCENT),
    `Markup: enter a percentage from 0 to ${MAX_MARKUP_PERCENT}, e.g. 35, or leave it empty for the default.`,
  );

const stockText = z
  .string({ error: `In stock: enter a whole number from 0 to ${MAX_STOCK}, or leave it empty if the shop does not count this part.` })
  .trim()
  .refine(
    (s) => s === "" || (/^\d{1,6}$/.test(s) && Number(s) <= MAX_STOCK),
    `In stock: enter a whole number from 0 to ${MAX_STOCK}, or leave it empty if the shop does not count this part.`,
  );

export const partFormSchema = z.object({
  name: z
    .string({ error: "Name: give the part the name printed on the estimate." })
    .trim()
    .min(1, "Name: give the part the name printed on the estimate.")
    .max(120, "Name: keep it under 120 characters."),
  supplierRef: z
    .string({ error: "Supplier reference: text, or leave it empty." })
    .trim()
    .max(80, "Supplier reference: keep it under 80 characters."),
  cost: costText,
  markupPercent: markupText,
  stock: stockText,
});
export type PartFormValues = z.infer<typeof partFormSchema>;
export type PartFormInput = z.input<typeof partFormSchema>;

/** An edit: any of the form's fields, and/or the retired flag (retire, or return to the catalogue). */
export const partUpdateSchema = partFormSchema
  .partial()
  .extend({ retired: z.boolean({ error: "Retired: true or false." }).optional() })
  .refine((v) => Object.values(v).some((x) => x !== undefined), {
    path: ["name"],
    message: "Say what changes: a name, supplier reference, cost, markup, stock count, or retired.",
  });
export type PartUpdate = z.infer<typeof partUpdateSchema>;

export const PART_SEARCH_LIMIT = 20;

export const partSearchSchema = z.object({
  q: z.string().trim().max(80, "Search: keep it under 80 characters.").default(""),
  limit: z.coerce
    .number({ error: `Limit: a whole number from 1 to ${PART_SEARCH_LIMIT}.` })
    .int(`Limit: a whole number from 1 to ${PART_SEARCH_LIMIT}.`)
    .min(1, `Limit: a whole number from 1 to ${PART_SEARCH_LIMIT}.`)
    .max(PART_SEARCH_LIMIT, `Limit: a whole number from 1 to ${PART_SEARCH_LIMIT}.`)
    .default(8),
});

/** Percent text ("35", "12.5") to basis points without floating point. */
export function percentToBp(text: string): number {
  const [whole, frac = ""] = text.trim().split(".");
  return Number(whole) * 100 + Number(frac.padEnd(2, "0"));
}
