// Before and after of one audit row, key by key, as text (React escapes it; stored text never becomes markup).
function show(value: unknown): string {
  if (value === undefined) return "—";
  if (typeof value === "string") return value;
  return JSON.stringify(value, null, 1);
}

export function AuditChange({ before, after }: { before: Record<string, unknown> | null; after: Record<string, unknown> | null }) {
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])];
  if (keys.length === 0) return <span className="text-bakelite-muted">No details recorded.</span>;
  return (
    <dl className="grid grid-cols-[minmax(8rem,auto)_1fr] gap-x-3 gap-y-1 text-xs">
      {keys.map((k) => {
        const b = before ? before[k] : undefined;
        const a = after ? after[k] : undefined;
        return (
          <div key={k} className="contents">
            <dt className="figure break-all text-bakelite-soft">{k}</dt>
            <dd className="min-w-0">
              {before && k in before ? (
                <>
                  <span className="sr-only">before: </span>
                  <span className="figure whitespace-pre-wrap break-words line-through decoration-bakelite-muted">{show(b)}</span>
                  <span aria-hidden="true"> → </span>
                  <span className="sr-only">, after: </span>
                </>
              ) : null}
              <span className="figure whitespace-pre-wrap break-words">{after && k in after ? show(a) : "(removed)"}</span>
            </dd>
          </div>
        );
      })}
    </dl>
  );
}
