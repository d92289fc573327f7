import { PDFParse } from "pdf-parse";
import { afterAll, describe, expect, it } from "vitest";
import { dayInZone, formatDate, formatDateTime, formatDay } from "@/lib/engine/dates";
import { addDays } from "@/lib/engine/warranty/term";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { waitForMail } from "../support/mail";
import { createCertificate, stopQueue } from "./certificates-fixtures";

// Pacific/Kiritimati is UTC+14 and Pacific/Pago_Pago UTC-11, all year (IANA tz database, from memory): 25 hours
// apart, so at any instant they are on different calendar days, and every date a person reads must change
// when the shop moves from one to the other, whenever the test runs.
const EAST = "Pacific/Kiritimati";
const WEST = "Pacific/Pago_Pago";

type Snapshot = { version: number; values: { identity: Record<string, unknown> } & Record<string, unknown> };

let original: string | null = null;

async function setZone(owner: TestClient, timeZone: string): Promise<Response> {
  const now = (await (await owner.get("/api/office/settings")).json()) as Snapshot;
  original ??= now.values.identity.timeZone as string;
  return owner.request("/api/office/settings", {
    method: "PUT",
    json: { ...now.values, version: now.version, identity: { ...now.values.identity, timeZone } },
  });
}

async function pdfText(res: Response): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, " ");
  } finally {
    await parser.destroy();
  }
}

/** The days an event that happened between two instants can fall on in a zone (one, unless midnight passed). */
const daysBetween = (from: number, to: number, zone: string) => [dayInZone(from, zone), dayInZone(to, zone)];

afterAll(async () => {
  if (original) await setZone(await signedIn(DEMO.owner), original);
  await stopQueue();
  await closeTestPool();
});

describe("the shop's time zone", () => {
  it("refuses a zone it does not know and names the field", async () => {
    const owner = await signedIn(DEMO.owner);
    for (const bad of ["Mars/Olympus_Mons", "+01:00", "EST"]) {
      const res = await setZone(owner, bad);
      expect(res.status, bad).toBe(400);
      const body = (await res.json()) as { error: { fields: Record<string, string> } };
      expect(body.error.fields["identity.timeZone"], bad).toMatch(/^Time zone: /);
    }
    const page = await (await owner.get("/office/settings")).text();
    expect(page).toContain("Time zone");
  });

  it("a page, an e-mail and the certificate PDF follow the setting; the certificate's days never shift", async () => {
    const owner = await signedIn(DEMO.owner);
    const customer = await signedIn(DEMO.customer);

    // Issued while the shop keeps UTC+14: the return day is that zone's day, and so is the end of the term
    // the e-mail names (90 days after, the term counting from the day after the return).
    expect((await setZone(owner, EAST)).status).toBe(200);
    const t0 = Date.now();
    const c = await createCertificate({ maker: "Corvane", model: `Zone East ${t0}` });
    const t1 = Date.now();
    const [{ content }] = (await sql<{ content: { completedOn: string; warranty: { endsOn: string } } }>(
      "select content from certificate where id = $1",
      [c.certificateId],
    )) as [{ content: { completedOn: string; warranty: { endsOn: string } } }];
    expect(daysBetween(t0 - 50, t1, EAST)).toContain(content.completedOn);
    expect(content.warranty.endsOn).toBe(addDays(content.completedOn, 90));

    const mail = await waitForMail(DEMO.customer.email, `Zone East ${t0}`, { after: t0 - 1000 });
    expect(mail.text.replace(/\s+/g, " ")).toContain(`until ${formatDay(content.warranty.endsOn)}`);
    // The development mailbox lists the message with its time in the shop's zone, the zone named.
    const box = await (await owner.get(`/mailbox?${new URLSearchParams({ to: DEMO.customer.email, id: mail.id })}`)).text();
    expect(box).toContain(formatDateTime(mail.createdAt, { timeZone: EAST, style: "compact", showZone: true }));

    // Revoked now: the verification page and the PDF give the day of the revocation in the shop's zone.
    expect((await owner.post(`/api/certificates/${c.certificateId}/revoke`, { reason: "Wrong chassis number" })).status).toBe(200);
    const [{ revoked_at }] = (await sql<{ revoked_at: Date }>("select revoked_at from certificate where id = $1", [c.certificateId])) as [
      { revoked_at: Date },
    ];
    const [{ at: auditAt }] = (await sql<{ at: Date }>(
      "select at from audit_event where action = 'certificate.revoke' and entity_id = $1",
      [c.certificateId],
    )) as [{ at: Date }];
    const returned = formatDay(content.completedOn);
    for (const zone of [EAST, WEST]) {
      if (zone === WEST) expect((await setZone(owner, WEST)).status).toBe(200);
      const revokedOn = formatDate(revoked_at, { timeZone: zone });
      const verify = await (await new TestClient().get(`/verify/${c.code}`)).text();
      expect(verify, zone).toContain(`Revoked on ${revokedOn}`);
      const pdf = await pdfText(await customer.get(`/api/certificates/${c.certificateId}/pdf`));
      expect(pdf, zone).toContain(`REVOKED on ${revokedOn}`);
      // A calendar day prints as itself in any zone.
      // (The PDF sets its labels in capitals.)
      expect(pdf.toLowerCase(), zone).toContain(`returned ${returned}`.toLowerCase());
      expect(pdf.toLowerCase(), zone).toContain(`term ends ${formatDay(content.warranty.endsOn)}`.toLowerCase());
      // Staff pages: the audit log writes the revocation's time in the shop's zone.
      const audit = await (await owner.get("/office/audit?action=certificate.revoke")).text();
      expect(audit, zone).toContain(formatDateTime(auditAt, { timeZone: zone, style: "compact" }));
    }
    expect(formatDate(revoked_at, { timeZone: EAST })).not.toBe(formatDate(revoked_at, { timeZone: WEST }));

    // Issued after the move west: the same moment is a day earlier there, and the e-mail says so.
    const t2 = Date.now();
    const w = await createCertificate({ maker: "Corvane", model: `Zone West ${t2}` });
    const t3 = Date.now();
    const [{ content: west }] = (await sql<{ content: { completedOn: string; warranty: { endsOn: string } } }>(
      "select content from certificate where id = $1",
      [w.certificateId],
    )) as [{ content: { completedOn: string; warranty: { endsOn: string } } }];
    expect(daysBetween(t2 - 50, t3, WEST)).toContain(west.completedOn);
    const westMail = await waitForMail(DEMO.customer.email, `Zone West ${t2}`, { after: t2 - 1000 });
    expect(westMail.text.replace(/\s+/g, " ")).toContain(`until ${formatDay(west.warranty.endsOn)}`);
  });
});
