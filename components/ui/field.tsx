import type { ReactNode } from "react";

// Label, control, hint and error wired together so screen readers announce the error with the field.
export function Field({
  id,
  label,
  error,
  hint,
  className = "",
  children,
}: {
  id: string;
  className?: string;
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
  children: ReactNode;
}) {
  return (
    <div className={`space-y-0.5 ${className}`}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      {children}
      {hint ? (
        <p id={`${id}-hint`} className="field-hint">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export function describedBy(id: string, { error, hint }: { error?: unknown; hint?: unknown }): string | undefined {
  const ids = [hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean);
  return ids.length ? ids.join(" ") : undefined;
}
