// Messages both ways at any state: the owner and the workshop write on a job's thread with photos that go
// through the same upload checks as quote photos; free messages move no state (the triage question still
// does); each reader has their own unread marks; workshop notes stay with the workshop.
import { randomUUID } from "node:crypto";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { hasGpsIfd, jpeg, jpegWithGps } from "../fixtures/images";
import { seedJobWithEstimate } from "../fixtures/jobs";
import { quoteBody, ticketFor } from "../fixtures/uploads";
import { createJob } from "./bench-fixtures";

type Photo = { id: string; url: string; thumbUrl: string };
type OwnerThread = { messages: { id: string; body: string; mine: boolean; unread: boolean; photos: Photo[] }[]; unread: number };
type StaffThread = {
  messages: { id: string; body: string; internal: boolean; fromOwner: boolean; unread: boolean; photos: Photo[] }[];
  unread: number;
};

let tech: TestClient;
let tech2: TestClient;
beforeAll(async () => {
  tech = new TestClient();
  await tech.signIn(DEMO.tech.email, DEMO.tech.password);
  tech2 = new TestClient();
  await tech2.signIn(DEMO.tech2.email, DEMO.tech2.password);
});
afterAll(async () => {
  await closeTestPool();
});

const stateOf = async (jobId: string) => (await sql<{ state: string }>("select state from job where id = $1", [jobId]))[0]!.state;
const movesOf = async (jobId: string) =>
  (await sql<{ n: number }>("select count(*)::int as n from job_state_history where job_id = $1", [jobId]))[0]!.n;
const queueUnread = async (client: TestClient, email: string, jobId: string) => {
  const page = (await (await client.get(`/api/bench/queue?q=${encodeURIComponent(email)}&includeClosed=1`)).json()) as {
    rows: { id: string; unread: number }[];
  };
  return page.rows.find((r) => r.id === jobId)?.unread;
};

describe("the owner writes while the set is on the bench", () => {
  it("sends a photo with a message, moves nothing, and the workshop sees it unread with the location stripped", async () => {
    const owner = await newCustomer("thread-owner");
    const job = await seedJobWithEstimate({ email: owner.email, state: "on_bench" });
    const movesBefore = await movesOf(job.jobId);

    // A phone photo with a GPS position (EXIF tag 0x8825, the GPS IFD pointer of the EXIF 2.3 standard, published).
    const original = await jpegWithGps();
    expect(hasGpsIfd((await sharp(original).metadata()).exif)).toBe(true);
    const ticket = await ticketFor(owner.client, { name: "IMG_3107.jpg", type: "image/jpeg", bytes: original }, "messagePhotos");
    const body = "Here is the label inside the back cover, in case it helps.";
    const posted = await owner.client.post(`/api/portal/jobs/${job.jobId}/messages`, {
      body,
      idempotencyKey: randomUUID(),
      photos: [ticket],
    });
    expect(posted.status).toBe(201);
    const { id } = (await posted.json()) as { id: string };
    expect(await stateOf(job.jobId)).toBe("on_bench");
    expect(await movesOf(job.jobId)).toBe(movesBefore);

    // The workshop: one unread message from the owner, in the thread and in the queue.
    expect(await queueUnread(tech, owner.email, job.jobId)).toBe(1);
    const thread = (await (await tech.get(`/api/bench/jobs/${job.jobId}/messages`)).json()) as StaffThread;
    expect(thread.unread).toBe(1);
    const msg = thread.messages.find((m) => m.id === id)!;
    expect(msg).toMatchObject({ body, fromOwner: true, unread: true, internal: false });
    expect(msg.photos).toHaveLength(1);

    // The stored photo: re-encoded JPEG, no EXIF at all, orientation 6 (rotate 90°, EXIF standard) baked in.
    for (const url of [msg.photos[0]!.url, msg.photos[0]!.thumbUrl]) {
      const res = await tech.get(url);
      expect(res.status).toBe(200);
      expect(res.headers.get("content-type")).toBe("image/jpeg");
      const meta = await sharp(Buffer.from(await res.arrayBuffer())).metadata();
      expect(hasGpsIfd(meta.exif)).toBe(false);
      expect(meta.exif).toBeUndefined();
      expect(meta.orientation ?? 1).toBe(1);
      expect(meta.height! > meta.width!).toBe(true); // 800 × 600 turned upright
    }
    // The owner sees their own photo; another owner does not.
    expect((await owner.client.get(msg.photos[0]!.url)).status).toBe(200);
    const stranger = await newCustomer("thread-stranger");
    expect((await stranger.client.get(msg.photos[0]!.url)).status).toBe(404);

    // A second technician has their own marks: reading by one leaves the other's unread.
    const read = await tech.post(`/api/bench/jobs/${job.jobId}/messages/read`, { lastMessageId: id });
    expect(read.status).toBe(200);
    expect(await queueUnread(tech, owner.email, job.jobId)).toBe(0);
    expect(await queueUnread(tech2, owner.email, job.jobId)).toBe(1);
    expect(((await (await tech.get(`/api/bench/jobs/${job.jobId}/messages`)).json()) as StaffThread).unread).toBe(0);
  });

  it("refuses a photo ticket that is not the author's own, naming the field, and stores nothing", async () => {
    const a = await newCustomer("thread-ticket-a");
    const b = await newCustomer("thread-ticket-b");
    const job = await seedJobWithEstimate({ email: a.email, state: "on_bench" });
    const ticketOfB = await ticketFor(b.client, { name: "front.jpg", type: "image/jpeg", bytes: await jpeg() }, "messagePhotos");
    const res = await a.client.post(`/api/portal/jobs/${job.jobId}/messages`, {
      body: "With a photo that is not mine.",
      idempotencyKey: randomUUID(),
      photos: [ticketOfB],
    });
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: { fields: Record<string, string> } }).error.fields.photos).toMatch(/could not be matched/);
    expect(await sql("select id from message where job_id = $1", [job.jobId])).toHaveLength(0);
    const tooMany = await a.client.post(`/api/portal/jobs/${job.jobId}/messages`, {
      body: "Five photos.",
      idempotencyKey: randomUUID(),
      photos: ["a", "b", "c", "d", "e"],
    });
    expect(tooMany.status).toBe(400);
    expect(((await tooMany.json()) as { error: { fields: Record<string, string> } }).error.fields.photos).toMatch(/At most 4 photos/);
  });
});

describe("the workshop answers at any state", () => {
  it("writes to the owner with a photo: no state change, one e-mail however often retried, unread for the owner until read", async () => {
    const owner = await newCustomer("thread-answer");
    const job = await seedJobWithEstimate({ email: owner.email, state: "on_bench" });
    const movesBefore = await movesOf(job.jobId);
    const ticket = await ticketFor(
      tech,
      { name: "chassis.jpg", type: "image/jpeg", bytes: await jpeg({ color: "#3a5b29" }) },
      "messagePhotos",
    );
    const post = {
      body: "The filter can was leaking; here it is next to its replacement.",
      idempotencyKey: randomUUID(),
      photos: [ticket],
    };
    const first = await tech.post(`/api/bench/jobs/${job.jobId}/messages`, post);
    expect(first.status).toBe(201);
    const { id } = (await first.json()) as { id: string };
    const again = await tech.post(`/api/bench/jobs/${job.jobId}/messages`, post);
    expect(again.status).toBe(200);
    expect(await again.json()).toEqual({ id, duplicate: true });
    expect(await stateOf(job.jobId)).toBe("on_bench");
    expect(await movesOf(job.jobId)).toBe(movesBefore);
    const mails = await sql<{ template: string; to_address: string }>(
      "select template, to_address from email_outbox where dedupe_key = 'shop-message:' || $1",
      [id],
    );
    expect(mails).toEqual([{ template: "shop-message", to_address: owner.email }]);

    const thread = (await (await owner.client.get(`/api/portal/jobs/${job.jobId}/messages`)).json()) as OwnerThread;
    expect(thread.unread).toBe(1);
    const seen = thread.messages.find((m) => m.id === id)!;
    expect(seen).toMatchObject({ mine: false, unread: true });
    expect(seen.photos).toHaveLength(1);
    expect((await owner.client.get(seen.photos[0]!.thumbUrl)).status).toBe(200);
    const list = (await (await owner.client.get("/api/portal/jobs")).json()) as { jobs: { id: string; unreadMessages: number }[] };
    expect(list.jobs.find((j) => j.id === job.jobId)?.unreadMessages).toBe(1);
    expect(await (await owner.client.get("/portal")).text()).toContain("1 new message");

    expect((await owner.client.post(`/api/portal/jobs/${job.jobId}/messages/read`, { lastMessageId: id })).status).toBe(200);
    const after = (await (await owner.client.get(`/api/portal/jobs/${job.jobId}/messages`)).json()) as OwnerThread;
    expect(after.unread).toBe(0);
    const list2 = (await (await owner.client.get("/api/portal/jobs")).json()) as { jobs: { id: string; unreadMessages: number }[] };
    expect(list2.jobs.find((j) => j.id === job.jobId)?.unreadMessages).toBe(0);
  });

  it("writes freely during triage without putting the job on hold, while the question still does and the answer returns it", async () => {
    const { jobId } = await createJob({ state: "in_triage" });
    const free = await tech.post(`/api/bench/jobs/${jobId}/messages`, {
      body: "Thanks, we have your request.",
      idempotencyKey: randomUUID(),
    });
    expect(free.status).toBe(201);
    expect(await stateOf(jobId)).toBe("in_triage");
    const q = await tech.post(`/api/bench/jobs/${jobId}/question`, {
      question: "Is the back cover present?",
      idempotencyKey: randomUUID(),
    });
    expect(q.status).toBe(200);
    expect(await stateOf(jobId)).toBe("awaiting_owner");
    const mira = new TestClient();
    await mira.signIn(DEMO.customer.email, DEMO.customer.password);
    const ans = await mira.post(`/api/portal/jobs/${jobId}/messages`, { body: "Yes, with all its screws.", idempotencyKey: randomUUID() });
    expect(ans.status).toBe(201);
    expect(await stateOf(jobId)).toBe("in_triage");
  });

  it("keeps a workshop note out of everything the owner can open; the message route never writes a note", async () => {
    const owner = await newCustomer("thread-note");
    const job = await seedJobWithEstimate({ email: owner.email, state: "on_bench" });
    const secret = `Owner haggled hard; keep the parts receipts ${randomUUID().slice(0, 6)}`;
    const note = await tech.post(`/api/bench/jobs/${job.jobId}/notes`, { body: secret, idempotencyKey: randomUUID() });
    expect(note.status).toBe(200);
    for (const path of [
      `/api/portal/jobs/${job.jobId}/messages`,
      `/api/portal/jobs/${job.jobId}`,
      "/api/portal/jobs",
      `/portal/jobs/${job.jobId}`,
      "/portal",
    ]) {
      const res = await owner.client.get(path);
      expect(res.status, path).toBe(200);
      expect(await res.text(), path).not.toContain(secret);
    }
    expect(((await (await owner.client.get(`/api/portal/jobs/${job.jobId}/messages`)).json()) as OwnerThread).unread).toBe(0);
    const staff = (await (await tech.get(`/api/bench/jobs/${job.jobId}/messages`)).json()) as StaffThread;
    expect(staff.messages.find((m) => m.body === secret)?.internal).toBe(true);
    const ticket = await ticketFor(tech, { name: "receipt.jpg", type: "image/jpeg", bytes: await jpeg() }, "messagePhotos");
    const withPhoto = await tech.post(`/api/bench/jobs/${job.jobId}/messages`, {
      body: "A note with a photo",
      idempotencyKey: randomUUID(),
      internal: true,
      photos: [ticket],
    });
    // "internal" is not a field of a message to the owner: it is ignored, so this is a message the owner reads.
    expect(withPhoto.status).toBe(201);
    const id = ((await withPhoto.json()) as { id: string }).id;
    const [row] = await sql<{ internal: boolean }>("select internal from message where id = $1", [id]);
    expect(row!.internal).toBe(false);
  });
});

describe("what the owner gave reaches the bench", () => {
  it("shows the owner's request photos, dial-scale ends and phone on the job, and keeps them after the profile is edited", async () => {
    const owner = await newCustomer("thread-triage");
    const ticket = await ticketFor(owner.client, { name: "dial.jpg", type: "image/jpeg", bytes: await jpeg() });
    const created = await owner.client.post(
      "/api/portal/jobs",
      quoteBody([ticket], {
        bands: ["MW", "SW"],
        // As printed on a typical 1940s dial: MW 55–160 (×10 kHz), SW 6–18 (MHz). Common practice, from memory.
        dialEnds: { MW: { low: "55", high: "160" }, SW: { low: "6", high: "18" }, LW: { low: "15", high: "35" } },
        contactPreference: "phone",
        phone: "+1 360 555 0148",
      }),
    );
    expect(created.status).toBe(201);
    const { jobId } = (await created.json()) as { jobId: string };
    type Detail = {
      photos: { id: string; url: string; thumbUrl: string }[];
      ownerReport: { dialEnds: { band: string; low: number | null; high: number | null }[] };
      customer: { phone: string | null };
      job: { contactPreference: string };
      set: { maker: string; model: string; year: number; profile: Record<string, unknown> };
    };
    const detail = (await (await tech.get(`/api/bench/jobs/${jobId}`)).json()) as Detail;
    expect(detail.ownerReport.dialEnds).toEqual([
      { band: "MW", low: 55, high: 160 },
      { band: "SW", low: 6, high: 18 },
    ]);
    expect(detail.customer.phone).toBe("+1 360 555 0148");
    expect(detail.job.contactPreference).toBe("phone");
    expect(detail.photos).toHaveLength(1);
    const img = await tech.get(detail.photos[0]!.thumbUrl);
    expect(img.status).toBe(200);
    expect(img.headers.get("content-type")).toBe("image/jpeg");

    // The technician saves a corrected profile: the owner's report stays beside it.
    const save = await tech.request(`/api/bench/jobs/${jobId}/profile`, {
      method: "PUT",
      json: {
        maker: detail.set.maker,
        model: detail.set.model,
        year: 1948,
        profile: {
          kind: "tube-acdc",
          bands: [{ kind: "MW", lowKHz: 550, highKHz: 1600, ifKHz: 455 }],
          electrolytics: 2,
          paperCapacitors: 6,
        },
      },
    });
    expect(save.status).toBe(200);
    const again = (await (await tech.get(`/api/bench/jobs/${jobId}`)).json()) as Detail;
    expect(again.ownerReport.dialEnds.map((e) => e.band)).toEqual(["MW", "SW"]);
  });

  it("names the field when the highest dial number is not above the lowest", async () => {
    const owner = await newCustomer("thread-dial-bad");
    const ticket = await ticketFor(owner.client, { name: "dial.jpg", type: "image/jpeg", bytes: await jpeg() });
    const res = await owner.client.post("/api/portal/jobs", quoteBody([ticket], { dialEnds: { MW: { low: "160", high: "55" } } }));
    expect(res.status).toBe(400);
    const err = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(err.error.fields["dialEnds.MW.high"]).toMatch(/above the lowest/);
  });
});
