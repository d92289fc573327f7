#!/usr/bin/env node
// npm test: a throwaway PostgreSQL cluster on a free loopback port, the built app and its stand-ins,
// then unit, integration and browser tests. Ends with one line: "N passed, N failed".
//   npm test -- FILES…     run only those test files;  --skip-build  reuse the last test build;
//   --skip-lint  leave out the lint step (it runs first on every full run and counts as one check).
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { bootScratchStack } from "./lib/scratch-stack.mjs";
import { bin, log, ROOT } from "./lib/stack.mjs";

const only = process.argv.slice(2).filter((a) => !a.startsWith("--"));
const skipBuild = process.argv.includes("--skip-build");
const skipLint = process.argv.includes("--skip-lint") || only.length > 0;
let stack;

process.on("SIGINT", () => {
  stack?.stop();
  process.exit(130);
});

/** ESLint (with the layer rules) and Prettier; any finding fails the run. */
function lint() {
  log("Linting (ESLint, Prettier)…");
  const r = spawnSync("npm", ["run", "--silent", "lint"], { cwd: ROOT, stdio: "inherit", env: process.env });
  return r.status === 0;
}

async function main() {
  // Lint needs the dependencies the stack installs; a clean tree lints in well under a minute.
  let lintOk = null;
  stack = await bootScratchStack({ distDir: process.env.BANDEDGE_TEST_DIST ?? ".next-test", build: !skipBuild, chromium: true });
  if (!skipLint) lintOk = lint();
  const report = join(stack.scratch, "vitest.json");
  const args = ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${report}`, ...only];
  // Vitest orders files by the durations it remembers from earlier runs; a fresh clone has none. Forget them,
  // so every run takes the files in the order a fresh clone does and order-dependent failures show up here too.
  rmSync(join(ROOT, "node_modules", ".vite", "vitest"), { recursive: true, force: true });
  log("Running the tests…");
  const r = spawnSync(bin("vitest"), args, { cwd: ROOT, env: stack.env, stdio: "inherit" });

  let passed = 0;
  let failed = 0;
  let skipped = 0;
  if (existsSync(report)) {
    const json = JSON.parse(readFileSync(report, "utf8"));
    passed = json.numPassedTests ?? 0;
    failed = json.numFailedTests ?? 0;
    skipped = (json.numPendingTests ?? 0) + (json.numTodoTests ?? 0);
    // A file that fails to load counts as a failure even though none of its tests ran.
    failed += (json.testResults ?? []).filter((f) => f.status === "failed" && (f.assertionResults ?? []).length === 0).length;
  }
  if (r.status !== 0 && failed === 0) failed = 1;
  if (lintOk === true) passed += 1;
  if (lintOk === false) {
    failed += 1;
    process.stdout.write("\nLint found problems (see above): `npm run lint` lists them, `npm run format` fixes formatting.\n");
  }
  stack.stop();
  process.stdout.write(`\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ""}\n`);
  process.exit(failed > 0 || r.status !== 0 ? 1 : 0);
}

main().catch((e) => {
  console.error(e instanceof Error ? e.stack : e);
  stack?.stop();
  process.stdout.write("\n0 passed, 1 failed\n");
  process.exit(1);
});
