import type { Verdict } from "@/lib/engine/verdicts";

const LOOK: Record<Verdict | "invalid", { icon: string; word: string; cls: string }> = {
  pass: { icon: "✓", word: "Pass", cls: "border-pass text-pass bg-pass-light" },
  fail: { icon: "✕", word: "Fail", cls: "border-fail text-fail bg-fail-light" },
  missing: { icon: "○", word: "Not recorded", cls: "border-bakelite-soft text-bakelite-muted bg-white" },
  recorded: { icon: "•", word: "Recorded", cls: "border-bakelite-soft text-bakelite bg-white" },
  invalid: { icon: "!", word: "Not a reading", cls: "border-fail text-fail bg-white" },
};

// A verdict in words and an icon, never colour alone.
export function VerdictBadge({ verdict, id }: { verdict: Verdict | "invalid"; id?: string }) {
  const l = LOOK[verdict];
  return (
    <span
      id={id}
      data-verdict={verdict}
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded border px-1.5 py-0.5 text-xs font-semibold ${l.cls}`}
    >
      <span aria-hidden="true">{l.icon}</span>
      {l.word}
    </span>
  );
}
