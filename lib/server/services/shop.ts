import "server-only";
import { eq } from "drizzle-orm";
import { db, type Database } from "@/db";
import { shopSettings } from "@/db/schema";
import { defaultShopPolicy, shopPolicySchema, type ShopPolicy } from "@/lib/engine/shop-policy";

export type Shop = {
  name: string;
  addressLines: string[];
  phone: string;
  email: string;
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
    policy: parsed.success ? parsed.data : defaultShopPolicy,
    version: row.version,
    warrantyTerms: row.warrantyTerms,
  };
}
