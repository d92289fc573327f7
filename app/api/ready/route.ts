import { databaseReachable } from "@/db";
import { DATABASE_RETRY_AFTER_SECONDS } from "@/lib/server/errors";
import { json } from "@/lib/server/route-handler";

// Readiness, beside the liveness answer of /api/health: this instance can serve only while PostgreSQL
// answers, so a load balancer should send it traffic only on 200.
export const dynamic = "force-dynamic";

export async function GET() {
  if (await databaseReachable()) return json({ ok: true, database: "reachable" });
  return json(
    { ok: false, database: "unreachable", error: { code: "unavailable", message: "The database is not answering." } },
    { status: 503, headers: { "retry-after": String(DATABASE_RETRY_AFTER_SECONDS) } },
  );
}
