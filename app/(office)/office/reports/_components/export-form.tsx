"use client";

// Parses with zod in the browser: its settings (no eval, field words) first.
import "@/lib/client/zod-setup";

import { useState } from "react";
import { describedBy, Field } from "@/components/ui/field";
import { EXPORT_FILES, exportRangeSchema, type ExportFile } from "@/lib/validation/exports";

const TITLES: Record<ExportFile, string> = {
  "payments.csv": "Payments and refunds",
  "jobs.csv": "Jobs",
  "tax.csv": "Tax by month",
  "audit.csv": "Audit log",
};

// The accountant's files: a range of days, then one download per file (CSV, UTF-8).
export function ExportForm({ defaultFrom, defaultTo }: { defaultFrom: string; defaultTo: string }) {
  const [from, setFrom] = useState(defaultFrom);
  const [to, setTo] = useState(defaultTo);
  const [errors, setErrors] = useState<{ from?: string; to?: string }>({});
  // The links carry the range; a range the server would refuse is stopped here with the field named.
  const check = (e: React.MouseEvent) => {
    const parsed = exportRangeSchema.safeParse({ from, to });
    if (parsed.success) return setErrors({});
    e.preventDefault();
    const next: { from?: string; to?: string } = {};
    for (const issue of parsed.error.issues) {
      const key = issue.path[0] === "from" ? "from" : "to";
      next[key] ??= issue.message;
    }
    setErrors(next);
  };
  const href = (file: ExportFile) => `/api/office/exports/${file}?${new URLSearchParams({ from, to })}`;
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap gap-3">
        <Field id="export-from" label="From (first day)" error={errors.from}>
          <input
            id="export-from"
            type="date"
            className="field-input"
            value={from}
            onChange={(e) => setFrom(e.target.value)}
            aria-invalid={!!errors.from}
            aria-describedby={describedBy("export-from", { error: errors.from })}
          />
        </Field>
        <Field id="export-to" label="To (last day)" error={errors.to}>
          <input
            id="export-to"
            type="date"
            className="field-input"
            value={to}
            onChange={(e) => setTo(e.target.value)}
            aria-invalid={!!errors.to}
            aria-describedby={describedBy("export-to", { error: errors.to })}
          />
        </Field>
      </div>
      <ul className="flex flex-wrap gap-2">
        {EXPORT_FILES.map((file) => (
          <li key={file}>
            <a className="btn-secondary inline-block no-underline" href={href(file)} download onClick={check}>
              {TITLES[file]} (CSV)
            </a>
          </li>
        ))}
      </ul>
    </div>
  );
}
