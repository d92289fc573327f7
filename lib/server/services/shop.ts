import "server-only";
import { cache } from "react";
import { eq } from "drizzle-orm";
import { db, type Database } from "@/db";
import { shopSettings } from "@/db/schema";
import { canonicalTimeZone, DEFAULT_SHOP_TIME_ZONE } from "@/lib/engine/dates";
import { defaultShopPolicy, shopPolicySchema, type ShopPolicy } from "@/lib/engine/shop-policy";

export type Shop = {
  name: string;
  addressLines: string[];
  phone: string;
  email: string;
  /** Sales-tax or VAT registration; printed on receipts and invoices only when set. */
  taxNumber: string;
  /** IANA zone in which every date and time is shown. */
  timeZone: string;
  policy: ShopPolicy;
  version: number;
  warrantyTerms: Record<string, unknown>;
};

// The shop's identity and policy as stored; a damaged policy falls back to the defaults field by field.
export async function getShop(tx: Database = db): Promise<Shop> {
  const [row] = await tx.select().from(shopSettings).where(eq(shopSettings.id, "shop")).limit(1);
  if (!row)
    return {
      name: "Kestrel Lane Wireless",
      addressLines: [],
      phone: "",
      email: "",
      taxNumber: "",
      timeZone: DEFAULT_SHOP_TIME_ZONE,
      policy: defaultShopPolicy,
      version: 0,
      warrantyTerms: {},
    };
  const parsed = shopPolicySchema.safeParse({ ...defaultShopPolicy, ...row.policy });
  return {
    name: row.name,
    addressLines: row.addressLines,
    phone: row.phone,
    email: row.email,
    taxNumber: row.taxNumber,
    timeZone: canonicalTimeZone(row.timeZone) ?? DEFAULT_SHOP_TIME_ZONE,
    policy: parsed.success ? parsed.data : defaultShopPolicy,
    version: row.version,
    warrantyTerms: row.warrantyTerms,
  };
}

/** The shop's time zone (inside a transaction, pass its handle). */
export async function readShopTimeZone(tx: Database = db): Promise<string> {
  const [row] = await tx.select({ timeZone: shopSettings.timeZone }).from(shopSettings).where(eq(shopSettings.id, "shop")).limit(1);
  return (row && canonicalTimeZone(row.timeZone)) ?? DEFAULT_SHOP_TIME_ZONE;
}

/** The shop's time zone, read once per request however many dates a page prints. */
export const shopTimeZone = cache(() => readShopTimeZone());
