// The certificate PDF renders in worker threads (lib/server/pdf/render-pool.ts), and a worker needs a real
// JavaScript file at run time. `next build` bundles route code into its own chunks, so the worker entry is
// bundled here with esbuild instead: next.config.mjs calls this after Next's compile step (and once when
// the dev server starts), writing into the build's own dist dir. Packages stay external and load from
// node_modules, so the worker runs the very same @react-pdf/renderer, react and qrcode as the app.
//   node scripts/build-pdf-worker.mjs [distDir]   builds it by hand (default: NEXT_DIST_DIR or .next).
import { dirname, isAbsolute, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "..");

/** Where the worker lands, relative to the project root (the app resolves it from process.cwd()). */
export function pdfWorkerFile(distDir) {
  return join(distDir, "pdf-worker", "certificate-worker.mjs");
}

export async function buildPdfWorker({ projectDir = ROOT, distDir }) {
  const { build } = await import("esbuild");
  const outfile = isAbsolute(distDir) ? pdfWorkerFile(distDir) : join(projectDir, pdfWorkerFile(distDir));
  await build({
    absWorkingDir: projectDir,
    entryPoints: [join(projectDir, "lib", "server", "pdf", "certificate-worker.ts")],
    outfile,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    packages: "external",
    // The worker is server code by construction; the marker package only guards the browser bundle.
    alias: { "server-only": "./node_modules/server-only/empty.js" },
    jsx: "automatic",
    tsconfig: join(projectDir, "tsconfig.json"),
    sourcemap: "linked",
    logLevel: "warning",
  });
  return outfile;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const distDir = process.argv[2] ?? process.env.NEXT_DIST_DIR ?? ".next";
  buildPdfWorker({ distDir })
    .then((file) => process.stdout.write(`PDF worker written to ${file}\n`))
    .catch((e) => {
      console.error(e);
      process.exit(1);
    });
}
