import type { CertificateStatus } from "@/lib/engine/certificates/document";

export const CERTIFICATE_STATUS_LABEL: Record<CertificateStatus, { label: string; icon: string; tone: string }> = {
  valid: { label: "Valid", icon: "✓", tone: "border-pass text-pass" },
  expired: { label: "Expired", icon: "⌛", tone: "border-bakelite-muted text-bakelite-soft" },
  revoked: { label: "Revoked", icon: "✕", tone: "border-fail text-fail" },
  superseded: { label: "Superseded", icon: "↻", tone: "border-brass text-brass" },
  unverifiable: { label: "Cannot be verified", icon: "⚠", tone: "border-fail text-fail" },
};

/** Status in words and an icon, never colour alone. */
export function CertificateStatusBadge({ status }: { status: CertificateStatus }) {
  const s = CERTIFICATE_STATUS_LABEL[status];
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border bg-white px-2 py-0.5 text-xs font-semibold ${s.tone}`}
    >
      <span aria-hidden="true">{s.icon}</span>
      {s.label}
    </span>
  );
}
