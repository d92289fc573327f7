"use server";

import { revalidatePath } from "next/cache";
import { action } from "@/lib/server/server-action";
import { setBenchWeek } from "@/lib/server/services/turnaround";
import { benchWeekSchema } from "@/lib/validation/bench-week";

export const saveBenchWeek = action("staff.manage", benchWeekSchema, async (input, viewer) => {
  const result = await setBenchWeek({ input, actorId: viewer.id });
  revalidatePath("/office/staff");
  revalidatePath("/office");
  return result;
});
