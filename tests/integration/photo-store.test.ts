// Photos kept in the hosted upload store (the stand-in in tests), never on the app's own disk: private
// files read with a short-lived signed URL by the server, served only through the photo route to those who
// may see them; every stored upload counts towards the daily quota; uploads never attached are swept after a
// day; a failing or slow store gives retryable answers and loses nothing already acknowledged.
import { createHash, randomUUID } from "node:crypto";
import { execFile } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { jpeg } from "../fixtures/images";
import { seedJobWithEstimate } from "../fixtures/jobs";
import { quoteBody, ticketFor, uploadOne } from "../fixtures/uploads";

const uploadDir = () => process.env.UPLOAD_DIR!;
// The stand-in keeps a file under the custom id the app gives it (its key with the slash made a dash).
const standInPath = (key: string) => join(uploadDir(), "ingest", key.replace("/", "-"));
const appDiskPath = (key: string) => join(uploadDir(), "store", key);
const sha256 = (b: Buffer) => createHash("sha256").update(b).digest("hex");

async function storeFaults(mode: "off" | "store-down" | "store-slow") {
  const res = await fetch(`${process.env.UPLOADTHING_API_URL}/control/faults?mode=${mode}`, { method: "POST" });
  expect(res.status).toBe(200);
}

const uploadsOf = (email: string) =>
  sql<{ key: string; thumb_key: string }>(
    `select su.key, su.thumb_key from stored_upload su join "user" u on u.id = su.uploader_id where u.email = $1 order by su.created_at`,
    [email],
  );

async function quoteWithPhoto(label: string) {
  const owner = await newCustomer(label);
  const ticket = await ticketFor(owner.client, { name: "chassis.jpg", type: "image/jpeg", bytes: await jpeg({ width: 640, height: 480 }) });
  const created = await owner.client.post("/api/portal/jobs", quoteBody([ticket]));
  expect(created.status).toBe(201);
  const [photo] = await sql<{ id: string; storage_key: string; thumb_key: string }>(
    `select p.id, p.storage_key, p.thumb_key from photo p join "user" u on u.id = p.uploader_id where u.email = $1`,
    [owner.email],
  );
  return { owner, photo: photo! };
}

let tech: TestClient;
beforeAll(async () => {
  tech = new TestClient();
  await tech.signIn(DEMO.tech.email, DEMO.tech.password);
});
afterEach(async () => {
  await storeFaults("off");
});
afterAll(async () => {
  await closeTestPool();
});

describe("photos in the hosted store", () => {
  it("keeps the re-encoded photo in the store, private, not on the app's disk, and serves it only to those allowed", async () => {
    const { owner, photo } = await quoteWithPhoto("store-owner");
    for (const key of [photo.storage_key, photo.thumb_key]) {
      expect(existsSync(standInPath(key)), key).toBe(true);
      expect(existsSync(appDiskPath(key)), key).toBe(false);
      // Private: the file address alone, without a signature, is refused by the store.
      const meta = JSON.parse(readFileSync(`${standInPath(key)}.json`, "utf8")) as { acl: string };
      expect(meta.acl).toBe("private");
      const raw = await fetch(`http://${process.env.UPLOADTHING_UFS_HOST}/a/bandedge-local/${key.replace("/", "-")}`);
      expect(raw.status).toBe(403);
    }
    const stored = readFileSync(standInPath(photo.storage_key));
    const served = await owner.client.get(`/api/photos/${photo.id}`);
    expect(served.status).toBe(200);
    expect(served.headers.get("cache-control")).toMatch(/no-store/);
    expect(served.headers.get("content-type")).toBe("image/jpeg");
    const bytes = Buffer.from(await served.arrayBuffer());
    // Byte for byte what the store holds, and no store address handed to the browser.
    expect(sha256(bytes)).toBe(sha256(stored));
    expect(served.headers.get("location")).toBeNull();
    expect((await tech.get(`/api/photos/${photo.id}?size=thumb`)).status).toBe(200);
    const stranger = await newCustomer("store-stranger");
    expect((await stranger.client.get(`/api/photos/${photo.id}`)).status).toBe(404);
    expect((await new TestClient().get(`/api/photos/${photo.id}`)).status).toBe(401);
  });

  it("counts message photos and unattached uploads towards the daily quota of 120", async () => {
    const owner = await newCustomer("store-quota");
    const job = await seedJobWithEstimate({ email: owner.email, state: "on_bench" });
    const [u] = await sql<{ id: string }>(`select id from "user" where email = $1`, [owner.email]);
    // 117 uploads this morning that were never attached to anything (the quota is per day, whatever they became).
    await sql(
      `insert into stored_upload (key, thumb_key, uploader_id, bytes, created_at)
       select 'photos/' || gen_random_uuid() || '.jpg', null, $1, 1000, now() - interval '2 hours' from generate_series(1, 117)`,
      [u!.id],
    );
    const image = await jpeg({ width: 320, height: 240 });
    const tickets = [];
    for (let i = 0; i < 3; i++)
      tickets.push(await ticketFor(owner.client, { name: `back${i}.jpg`, type: "image/jpeg", bytes: image }, "messagePhotos"));
    const posted = await owner.client.post(`/api/portal/jobs/${job.jobId}/messages`, {
      body: "Three views of the dial cord.",
      idempotencyKey: randomUUID(),
      photos: tickets,
    });
    expect(posted.status).toBe(201);
    // 117 + 3 message photos = 120: the next upload, through either form, is refused.
    for (const slug of ["messagePhotos", "quotePhotos"] as const) {
      const refused = await uploadOne(owner.client, { name: "one-more.jpg", type: "image/jpeg", bytes: image }, slug);
      expect(refused.serverData?.ok).not.toBe(true);
      expect(refused.error ?? "").toMatch(/a lot of photos today/);
    }
    // Those 117 rows name no real file: take them out so the store checks of other tests stay meaningful.
    await sql(`delete from stored_upload where uploader_id = $1 and bytes = 1000`, [u!.id]);
  });

  it("sweeps an upload left unattached for more than a day, from the store and the table, and keeps attached ones", async () => {
    const { owner, photo } = await quoteWithPhoto("store-sweep");
    await ticketFor(owner.client, { name: "never-sent.jpg", type: "image/jpeg", bytes: await jpeg({ width: 300, height: 200 }) });
    const rows = await uploadsOf(owner.email);
    expect(rows).toHaveLength(2);
    const abandoned = rows.find((r) => r.key !== photo.storage_key)!;
    expect(existsSync(standInPath(abandoned.key))).toBe(true);
    // Both a day and a bit old (the ticket lives a day; the sweep waits an hour more).
    await sql(`update stored_upload set created_at = now() - interval '26 hours' where key = any($1)`, [rows.map((r) => r.key)]);
    const deadline = Date.now() + 30_000;
    while ((await uploadsOf(owner.email)).length > 1 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 500));
    expect((await uploadsOf(owner.email)).map((r) => r.key)).toEqual([photo.storage_key]);
    expect(existsSync(standInPath(abandoned.key))).toBe(false);
    expect(existsSync(standInPath(abandoned.thumb_key))).toBe(false);
    expect(existsSync(standInPath(photo.storage_key))).toBe(true);
    expect((await owner.client.get(`/api/photos/${photo.id}`)).status).toBe(200);
  });

  it("answers 503 with Retry-After while the store is down, refuses new uploads with a retryable message, and loses nothing", async () => {
    const { owner, photo } = await quoteWithPhoto("store-down");
    const before = Buffer.from(await (await owner.client.get(`/api/photos/${photo.id}`)).arrayBuffer());
    await storeFaults("store-down");
    const down = await owner.client.get(`/api/photos/${photo.id}`);
    expect(down.status).toBe(503);
    expect(Number(down.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(((await down.json()) as { error: { message: string } }).error.message).toMatch(/try again/i);
    const refused = await uploadOne(owner.client, { name: "later.jpg", type: "image/jpeg", bytes: await jpeg() });
    expect(refused.serverData).toEqual({ ok: false, error: expect.stringMatching(/not saved\. Please add it again/) });
    expect(await uploadsOf(owner.email)).toHaveLength(1);

    await storeFaults("off");
    const after = await owner.client.get(`/api/photos/${photo.id}`);
    expect(after.status).toBe(200);
    expect(sha256(Buffer.from(await after.arrayBuffer()))).toBe(sha256(before));
    const again = await uploadOne(owner.client, { name: "later.jpg", type: "image/jpeg", bytes: await jpeg() });
    expect(again.serverData?.ok).toBe(true);
  });

  it("gives up on a store that does not answer within the time limit: 503, not a hung request", async () => {
    const { owner, photo } = await quoteWithPhoto("store-slow");
    await storeFaults("store-slow");
    const started = Date.now();
    const slow = await owner.client.get(`/api/photos/${photo.id}`);
    expect(slow.status).toBe(503);
    expect(slow.headers.get("retry-after")).not.toBeNull();
    // The stand-in holds the answer 30 s; the app's limit (PHOTO_STORE_TIMEOUT_MS, 10 s) answers well before.
    expect(Date.now() - started).toBeLessThan(25_000);
  }, 40_000);

  it("moves photos kept on the app's disk into the store, once, and serves them from there", async () => {
    const owner = await newCustomer("store-migrate");
    const [u] = await sql<{ id: string }>(`select id from "user" where email = $1`, [owner.email]);
    // A photo from before the store: its row, and its files on the app's disk only.
    const id = randomUUID();
    const key = `photos/${id}.jpg`;
    const thumbKey = `photos/${id}-thumb.jpg`;
    const image = await jpeg({ width: 400, height: 300 });
    const thumb = await jpeg({ width: 200, height: 150 });
    mkdirSync(join(uploadDir(), "store", "photos"), { recursive: true });
    writeFileSync(appDiskPath(key), image);
    writeFileSync(appDiskPath(thumbKey), thumb);
    const [photo] = await sql<{ id: string }>(
      `insert into photo (uploader_id, storage_key, thumb_key, display_name, mime, width, height, bytes)
       values ($1, $2, $3, 'old.jpg', 'image/jpeg', 400, 300, $4) returning id`,
      [u!.id, key, thumbKey, image.length],
    );
    expect((await owner.client.get(`/api/photos/${photo!.id}`)).status).toBe(404);
    // Run without blocking this process, so the HTTP client sees the app close idle connections meanwhile.
    const migrate = (...args: string[]) =>
      new Promise<{ status: number; stdout: string; stderr: string }>((done) => {
        execFile("node", ["scripts/photos-to-store.mjs", ...args], { encoding: "utf8", env: process.env }, (error, stdout, stderr) =>
          done({ status: error ? Number(error.code ?? 1) : 0, stdout, stderr }),
        );
      });
    const first = await migrate();
    expect(first.status, first.stderr).toBe(0);
    expect(first.stdout + first.stderr).toMatch(/[1-9]\d* moved into the store/);
    const served = await owner.client.get(`/api/photos/${photo!.id}`);
    expect(served.status).toBe(200);
    expect(sha256(Buffer.from(await served.arrayBuffer()))).toBe(sha256(image));
    // Again: nothing left to move; then the disk copies go once the store's copies match.
    const second = await migrate("--remove-local");
    expect(second.status, second.stderr).toBe(0);
    expect(second.stdout + second.stderr).toMatch(/ 0 moved into the store/);
    expect(existsSync(appDiskPath(key))).toBe(false);
    const thumbServed = await owner.client.get(`/api/photos/${photo!.id}?size=thumb`);
    expect(sha256(Buffer.from(await thumbServed.arrayBuffer()))).toBe(sha256(thumb));
  }, 60_000);
});
