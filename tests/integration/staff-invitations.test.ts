import { createHash, randomBytes, randomUUID } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { listMail, waitForMail } from "../support/mail";
import { paidPaymentWithCharge } from "./office-fixtures";
import { createCertificate, stopQueue } from "./certificates-fixtures";
import { createJob } from "./bench-fixtures";

// Staff invitations are their own single-use tokens, made only by the owner's invite action; a
// password-reset request, which anyone may send for any address, never produces one. Tokens are stored as
// SHA-256 digests and work once (common practice: OWASP Forgot Password cheat sheet, "single use" and
// "stored securely"). Irreversible acts tell the person concerned by e-mail.

afterAll(async () => {
  await stopQueue();
  await closeTestPool();
});

async function userIdOf(email: string): Promise<string> {
  const [row] = await sql<{ id: string }>(`select id from "user" where email = $1`, [email]);
  if (!row) throw new Error(`no user ${email}`);
  return row.id;
}

/** An invitation as the owner's invite action writes it, with a token the test knows. */
async function invitation({ email, expiresIn = "7 days" }: { email: string; expiresIn?: string }) {
  const userId = randomUUID();
  await sql(`insert into "user" (id, name, email, email_verified, role) values ($1, 'Felix Apprentice', $2, true, 'technician')`, [
    userId,
    email,
  ]);
  const token = randomBytes(32).toString("base64url");
  await sql(
    `insert into staff_invitation (id, user_id, token_hash, role, invited_by, expires_at)
     values ($1, $2, $3, 'technician', 'demo-owner-odile', now() + $4::interval)`,
    [randomUUID(), userId, createHash("sha256").update(token).digest("hex"), expiresIn],
  );
  return { userId, token };
}

describe("a password-reset request", () => {
  it("never sends an invitation, whatever its redirect says", async () => {
    const { email } = await newCustomer("no-invite");
    const started = Date.now();
    for (const redirectTo of ["/reset-password?welcome=1", "/reset-password?welcome=true&role=technician"]) {
      const res = await new TestClient().post("/api/auth/request-password-reset", { email, redirectTo });
      expect(res.status).toBe(200);
    }
    await waitForMail(email, "Choose a new password", { after: started });
    await new Promise((r) => setTimeout(r, 1500));
    const mails = (await listMail(email)).filter((m) => new Date(m.createdAt).getTime() >= started);
    expect(mails.length).toBeGreaterThan(0);
    for (const m of mails) {
      expect(m.subject).toBe("Choose a new password");
      // The invitation's own wording (emails/staff-invite.tsx), never the reset link's query string.
      expect(m.html).not.toMatch(/Welcome to the workshop|added you to Bandedge/);
    }
  });
});

describe("accepting a staff invitation", () => {
  it("sets the password once; the link does not work a second time", async () => {
    const email = `felix-${randomUUID().slice(0, 8)}@kestrel-lane.example`;
    const { userId, token } = await invitation({ email });
    const first = await new TestClient().post("/api/staff-invitations/accept", { token, password: "solder-sucker-77" });
    expect(first.status).toBe(200);
    const tech = new TestClient();
    await tech.signIn(email, "solder-sucker-77");
    expect((await tech.get("/api/bench/staff")).status).toBe(200);

    const again = await new TestClient().post("/api/staff-invitations/accept", { token, password: "taking-it-over-99" });
    expect(again.status).toBe(404);
    expect(((await again.json()) as { error: { message: string } }).error.message).toMatch(/expired or was already used/);
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password: "taking-it-over-99" })).status).toBe(401);
    const [row] = await sql<{ audited: number }>(
      "select count(*)::int as audited from audit_event where action = 'staff.invitation_accepted' and entity_id = $1",
      [userId],
    );
    expect(row!.audited).toBe(1);
  });

  it("refuses an expired invitation, an unknown token and a common password, naming the field", async () => {
    const { token } = await invitation({ email: `late-${randomUUID().slice(0, 8)}@kestrel-lane.example`, expiresIn: "-1 minute" });
    expect((await new TestClient().post("/api/staff-invitations/accept", { token, password: "solder-sucker-77" })).status).toBe(404);
    expect(
      (await new TestClient().post("/api/staff-invitations/accept", { token: "made-up-token", password: "solder-sucker-77" })).status,
    ).toBe(404);
    const fresh = await invitation({ email: `weak-${randomUUID().slice(0, 8)}@kestrel-lane.example` });
    const weak = await new TestClient().post("/api/staff-invitations/accept", { token: fresh.token, password: "password123" });
    expect(weak.status).toBe(400);
    expect(((await weak.json()) as { error: { fields: Record<string, string> } }).error.fields.password).toMatch(/commonly used/);
    // The refused attempt did not use up the invitation.
    expect(
      (await new TestClient().post("/api/staff-invitations/accept", { token: fresh.token, password: "solder-sucker-77" })).status,
    ).toBe(200);
  });

  it("is not a password-reset token, and a reset token is not an invitation", async () => {
    const email = `cross-${randomUUID().slice(0, 8)}@kestrel-lane.example`;
    const { token } = await invitation({ email });
    expect((await new TestClient().post("/api/auth/reset-password", { newPassword: "solder-sucker-77", token })).status).toBe(400);
    const { email: customer } = await newCustomer("cross-reset");
    const started = Date.now();
    await new TestClient().post("/api/auth/request-password-reset", { email: customer, redirectTo: "/reset-password" });
    const mail = await waitForMail(customer, "Choose a new password", { after: started });
    const resetToken = decodeURIComponent(/reset-password\/([^/?#"]+)/.exec(mail.html)![1]!);
    expect((await new TestClient().post("/api/staff-invitations/accept", { token: resetToken, password: "solder-sucker-77" })).status).toBe(
      404,
    );
  });
});

describe("irreversible acts tell the person concerned", () => {
  it("e-mails the customer when a refund is started, naming the amount and the job", async () => {
    const { paymentId, jobId } = await paidPaymentWithCharge(12_000);
    const [customer] = await sql<{ email: string; number: number }>(
      `select u.email, j.number from job j join "user" u on u.id = j.customer_id where j.id = $1`,
      [jobId],
    );
    const started = Date.now();
    const owner = await signedIn(DEMO.owner);
    const res = await owner.post(`/api/office/payments/${paymentId}/refunds`, { amount: "25.00", reason: "Kept the original knobs" });
    expect(res.status).toBe(202);
    const mail = await waitForMail(customer!.email, "Refund of USD 25.00", { after: started });
    expect(mail.html).toContain(`KL-${String(customer!.number).padStart(4, "0")}`);
  });

  it("e-mails the owner of the set when its certificate is revoked, with the reason", async () => {
    const { email } = await newCustomer("revoked");
    const cert = await createCertificate({ customerId: await userIdOf(email) });
    const started = Date.now();
    const owner = await signedIn(DEMO.owner);
    expect((await owner.post(`/api/certificates/${cert.certificateId}/revoke`, { reason: "Issued for the wrong chassis" })).status).toBe(
      200,
    );
    const mail = await waitForMail(email, `Warranty certificate ${cert.code} was revoked`, { after: started });
    expect(mail.html).toContain("Issued for the wrong chassis");
  });
});

describe("a set owner's account converted to staff", () => {
  it("keeps its own jobs, certificates and claims in the portal, answers them as their owner, and sees no one else's", async () => {
    // A set owner with a returned job and its certificate, and a job whose estimate is waiting for an answer.
    const { client: before, email } = await newCustomer("converted");
    const holderId = await userIdOf(email);
    const cert = await createCertificate({ customerId: holderId });
    const waiting = await createJob({ customerEmail: email, state: "in_triage", technicianEmail: DEMO.tech.email });
    const shop = await signedIn(DEMO.tech);
    const { version, lines } = (await (await shop.get(`/api/bench/jobs/${waiting.jobId}/estimate`)).json()) as {
      version: number;
      lines: unknown[];
    };
    const saved = await shop.request(`/api/bench/jobs/${waiting.jobId}/estimate`, { method: "PUT", json: { version, lines } });
    const sent = await shop.post(`/api/bench/jobs/${waiting.jobId}/estimate/send`, {
      version: ((await saved.json()) as { version: number }).version,
    });
    expect(sent.status).toBe(200);
    expect((await before.get("/api/portal/jobs")).status).toBe(200);
    // Someone else's job, which the converted account must not reach through the portal.
    const other = await createJob({ customerEmail: DEMO.customer.email });

    // What the owner's confirmed conversion writes (inviteStaffMember): the role changes, sessions end and an
    // invitation is made; the person then sets a password through the real invitation route.
    await sql(`update "user" set role = 'technician' where id = $1`, [holderId]);
    await sql(`delete from session where user_id = $1`, [holderId]);
    const token = randomBytes(32).toString("base64url");
    await sql(
      `insert into staff_invitation (id, user_id, token_hash, role, invited_by, expires_at)
       values ($1, $2, $3, 'technician', 'demo-owner-odile', now() + interval '7 days')`,
      [randomUUID(), holderId, createHash("sha256").update(token).digest("hex")],
    );
    expect((await new TestClient().post("/api/staff-invitations/accept", { token, password: "grid-leak-resistor-52" })).status).toBe(200);
    const converted = new TestClient();
    await converted.signIn(email, "grid-leak-resistor-52");

    // Its own jobs are listed (old behaviour: 404, the portal was gone with the customer role).
    const list = await converted.get("/api/portal/jobs");
    expect(list.status).toBe(200);
    const ids = ((await list.json()) as { jobs: { id: string }[] }).jobs.map((j) => j.id);
    expect(ids).toEqual(expect.arrayContaining([cert.jobId, waiting.jobId]));
    expect(ids).not.toContain(other.jobId);
    expect((await converted.get(`/api/portal/jobs/${other.jobId}`)).status).toBe(404);

    // The certificate is on its job page and under warranty claims, and its PDF downloads.
    const claimsPage = await (await converted.get("/portal/claims")).text();
    expect(claimsPage).toContain(cert.code);
    expect((await converted.get(`/api/certificates/${cert.certificateId}/pdf`)).status).toBe(200);

    // It answers its own estimate as the set's owner.
    const view = (await (await converted.get(`/api/portal/jobs/${waiting.jobId}`)).json()) as { estimate: { id: string } };
    const approved = await converted.post(`/api/portal/jobs/${waiting.jobId}/estimate/approve`, { revisionId: view.estimate.id });
    expect(approved.status).toBe(200);
    const [row] = await sql<{ state: string; decided_by: string }>(
      "select j.state, r.decided_by from job j join estimate_revision r on r.job_id = j.id where j.id = $1 and r.status = 'approved'",
      [waiting.jobId],
    );
    expect(row).toEqual({ state: "approved", decided_by: holderId });

    // Staff views are unchanged, and the header offers both areas.
    expect((await converted.get("/api/bench/staff")).status).toBe(200);
    const portalPage = await (await converted.get("/portal")).text();
    expect(portalPage).toMatch(/href="\/portal"[^>]*>My sets</);
    expect(portalPage).toMatch(/href="\/bench"[^>]*>Bench</);
    // New requests stay with set owners' accounts.
    expect((await converted.get("/portal/request")).status).toBe(404);

    // A staff account holding nothing of its own has no portal, as before.
    expect((await shop.get("/api/portal/jobs")).status).toBe(404);
    expect(await (await shop.get("/bench")).text()).not.toMatch(/href="\/portal"[^>]*>My sets</);
  });
});
