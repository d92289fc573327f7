import { PHASE_DEVELOPMENT_SERVER } from "next/constants.js";
import { buildPdfWorker, pdfWorkerFile } from "./scripts/build-pdf-worker.mjs";

const distDir = process.env.NEXT_DIST_DIR || ".next";

// The Content Security Policy is set per request in proxy.ts: it carries a fresh nonce each time.
const securityHeaders = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  distDir,
  poweredByHeader: false,
  productionBrowserSourceMaps: false,
  reactStrictMode: true,
  serverExternalPackages: ["pg-boss", "@node-rs/argon2", "sharp", "piscina"],
  // Certificate PDFs render in worker threads from a bundle of their own (scripts/build-pdf-worker.mjs),
  // written into the dist dir after Next's compile step; the app finds it through this build-time value.
  env: { BANDEDGE_PDF_WORKER: pdfWorkerFile(distDir) },
  compiler: {
    runAfterProductionCompile: async ({ projectDir, distDir: outDir }) => {
      await buildPdfWorker({ projectDir, distDir: outDir });
    },
  },
  async headers() {
    return [
      { source: "/:path*", headers: securityHeaders },
      { source: "/(portal|bench|office|api)/:path*", headers: [{ key: "Cache-Control", value: "no-store" }] },
    ];
  },
};

export default async function config(phase) {
  // `next dev` has no production compile step; the worker is bundled once as the dev server starts.
  if (phase === PHASE_DEVELOPMENT_SERVER) await buildPdfWorker({ distDir });
  return nextConfig;
}
