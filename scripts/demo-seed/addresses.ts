import { eq } from "drizzle-orm";
import { ownerAddresses } from "@/db/schema";
import type { TxContext } from "@/db/transaction";
import { addAddress } from "@/lib/server/services/owner-account";
import { addressSchema, type AddressInput } from "@/lib/validation/owner-account";

// The demo set owners' address books (invented streets; postal codes only of the right form for each
// country). A shipped demo job goes back to its owner's default address, which the job keeps a copy of.
const BOOKS: Record<string, Partial<AddressInput>[]> = {
  "demo-cust-mira": [
    {
      recipient: "Mira Holloway",
      line1: "22 Tidewater Row",
      city: "Port Alder",
      region: "ME",
      postalCode: "04101",
      country: "US",
      isDefault: true,
    },
    { recipient: "Mira Holloway", line1: "Unit 4, 9 Mill Street", city: "Bangor", region: "ME", postalCode: "04401", country: "US" },
  ],
  "demo-cust-jonah": [
    {
      recipient: "Jonah Pell",
      line1: "318 Harbourview Road",
      city: "Halifax",
      region: "NS",
      postalCode: "B3H 1A1",
      country: "CA",
      isDefault: true,
    },
  ],
  "demo-cust-ines": [
    { recipient: "Ines Varga", line1: "Lindenweg 7", city: "Freiburg", postalCode: "79098", country: "DE", isDefault: true },
  ],
  "demo-cust-walt": [
    {
      recipient: "Estate of W. Brennan",
      line1: "Flat 2, 41 Quay Street",
      city: "Bristol",
      postalCode: "BS1 4DJ",
      country: "GB",
      isDefault: true,
    },
  ],
};

export async function seedDemoAddresses(ctx: TxContext): Promise<number> {
  let added = 0;
  for (const [ownerId, book] of Object.entries(BOOKS)) {
    const [any] = await ctx.tx.select({ id: ownerAddresses.id }).from(ownerAddresses).where(eq(ownerAddresses.ownerId, ownerId)).limit(1);
    if (any) continue;
    for (const input of book) {
      await addAddress(ctx, { ownerId, input: addressSchema.parse(input) });
      added++;
    }
  }
  return added;
}
