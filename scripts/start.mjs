#!/usr/bin/env node
// npm start: everything from a fresh clone to a served demo shop on http://127.0.0.1:3000.
//   --prepare-only   install, start PostgreSQL, migrate and seed, then stop (used by the tests).
// Settings: BANDEDGE_STATE_DIR (default ./.bandedge), BANDEDGE_PG_PORT (5433), PORT (3000).
import { existsSync } from "node:fs";
import { join, resolve } from "node:path";
import {
  bin,
  ensureDatabase,
  ensureDependencies,
  ensureRoles,
  ensureRoleSecrets,
  ensurePostgres,
  generateSecrets,
  log,
  readEnvFile,
  ROOT,
  run,
  serviceEnv,
  spawnService,
  startCluster,
  waitForHttp,
  writeEnvFile,
} from "./lib/stack.mjs";

const prepareOnly = process.argv.includes("--prepare-only");
const skipBuild = process.argv.includes("--skip-build");
const stateDir = resolve(process.env.BANDEDGE_STATE_DIR ?? join(ROOT, ".bandedge"));
const pgPort = Number(process.env.BANDEDGE_PG_PORT ?? 5433);
const appPort = Number(process.env.PORT ?? 3000);
const mailPort = Number(process.env.BANDEDGE_MAIL_PORT ?? 4010);
const stripePort = Number(process.env.BANDEDGE_STRIPE_PORT ?? 4020);
const uploadPort = Number(process.env.BANDEDGE_UPLOAD_PORT ?? 4030);

const children = [];
let cluster;
let stopping = false;

function stopAll(code = 0) {
  if (stopping) return;
  stopping = true;
  log("Stopping…");
  for (const c of children) if (c.exitCode === null) c.kill("SIGTERM");
  setTimeout(() => {
    for (const c of children) if (c.exitCode === null) c.kill("SIGKILL");
    if (cluster) {
      log("Stopping PostgreSQL cleanly…");
      cluster.stop("fast");
    }
    process.exit(code);
  }, 1500);
}

process.on("SIGINT", () => stopAll(0));
process.on("SIGTERM", () => stopAll(0));

async function main() {
  ensureDependencies();
  const pgBin = ensurePostgres();

  const envFile = join(stateDir, "local.env");
  let secrets = readEnvFile(envFile);
  if (!secrets.BETTER_AUTH_SECRET) {
    log(`Generating local secrets into ${envFile}`);
    secrets = generateSecrets();
    writeEnvFile(envFile, secrets);
  }

  cluster = startCluster({
    bin: pgBin,
    dataDir: join(stateDir, "pgdata"),
    socketDir: join(stateDir, "pgsock"),
    logFile: join(stateDir, "postgres.log"),
    port: pgPort,
    password: secrets.PG_PASSWORD,
  });
  ensureDatabase({ bin: pgBin, port: pgPort, password: secrets.PG_PASSWORD, name: "bandedge" });

  // Database roles: the app runs as a role with only the rights it needs, migrations as the owner.
  if (ensureRoleSecrets(secrets)) writeEnvFile(envFile, secrets);
  ensureRoles({
    bin: pgBin,
    port: pgPort,
    password: secrets.PG_PASSWORD,
    name: "bandedge",
    ownerPassword: secrets.PG_OWNER_PASSWORD,
    appPassword: secrets.PG_APP_PASSWORD,
  });

  const env = serviceEnv({ secrets, pgPort, appPort, mailPort, stripePort, uploadPort, stateDir });
  log("Applying database migrations…");
  run(bin("tsx"), ["scripts/migrate.ts"], { env });
  log("Seeding the demo shop (kept if already there)…");
  run(bin("tsx"), ["--conditions=react-server", "scripts/seed.ts"], { env });

  if (prepareOnly) {
    cluster.stop("fast");
    log("Prepared.");
    process.exit(0);
  }

  if (!skipBuild || !existsSync(join(ROOT, ".next", "BUILD_ID"))) {
    log("Building the app…");
    run(bin("next"), ["build"], { env });
  }

  children.push(spawnService("mail", bin("tsx"), ["scripts/fakes/mail-server.ts"], env));
  for (const fake of ["stripe-server.ts", "upload-server.ts"]) {
    if (existsSync(join(ROOT, "scripts", "fakes", fake)))
      children.push(spawnService(fake, bin("tsx"), [join("scripts", "fakes", fake)], env));
  }
  const app = spawnService("app", bin("next"), ["start", "--hostname", "127.0.0.1", "--port", String(appPort)], env);
  children.push(app);
  app.on("exit", () => stopAll(1));
  await waitForHttp(`http://127.0.0.1:${appPort}/`);

  process.stdout.write(`
  Bandedge is running: http://127.0.0.1:${appPort}
  Mailbox (local mail stand-in): http://127.0.0.1:${appPort}/mailbox

  Demo sign-ins (local demo only):
    Shop owner   odile@kestrel-lane.example    bench-owner-2026
    Technician   tomas@kestrel-lane.example    bench-tech-2026
    Technician   priya@kestrel-lane.example    bench-tech-2026
    Set owner    mira.holloway@example.com     demo-owner-2026
    Set owner    jonah.pell@example.com        demo-owner-2026
    Set owner    ines.varga@example.net        demo-owner-2026
    Set owner    brennan.estate@example.org    demo-owner-2026

  Press Ctrl-C to stop everything (PostgreSQL is stopped cleanly).
`);
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  stopAll(1);
});
