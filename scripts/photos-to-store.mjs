#!/usr/bin/env node
// npm run photos:to-store [-- --from DIR] [--remove-local]: moves photos kept on the app's disk (the disk
// store, UPLOAD_DIR/store) into the hosted upload store, once, for a shop that ran before photos were kept
// there. Every file the database refers to and the store lacks is uploaded from DIR (default
// $UPLOAD_DIR/store) under the same key, read back and compared by SHA-256. Safe to run again: files already
// in the store are skipped, so a run cut short is finished by the next one. --remove-local deletes each disk
// copy once the store's copy matched. Exits 1 when a referenced file is in neither place.
import { existsSync, readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { log, ROOT } from "./lib/stack.mjs";
import { databaseUrl, argValue } from "./lib/db-url.mjs";
import { photoStore, referencedKeys, sha256 } from "./lib/photo-store.mjs";

const from = argValue("--from") ?? join(process.env.UPLOAD_DIR ?? join(ROOT, ".bandedge", "uploads"), "store");
const removeLocal = process.argv.includes("--remove-local");
const store = photoStore();
const counts = { moved: 0, already: 0, removed: 0 };
const missing = [];
for (const key of await referencedKeys(databaseUrl())) {
  const local = join(from, key);
  const stored = await store.read(key);
  const disk = existsSync(local) ? readFileSync(local) : null;
  if (stored) {
    counts.already++;
  } else if (disk) {
    await store.write(key, disk);
    const back = await store.read(key);
    if (!back || sha256(back) !== sha256(disk)) throw new Error(`the store's copy of ${key} does not match the disk copy`);
    counts.moved++;
  } else {
    missing.push(key);
    continue;
  }
  if (removeLocal && disk) {
    const now = stored ?? (await store.read(key));
    if (now && sha256(now) === sha256(disk)) {
      rmSync(local);
      counts.removed++;
    }
  }
}
log(`Photos: ${counts.moved} moved into the store, ${counts.already} already there, ${counts.removed} disk copies removed`);
if (missing.length) {
  console.error(`In neither the store nor ${from}:\n  ${missing.join("\n  ")}`);
  process.exit(1);
}
