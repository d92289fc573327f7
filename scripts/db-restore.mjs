#!/usr/bin/env node
// npm run db:restore -- FILE [--target NAME]: restores a backup into database NAME (created if missing;
// default "bandedge_restore", so the live database is never overwritten by accident). Pass --target bandedge
// with --replace to restore over the live database.
import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { ensurePostgres, log, run } from "./lib/stack.mjs";
import { argValue, databaseUrl } from "./lib/db-url.mjs";

const file = process.argv.slice(2).find((a) => !a.startsWith("--") && a !== argValue("--target"));
if (!file) {
  console.error("usage: npm run db:restore -- FILE [--target NAME] [--replace]");
  process.exit(2);
}
const target = argValue("--target") ?? "bandedge_restore";
const replace = process.argv.includes("--replace");
const base = new URL(databaseUrl());
const admin = new URL(base);
admin.pathname = "/postgres";
const dest = new URL(base);
dest.pathname = `/${target}`;
const bin = ensurePostgres();

const exists = spawnSync(
  join(bin, "psql"),
  [admin.toString(), "-tAc", `select 1 from pg_database where datname = '${target.replace(/'/g, "''")}'`],
  { encoding: "utf8" },
);
if (exists.status !== 0) throw new Error(exists.stderr);
if (exists.stdout.trim() === "1") {
  if (!replace) {
    console.error(`database ${target} exists; pass --replace to restore over it`);
    process.exit(2);
  }
  run(join(bin, "psql"), [admin.toString(), "-c", `drop database "${target}" with (force)`]);
}
run(join(bin, "psql"), [admin.toString(), "-c", `create database "${target}"`]);
run(join(bin, "pg_restore"), ["--no-owner", "--no-privileges", "--exit-on-error", `--dbname=${dest.toString()}`, file]);
log(`Restored ${file} into ${target}`);
