// A static answer with no session or database work: the baseline the benchmarks compare against.
export const dynamic = "force-static";

export function GET() {
  return Response.json({ ok: true, service: "bandedge" });
}
