import "server-only";
import Papa from "papaparse";
import { auditExportRows, jobExportRows, paymentExportRows, taxExportRows } from "@/db/queries/exports";
import { jobNumber } from "@/lib/engine/jobs/states";
import type { ExportFile, ExportRange } from "@/lib/validation/exports";

/** 12345 minor units with exponent 2 → "123.45"; exponent 0 → "12345". Exact: no floating point. */
export function decimalAmount(minor: number, exponent: number): string {
  const sign = minor < 0 ? "-" : "";
  const digits = String(Math.abs(Math.trunc(minor))).padStart(exponent + 1, "0");
  if (exponent === 0) return sign + digits;
  return `${sign}${digits.slice(0, -exponent)}.${digits.slice(-exponent)}`;
}

function iso(at: Date | string | null): string {
  return at ? new Date(at).toISOString() : "";
}

/** The range's days as instants: from the start of `from` to the start of the day after `to` (UTC days). */
function bounds(range: ExportRange): { start: Date; end: Date } {
  const end = new Date(`${range.to}T00:00:00Z`);
  end.setUTCDate(end.getUTCDate() + 1);
  return { start: new Date(`${range.from}T00:00:00Z`), end };
}

async function table(file: ExportFile, range: ExportRange): Promise<{ fields: string[]; data: unknown[][] }> {
  const { start, end } = bounds(range);
  switch (file) {
    case "payments.csv": {
      const rows = await paymentExportRows(start, end);
      return {
        fields: [
          "kind",
          "date_utc",
          "job",
          "customer",
          "customer_email",
          "purpose",
          "status",
          "amount",
          "currency",
          "reference",
          "refund_reason",
          "method",
          "document",
          "refund_kind",
        ],
        data: rows.map((r) => [
          r.kind,
          iso(r.at),
          jobNumber(r.job_number),
          r.customer_name,
          r.customer_email,
          r.purpose,
          r.status,
          decimalAmount(r.amount_minor, r.exponent),
          r.currency,
          r.reference ?? "",
          r.reason ?? "",
          r.method ?? "",
          r.document ?? "",
          r.refund_kind ?? "",
        ]),
      };
    }
    case "jobs.csv": {
      const rows = await jobExportRows(start, end);
      return {
        fields: [
          "job",
          "opened_utc",
          "state",
          "warranty",
          "customer",
          "customer_email",
          "maker",
          "model",
          "year",
          "technician",
          "approved_total",
          "currency",
          "returned_utc",
        ],
        data: rows.map((r) => [
          jobNumber(r.number),
          iso(r.created_at),
          r.state,
          r.is_warranty ? "yes" : "no",
          r.customer_name,
          r.customer_email,
          r.maker,
          r.model,
          r.year ?? "",
          r.technician_name ?? "",
          r.approved_total_minor === null ? "" : decimalAmount(r.approved_total_minor, r.exponent ?? 2),
          r.currency ?? "",
          iso(r.returned_at),
        ]),
      };
    }
    case "tax.csv": {
      const rows = await taxExportRows(start, end);
      return {
        fields: ["month", "currency", "jobs_paid_in_full", "labour_tax", "parts_tax", "total_tax"],
        data: rows.map((r) => [
          r.month,
          r.currency,
          r.jobs,
          decimalAmount(r.labour_tax_minor, r.exponent),
          decimalAmount(r.parts_tax_minor, r.exponent),
          decimalAmount(r.labour_tax_minor + r.parts_tax_minor, r.exponent),
        ]),
      };
    }
    case "audit.csv": {
      const rows = await auditExportRows(start, end);
      return {
        fields: ["at_utc", "actor", "actor_email", "action", "entity", "entity_id", "before", "after"],
        data: rows.map((r) => [
          iso(r.at),
          r.actor_name ?? "system",
          r.actor_email ?? "",
          r.action,
          r.entity,
          r.entity_id,
          r.before === null ? "" : JSON.stringify(r.before),
          r.after === null ? "" : JSON.stringify(r.after),
        ]),
      };
    }
  }
}

/**
 * One export as CSV text (RFC 4180 quoting by the CSV library). Cells a spreadsheet would run as a formula
 * (starting with =, +, -, @) are escaped, since names and reasons are typed by customers.
 */
export async function exportCsv(file: ExportFile, range: ExportRange): Promise<string> {
  const { fields, data } = await table(file, range);
  return Papa.unparse({ fields, data }, { escapeFormulae: true, newline: "\r\n" });
}
