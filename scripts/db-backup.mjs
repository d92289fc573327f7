#!/usr/bin/env node
// npm run db:backup [-- --out FILE]: a pg_dump (custom format) of the Bandedge database.
// Uses DATABASE_URL when set, otherwise the local database of npm start.
import { mkdirSync } from "node:fs";
import { dirname, join } from "node:path";
import { ensurePostgres, log, run, ROOT } from "./lib/stack.mjs";
import { databaseUrl, argValue } from "./lib/db-url.mjs";

const url = databaseUrl();
const out = argValue("--out") ?? join(ROOT, ".bandedge", "backups", `bandedge-${new Date().toISOString().replace(/[:.]/g, "-")}.dump`);
mkdirSync(dirname(out), { recursive: true });
const bin = ensurePostgres();
run(join(bin, "pg_dump"), ["--format=custom", "--no-owner", "--no-privileges", `--file=${out}`, `--dbname=${url}`]);
log(`Backup written to ${out}`);
