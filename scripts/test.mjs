#!/usr/bin/env node
// npm test: a throwaway PostgreSQL cluster on a free loopback port, the built app and its stand-ins,
// then unit, integration and browser tests. Ends with one line: "N passed, N failed".
import { mkdtempSync, readFileSync, rmSync, existsSync, chmodSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { spawnSync } from "node:child_process";
import {
  bin,
  ensureChromium,
  ensureDatabase,
  ensureDependencies,
  ensurePostgres,
  freePort,
  generateSecrets,
  log,
  ROOT,
  run,
  serviceEnv,
  spawnService,
  startCluster,
  waitForHttp,
} from "./lib/stack.mjs";

const only = process.argv.slice(2).filter((a) => !a.startsWith("--"));
const skipBuild = process.argv.includes("--skip-build");
const children = [];
let cluster;
let scratch;

function cleanup() {
  for (const c of children) if (c.exitCode === null) c.kill("SIGTERM");
  if (cluster) cluster.stop("immediate");
  if (scratch && !process.env.BANDEDGE_KEEP_TEST_STATE) rmSync(scratch, { recursive: true, force: true });
}

process.on("SIGINT", () => {
  cleanup();
  process.exit(130);
});

async function main() {
  ensureDependencies();
  const pgBin = ensurePostgres();
  const chromium = ensureChromium();

  scratch = mkdtempSync(join(tmpdir(), "bandedge-test-"));
  chmodSync(scratch, 0o755);
  const [pgPort, appPort, mailPort, stripePort, uploadPort] = await Promise.all([freePort(), freePort(), freePort(), freePort(), freePort()]);
  const secrets = generateSecrets();
  cluster = startCluster({
    bin: pgBin,
    dataDir: join(scratch, "pgdata"),
    socketDir: join(scratch, "pgsock"),
    logFile: join(scratch, "postgres.log"),
    port: pgPort,
    password: secrets.PG_PASSWORD,
    fast: true,
  });
  ensureDatabase({ bin: pgBin, port: pgPort, password: secrets.PG_PASSWORD, name: "bandedge" });

  const distDir = process.env.BANDEDGE_TEST_DIST ?? ".next-test";
  const env = serviceEnv({
    secrets,
    pgPort,
    appPort,
    mailPort,
    stripePort,
    uploadPort,
    stateDir: scratch,
    extra: {
      NEXT_DIST_DIR: distDir,
      CHROMIUM_PATH: chromium,
      PG_BIN: pgBin,
      PG_PASSWORD: secrets.PG_PASSWORD,
      PG_PORT: String(pgPort),
      TEST_ARTIFACTS: join(ROOT, "test-results"),
      TEST_SCRATCH: scratch,
    },
  });
  mkdirSync(join(ROOT, "test-results"), { recursive: true });

  log("Migrating and seeding the test database…");
  run(bin("tsx"), ["scripts/migrate.ts"], { env });
  run(bin("tsx"), ["scripts/seed.ts"], { env });

  if (!skipBuild || !existsSync(join(ROOT, distDir, "BUILD_ID"))) {
    log("Building the app for the tests…");
    run(bin("next"), ["build"], { env });
  }

  children.push(spawnService("mail", bin("tsx"), ["scripts/fakes/mail-server.ts"], env, { quiet: true }));
  for (const fake of ["stripe-server.ts", "upload-server.ts"]) {
    if (existsSync(join(ROOT, "scripts", "fakes", fake))) children.push(spawnService(fake, bin("tsx"), [join("scripts", "fakes", fake)], env, { quiet: true }));
  }
  children.push(spawnService("app", bin("next"), ["start", "--hostname", "127.0.0.1", "--port", String(appPort)], env, { quiet: true }));
  await waitForHttp(`http://127.0.0.1:${mailPort}/health`);
  await waitForHttp(`http://127.0.0.1:${appPort}/`, 90_000);

  const report = join(scratch, "vitest.json");
  const args = ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${report}`];
  if (only.length) args.push(...only);
  log("Running the tests…");
  const r = spawnSync(bin("vitest"), args, { cwd: ROOT, env, stdio: "inherit" });

  let passed = 0;
  let failed = 0;
  let skipped = 0;
  if (existsSync(report)) {
    const json = JSON.parse(readFileSync(report, "utf8"));
    passed = json.numPassedTests ?? 0;
    failed = json.numFailedTests ?? 0;
    skipped = (json.numPendingTests ?? 0) + (json.numTodoTests ?? 0);
    // A file that fails to load counts as a failure even though none of its tests ran.
    const brokenFiles = (json.testResults ?? []).filter((f) => f.status === "failed" && (f.assertionResults ?? []).length === 0).length;
    failed += brokenFiles;
  }
  if (r.status !== 0 && failed === 0) failed = 1;
  cleanup();
  process.stdout.write(`\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ""}\n`);
  process.exit(failed > 0 || r.status !== 0 ? 1 : 0);
}

main().catch((e) => {
  console.error(e instanceof Error ? e.stack : e);
  cleanup();
  process.stdout.write("\n0 passed, 1 failed\n");
  process.exit(1);
});
