import sharp from "sharp";
import { afterAll, describe, expect, it } from "vitest";
import { newCustomer } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { hasGpsIfd, htmlPage, jpeg, jpegWithGps, jpegZipPolyglot, oversizeJpeg, pixelFloodPng, truncatedJpeg } from "../fixtures/images";
import { quoteBody, ticketFor, uploadFiles, uploadOne } from "../fixtures/uploads";

afterAll(async () => {
  await closeTestPool();
});

function refusal(out: Awaited<ReturnType<typeof uploadOne>>): string {
  if (out.serverData && !out.serverData.ok) return out.serverData.error;
  return out.error ?? "";
}

describe("photo uploads through the upload SDK and the stand-in", () => {
  it("accepts a photo and answers with a ticket for the quote form", async () => {
    const { client } = await newCustomer("photos");
    const out = await uploadOne(client, { name: "front.jpg", type: "image/jpeg", bytes: await jpeg() });
    expect(out.status).toBe(200);
    expect(out.serverData).toMatchObject({ ok: true, width: 800, height: 600 });
  });

  it.each([
    ["an HTML page renamed .jpg", async () => ({ name: "dial.jpg", type: "image/jpeg", bytes: htmlPage }), /not a JPEG, PNG or WebP/],
    [
      "a JPEG with a ZIP archive appended",
      async () => ({ name: "back.jpg", type: "image/jpeg", bytes: await jpegZipPolyglot() }),
      /more than a photo/,
    ],
    ["a truncated JPEG", async () => ({ name: "chassis.jpg", type: "image/jpeg", bytes: await truncatedJpeg() }), /incomplete|damaged/],
    ["a 30000 × 30000 PNG", async () => ({ name: "label.png", type: "image/png", bytes: pixelFloodPng() }), /30000 × 30000 pixels/],
    ["a file over 16 MB", async () => ({ name: "huge.jpg", type: "image/jpeg", bytes: await oversizeJpeg() }), /larger than 16 MB/],
  ])("refuses %s with a clear message", async (_label, make, message) => {
    const { client } = await newCustomer("refused");
    const out = await uploadOne(client, await make());
    expect(out.serverData?.ok).not.toBe(true);
    expect(refusal(out)).toMatch(message);
    // The original is not kept at the upload service either.
    if (out.ufsUrl) expect((await fetch(out.ufsUrl)).status).toBe(404);
  });

  it("refuses a thirteenth photo, in one upload and on the request", async () => {
    const { client } = await newCustomer("thirteen");
    const image = await jpeg({ width: 320, height: 240 });
    const batch = await uploadFiles(
      client,
      Array.from({ length: 13 }, (_, i) => ({ name: `p${i}.jpg`, type: "image/jpeg", bytes: image })),
    );
    expect(batch[0]!.status).toBe(400);
    expect(batch[0]!.error).toMatch(/At most 12 photos/);
    const tickets: string[] = [];
    for (let i = 0; i < 13; i++) tickets.push(await ticketFor(client, { name: `p${i}.jpg`, type: "image/jpeg", bytes: image }));
    const res = await client.post("/api/portal/jobs", quoteBody(tickets));
    expect(res.status).toBe(400);
    const body = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(body.error.fields.photos).toMatch(/Photos: 12 at most/);
    expect(
      await sql(`select 1 from photo p join "user" u on u.id = p.uploader_id where u.email = $1`, [await emailOf(client)]),
    ).toHaveLength(0);
  });

  it("strips every bit of EXIF (GPS included) and bakes the orientation in", async () => {
    const { client, email } = await newCustomer("gps");
    const original = await jpegWithGps();
    const meta = await sharp(original).metadata();
    expect(hasGpsIfd(meta.exif)).toBe(true);
    expect(meta.orientation).toBe(6);
    const out = await uploadOne(client, { name: "IMG_2041.jpg", type: "image/jpeg", bytes: original });
    expect(out.serverData?.ok).toBe(true);
    // The upload service no longer holds the original with its GPS position.
    expect((await fetch(out.ufsUrl!)).status).toBe(404);
    const ticket = (out.serverData as { ticket: string }).ticket;
    const created = await client.post("/api/portal/jobs", quoteBody([ticket]));
    expect(created.status).toBe(201);
    const [photo] = await sql<{ id: string }>(`select p.id from photo p join "user" u on u.id = p.uploader_id where u.email = $1`, [email]);
    for (const size of ["", "?size=thumb"]) {
      const res = await client.get(`/api/photos/${photo!.id}${size}`);
      expect(res.status).toBe(200);
      expect(res.headers.get("cache-control")).toMatch(/no-store/);
      const bytes = Buffer.from(await res.arrayBuffer());
      const stored = await sharp(bytes).metadata();
      expect(stored.exif).toBeUndefined();
      expect(stored.xmp).toBeUndefined();
      expect(stored.icc).toBeUndefined();
      expect(stored.orientation).toBeUndefined();
      expect(stored.height! > stored.width!).toBe(true); // rotated upright: 600 × 800
      expect(bytes.toString("latin1")).not.toContain("Corvane");
      expect(bytes.includes(Buffer.from("Exif\0"))).toBe(false);
    }
  });

  it("does not let one owner use another owner's photo ticket, nor anonymous visitors upload", async () => {
    const a = await newCustomer("ticket-a");
    const b = await newCustomer("ticket-b");
    const ticket = await ticketFor(a.client, { name: "front.jpg", type: "image/jpeg", bytes: await jpeg() });
    const res = await b.client.post("/api/portal/jobs", quoteBody([ticket]));
    expect(res.status).toBe(400);
    const anon = await uploadOne(new TestClient(), { name: "front.jpg", type: "image/jpeg", bytes: await jpeg() });
    expect(anon.status).toBe(403);
    expect(anon.error).toMatch(/sign in/i);
  });
});

async function emailOf(client: TestClient): Promise<string> {
  const res = await client.get("/api/auth/get-session");
  return ((await res.json()) as { user: { email: string } }).user.email;
}
