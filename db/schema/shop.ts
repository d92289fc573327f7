import { integer, jsonb, pgTable, text, timestamp } from "drizzle-orm/pg-core";
import { DEFAULT_SHOP_TIME_ZONE } from "@/lib/engine/dates";
import { user } from "./auth";

// One row per shop (id "shop"); policy holds every figure the engine reads.
export const shopSettings = pgTable("shop_settings", {
  id: text("id").primaryKey().default("shop"),
  name: text("name").notNull(),
  addressLines: jsonb("address_lines").$type<string[]>().notNull().default([]),
  phone: text("phone").notNull().default(""),
  email: text("email").notNull().default(""),
  /** The shop's sales-tax or VAT registration, printed on receipts and invoices when set. */
  taxNumber: text("tax_number").notNull().default(""),
  /** IANA zone name; every date and time shown to a person is in this zone. */
  timeZone: text("time_zone").notNull().default(DEFAULT_SHOP_TIME_ZONE),
  policy: jsonb("policy").$type<Record<string, unknown>>().notNull(),
  warrantyTerms: jsonb("warranty_terms").$type<Record<string, unknown>>().notNull().default({}),
  version: integer("version").notNull().default(1),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  updatedBy: text("updated_by").references(() => user.id),
});

export type ShopSettingsRow = typeof shopSettings.$inferSelect;
