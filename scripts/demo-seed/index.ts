import { sql } from "drizzle-orm";
import { account, benchWeeks, shopSettings, user } from "@/db/schema";
import { transaction } from "@/db/transaction";
import { hashPassword } from "@/lib/server/password";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";
import { seedDemoAddresses } from "./addresses";
import { seedCounterJob } from "./counter";
import { seedDemoJobs } from "./jobs";
import { seedDemoRefund } from "./refunds";
import { DEMO_SHOP, DEMO_USERS } from "./users";

export async function seedDemo(): Promise<string> {
  const hashes = new Map<string, string>();
  for (const u of DEMO_USERS) if (!hashes.has(u.password)) hashes.set(u.password, await hashPassword(u.password));

  return transaction(async (ctx) => {
    // One seed at a time, even if two starts race.
    await ctx.tx.execute(sql`select pg_advisory_xact_lock(724021)`);
    let createdUsers = 0;
    for (const u of DEMO_USERS) {
      const inserted = await ctx.tx
        .insert(user)
        .values({ id: u.id, name: u.name, email: u.email, emailVerified: true, role: u.role })
        .onConflictDoNothing()
        .returning({ id: user.id });
      if (inserted.length) {
        createdUsers++;
        await ctx.tx
          .insert(account)
          .values({ id: `${u.id}-credential`, accountId: u.id, providerId: "credential", userId: u.id, password: hashes.get(u.password)! })
          .onConflictDoNothing();
      }
    }
    await ctx.tx
      .insert(shopSettings)
      .values({ id: "shop", ...DEMO_SHOP, policy: defaultShopPolicy as unknown as Record<string, unknown> })
      .onConflictDoNothing();
    // The workshop opens Tuesday to Saturday: Tomas at the bench six hours a day, Priya five; both off on Christmas Day and New Year's Day.
    await ctx.tx
      .insert(benchWeeks)
      .values([
        { userId: "demo-tech-tomas", minutes: [0, 360, 360, 360, 360, 360, 0], daysOff: ["2026-12-25", "2027-01-01"] },
        { userId: "demo-tech-priya", minutes: [0, 300, 300, 300, 300, 300, 0], daysOff: ["2026-12-25", "2027-01-01"] },
      ])
      .onConflictDoNothing();
    await seedDemoAddresses(ctx);
    const jobs = (await seedDemoJobs(ctx)) + (await seedCounterJob(ctx));
    const refunds = await seedDemoRefund(ctx);
    return `${createdUsers} users created, ${jobs} jobs created, ${refunds} refunds recorded`;
  });
}
