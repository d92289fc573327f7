import { fieldValue, fieldWord } from "./audit-sentence";
import type { Currency } from "./format";

// Before and after of one audit row, field by field, as text (React escapes it; stored text never becomes markup).
export function AuditChange({
  before,
  after,
  currency,
}: {
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
  currency: Currency;
}) {
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])];
  if (keys.length === 0) return <span className="text-bakelite-muted">No details recorded.</span>;
  return (
    <dl className="grid grid-cols-[minmax(7rem,auto)_1fr] gap-x-3 gap-y-1 text-xs">
      {keys.map((k) => {
        const b = before ? before[k] : undefined;
        const a = after ? after[k] : undefined;
        return (
          <div key={k} className="contents">
            <dt className="break-words text-bakelite-soft">{fieldWord(k)}</dt>
            <dd className="min-w-0">
              {before && k in before ? (
                <>
                  <span className="sr-only">before: </span>
                  <span className="figure whitespace-pre-wrap break-words line-through decoration-bakelite-muted">
                    {fieldValue(k, b, currency)}
                  </span>
                  <span aria-hidden="true"> → </span>
                  <span className="sr-only">, after: </span>
                </>
              ) : null}
              <span className="figure whitespace-pre-wrap break-words">
                {after && k in after ? fieldValue(k, a, currency) : "(removed)"}
              </span>
            </dd>
          </div>
        );
      })}
    </dl>
  );
}
