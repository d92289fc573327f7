import { listAssignableStaff } from "@/db/queries/bench";
import { route } from "@/lib/server/route-handler";

// GET /api/bench/staff: who a job can be assigned to.
export const GET = route({ permission: "bench.use" }, async () => ({ staff: await listAssignableStaff() }));
