import type { Metadata } from "next";
import { redirect } from "next/navigation";

export const metadata: Metadata = { title: "Check a certificate", robots: { index: false, follow: false } };

export default async function VerifyLookupPage({ searchParams }: { searchParams: Promise<{ code?: string }> }) {
  const { code } = await searchParams;
  if (code && code.trim()) redirect(`/verify/${encodeURIComponent(code.trim().toUpperCase())}`);
  return (
    <div className="mx-auto max-w-md space-y-4">
      <h1 className="text-3xl font-bold">Check a warranty certificate</h1>
      <p className="text-bakelite-soft">Enter the code printed on the certificate, or scan its QR code.</p>
      <form action="/verify" className="card space-y-3 p-5">
        <label htmlFor="code" className="field-label">
          Certificate code
        </label>
        <input id="code" name="code" className="field-input figure" autoComplete="off" required />
        <button type="submit" className="btn-primary">
          Check
        </button>
      </form>
    </div>
  );
}
