import type { TxContext } from "@/db/transaction";

// Demo jobs in every state; filled in once the estimate and bench flows exist.
export async function seedDemoJobs(_ctx: TxContext): Promise<number> {
  return 0;
}
