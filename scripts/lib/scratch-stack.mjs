// A throwaway stack for tests and benchmarks: PostgreSQL on a free loopback port, migrated and seeded,
// the built app and the stand-ins. stop() ends everything it started and removes the folder.
import { chmodSync, existsSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import {
  bin,
  ensureChromium,
  ensureDatabase,
  ensureDependencies,
  ensurePostgres,
  ensureRoles,
  freePort,
  generateSecrets,
  log,
  ROOT,
  run,
  serviceEnv,
  spawnService,
  startCluster,
  waitForHttp,
} from "./stack.mjs";

// appLog: a file that receives the app instances' output (instead of the terminal).
// durable: keep PostgreSQL's fsync, synchronous_commit and full_page_writes on (the fault test needs them).
// The answer also carries the cluster (stop(mode) / start()) and startApp(port), which starts one more
// `next start` of the same build (added to children, so stop() ends it too).
export async function bootScratchStack({
  distDir = ".next-test",
  build = true,
  chromium = false,
  quiet = true,
  extraEnv = {},
  durable = false,
  appLog,
} = {}) {
  ensureDependencies();
  const pgBin = ensurePostgres();
  const chromiumPath = chromium ? ensureChromium() : undefined;
  const children = [];
  const scratch = mkdtempSync(join(tmpdir(), "bandedge-scratch-"));
  chmodSync(scratch, 0o755);
  let cluster;
  const stop = () => {
    for (const c of children) if (c.exitCode === null) c.kill("SIGTERM");
    if (cluster) cluster.stop("immediate");
    if (!process.env.BANDEDGE_KEEP_TEST_STATE) rmSync(scratch, { recursive: true, force: true });
  };
  try {
    const [pgPort, appPort, mailPort, stripePort, uploadPort] = await Promise.all([
      freePort(),
      freePort(),
      freePort(),
      freePort(),
      freePort(),
    ]);
    const secrets = generateSecrets();
    cluster = startCluster({
      bin: pgBin,
      dataDir: join(scratch, "pgdata"),
      socketDir: join(scratch, "pgsock"),
      logFile: join(scratch, "postgres.log"),
      port: pgPort,
      password: secrets.PG_PASSWORD,
      fast: !durable,
    });
    ensureDatabase({ bin: pgBin, port: pgPort, password: secrets.PG_PASSWORD, name: "bandedge" });
    ensureRoles({
      bin: pgBin,
      port: pgPort,
      password: secrets.PG_PASSWORD,
      name: "bandedge",
      ownerPassword: secrets.PG_OWNER_PASSWORD,
      appPassword: secrets.PG_APP_PASSWORD,
    });
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
        ...(chromiumPath ? { CHROMIUM_PATH: chromiumPath } : {}),
        PG_BIN: pgBin,
        PG_PASSWORD: secrets.PG_PASSWORD,
        PG_PORT: String(pgPort),
        TEST_ARTIFACTS: join(ROOT, "test-results"),
        TEST_SCRATCH: scratch,
        // The test client plays the one reverse proxy in front of the app: it appends the client address.
        TRUSTED_PROXY_HOPS: "1",
        // Abandoned uploads are swept every few seconds, so a test sees the sweep without waiting ten minutes.
        PHOTO_SWEEP_SECONDS: "3",
        ...extraEnv,
      },
    });
    mkdirSync(join(ROOT, "test-results"), { recursive: true });
    log("Migrating and seeding the scratch database…");
    run(bin("tsx"), ["scripts/migrate.ts"], { env });
    run(bin("tsx"), ["--conditions=react-server", "scripts/seed.ts"], { env });
    if (build || !existsSync(join(ROOT, distDir, "BUILD_ID"))) {
      log("Building the app…");
      run(bin("next"), ["build"], { env });
    }
    children.push(spawnService("mail", bin("tsx"), ["scripts/fakes/mail-server.ts"], env, { quiet }));
    for (const fake of ["stripe-server.ts", "upload-server.ts"]) {
      if (existsSync(join(ROOT, "scripts", "fakes", fake)))
        children.push(spawnService(fake, bin("tsx"), [join("scripts", "fakes", fake)], env, { quiet }));
    }
    const startApp = (port = appPort, { name = "app" } = {}) => {
      const child = spawnService(name, bin("next"), ["start", "--hostname", "127.0.0.1", "--port", String(port)], env, {
        quiet,
        logFile: appLog,
      });
      children.push(child);
      return child;
    };
    const app = startApp();
    await waitForHttp(`http://127.0.0.1:${mailPort}/health`);
    await waitForHttp(`http://127.0.0.1:${appPort}/api/health`, 90_000);
    return { env, scratch, appUrl: `http://127.0.0.1:${appPort}`, stop, children, app, startApp, cluster, pgBin };
  } catch (e) {
    stop();
    throw e;
  }
}
