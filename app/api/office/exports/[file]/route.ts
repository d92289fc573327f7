import { AppError } from "@/lib/server/errors";
import { route } from "@/lib/server/route-handler";
import { exportCsv } from "@/lib/server/services/exports";
import { EXPORT_FILES, exportRangeSchema, type ExportFile } from "@/lib/validation/exports";
import { zodFields } from "@/lib/server/route-handler";

// GET /api/office/exports/{payments,jobs,tax,audit}.csv?from=YYYY-MM-DD&to=YYYY-MM-DD — the shop owner only.
export const GET = route<{ file: string }>({ permission: "exports.download", hideFromVisitors: true }, async ({ request, params }) => {
  if (!(EXPORT_FILES as readonly string[]).includes(params.file)) throw new AppError("not_found", "Not found.");
  const file = params.file as ExportFile;
  const q = new URL(request.url).searchParams;
  const parsed = exportRangeSchema.safeParse({ from: q.get("from") ?? "", to: q.get("to") ?? "" });
  if (!parsed.success) throw new AppError("invalid_input", "Some fields need attention.", zodFields(parsed.error));
  const csv = await exportCsv(file, parsed.data);
  const name = `${file.replace(/\.csv$/, "")}-${parsed.data.from}-to-${parsed.data.to}.csv`;
  return new Response(csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${name}"`,
      "cache-control": "no-store",
    },
  });
});
