import type { ReactNode } from "react";

const TONES = {
  info: { box: "border-brass bg-brass-light", icon: "ℹ", label: "Note" },
  caution: { box: "border-ember bg-ember-light", icon: "⚠", label: "Caution" },
  success: { box: "border-pass bg-pass-light", icon: "✓", label: "Done" },
  error: { box: "border-fail bg-fail-light", icon: "✕", label: "Problem" },
} as const;

export function Notice({
  tone = "info",
  title,
  children,
  live,
}: {
  tone?: keyof typeof TONES;
  title?: string;
  children: ReactNode;
  live?: boolean;
}) {
  const t = TONES[tone];
  return (
    <div className={`rounded-card border-l-4 px-4 py-3 text-sm ${t.box}`} role={live ? (tone === "error" ? "alert" : "status") : undefined}>
      <p className="font-semibold">
        <span aria-hidden="true">{t.icon} </span>
        {title ?? t.label}
      </p>
      <div className="mt-1 space-y-1">{children}</div>
    </div>
  );
}
