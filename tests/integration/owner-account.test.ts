import { PDFParse } from "pdf-parse";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { firstLink, waitForMail } from "../support/mail";
import { seedJobWithEstimate } from "../fixtures/jobs";

async function pdfText(res: Response): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, " ");
  } finally {
    await parser.destroy();
  }
}

afterAll(async () => {
  await closeTestPool();
});

type Answer = { error?: { code: string; message: string; fields?: Record<string, string> } };

const US = { recipient: "Test Owner", line1: "14 Kestrel Lane", city: "Port Alder", region: "ME", postalCode: "04101", country: "US" };

async function addAddress(client: TestClient, body: Record<string, unknown>) {
  const res = await client.post("/api/portal/account/addresses", body);
  return { status: res.status, body: (await res.json()) as Answer & { address?: { id: string; postalCode: string; lines: string[] } } };
}

describe("address book", () => {
  it("checks the postal code and region by country and names the field in the error", async () => {
    const { client } = await newCustomer("addr");
    // Each wrong code against the postal operator's published form (USPS, Canada Post, Royal Mail, PostNL,
    // Deutsche Post; from memory).
    for (const [body, field, starts] of [
      [{ ...US, postalCode: "0410" }, "postalCode", "ZIP code:"],
      [{ ...US, region: "" }, "region", "State:"],
      [{ ...US, country: "CA", region: "ON", postalCode: "D1A 0B1" }, "postalCode", "Postal code:"],
      [{ ...US, country: "GB", region: "", postalCode: "SW1A" }, "postalCode", "Postcode:"],
      [{ ...US, country: "NL", region: "", postalCode: "1012" }, "postalCode", "Postal code:"],
      [{ ...US, country: "DE", region: "", postalCode: "1011" }, "postalCode", "Postal code:"],
      [{ ...US, country: "XX" }, "country", "Country:"],
      [{ ...US, line1: "" }, "line1", "Street and number:"],
    ] as const) {
      const { status, body: answer } = await addAddress(client, body);
      expect(status, JSON.stringify(body)).toBe(400);
      expect(answer.error?.fields?.[field], JSON.stringify(answer)).toMatch(new RegExp(`^${starts.replace("(", "\\(")}`));
    }
    // Accepted ones are stored in the country's spelling; the first address becomes the default.
    const ca = await addAddress(client, { ...US, country: "CA", region: "Ontario", postalCode: "k1a0b1", city: "Ottawa" });
    expect(ca.status).toBe(201);
    expect(ca.body.address!.postalCode).toBe("K1A 0B1");
    expect(ca.body.address!.lines).toContain("OTTAWA ON  K1A 0B1");
    const ie = await addAddress(client, { ...US, country: "IE", region: "", postalCode: "", city: "Galway" });
    expect(ie.status).toBe(201);
    const list = (await (await client.get("/api/portal/account/addresses")).json()) as { addresses: { id: string; isDefault: boolean }[] };
    expect(list.addresses.map((a) => a.isDefault)).toEqual([true, false]);
  });

  it("keeps one default, moves it when the default is removed, and answers 404 for another owner's address", async () => {
    const a = await newCustomer("addr-a");
    const b = await newCustomer("addr-b");
    const first = (await addAddress(a.client, US)).body.address!.id;
    const second = (await addAddress(a.client, { ...US, line1: "2 Quay Street", isDefault: true })).body.address!.id;
    const rows = await sql<{ id: string; is_default: boolean }>(
      `select id, is_default from owner_address where owner_id = (select id from "user" where email = $1)`,
      [a.email],
    );
    expect(rows.filter((r) => r.is_default).map((r) => r.id)).toEqual([second]);
    // Someone else's address: not found, and unchanged.
    expect((await b.client.request(`/api/portal/account/addresses/${first}`, { method: "PATCH", json: US })).status).toBe(404);
    expect((await b.client.request(`/api/portal/account/addresses/${first}`, { method: "DELETE" })).status).toBe(404);
    expect(await sql("select 1 from owner_address where id = $1", [first])).toHaveLength(1);
    expect((await a.client.request(`/api/portal/account/addresses/${second}`, { method: "DELETE" })).status).toBe(200);
    expect(await sql<{ is_default: boolean }>("select is_default from owner_address where id = $1", [first])).toEqual([
      { is_default: true },
    ]);
  });
});

describe("profile", () => {
  it("uses the quote request's phone rule: reaching by phone needs a number", async () => {
    const { client, email } = await newCustomer("profile");
    const bad = await client.request("/api/portal/account", {
      method: "PATCH",
      json: { name: "Test Owner", phone: "", contactPreference: "phone" },
    });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as Answer).error?.fields?.phone).toMatch(/^Phone number: /);
    const ok = await client.request("/api/portal/account", {
      method: "PATCH",
      json: { name: "Test Owner", phone: "+1 207 555 0142", contactPreference: "phone" },
    });
    expect(ok.status).toBe(200);
    expect(await sql(`select phone, contact_preference from "user" where email = $1`, [email])).toEqual([
      { phone: "+1 207 555 0142", contact_preference: "phone" },
    ]);
  });
});

describe("change of e-mail", () => {
  it("keeps the old address until the link sent to the new one is opened", async () => {
    const { client, email, password } = await newCustomer("mail-old");
    const newEmail = email.replace("mail-old", "mail-new");
    const res = await client.post("/api/auth/change-email", { newEmail, callbackURL: "/portal/account?email=changed" });
    expect(res.status).toBe(200);
    expect(await sql(`select 1 from "user" where email = $1`, [email])).toHaveLength(1);
    expect(await sql(`select 1 from "user" where email = $1`, [newEmail])).toHaveLength(0);
    // The old address still signs in; the new one does not yet.
    expect((await new TestClient().post("/api/auth/sign-in/email", { email: newEmail, password })).ok).toBe(false);
    const mail = await waitForMail(newEmail, "Confirm your e-mail");
    await client.follow(firstLink(mail, "verify-email"));
    expect(await sql<{ email_verified: boolean }>(`select email_verified from "user" where email = $1`, [newEmail])).toEqual([
      { email_verified: true },
    ]);
    expect(await sql(`select 1 from "user" where email = $1`, [email])).toHaveLength(0);
    await new TestClient().signIn(newEmail, password);
    expect(await sql(`select 1 from audit_event where action = 'auth.email_change_requested'`)).not.toHaveLength(0);
  });
});

describe("change of password", () => {
  it("needs the current password, follows the sign-up rules and ends the other sessions", async () => {
    const { client, email, password } = await newCustomer("pw");
    const other = await signedIn({ email, password });
    expect((await other.get("/api/portal/account")).status).toBe(200);
    const wrong = await client.post("/api/auth/change-password", { currentPassword: "not-my-password", newPassword: "valve-glow-1948-y" });
    expect(wrong.ok).toBe(false);
    // The same rules as sign-up: too short, and on the common-passwords list.
    // (From the other session's client address: the sign-in service allows three password changes per address in
    // ten seconds.)
    expect((await other.post("/api/auth/change-password", { currentPassword: password, newPassword: "short" })).ok).toBe(false);
    const common = await client.post("/api/auth/change-password", { currentPassword: password, newPassword: "password123" });
    expect(((await common.json()) as { code?: string }).code).toBe("PASSWORD_TOO_COMMON");
    // Even a caller that asks to keep its other sessions has them ended.
    const ok = await client.post("/api/auth/change-password", {
      currentPassword: password,
      newPassword: "valve-glow-1948-y",
      revokeOtherSessions: false,
    });
    expect(ok.status).toBe(200);
    expect((await other.get("/api/portal/account")).status).toBe(401);
    expect((await client.get("/api/portal/account")).status).toBe(200);
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password })).ok).toBe(false);
    await new TestClient().signIn(email, "valve-glow-1948-y");
  });
});

describe("return address on a job", () => {
  it("keeps the chosen address as it was when the address book changes, and shows it to the owner and the bench", async () => {
    const { client, email } = await newCustomer("ship");
    const other = await newCustomer("ship-other");
    const addressId = (await addAddress(client, { ...US, recipient: "Ship Owner" })).body.address!.id;
    const job = await seedJobWithEstimate({ email, state: "deposit_paid" });
    const path = `/api/portal/jobs/${job.jobId}/return-address`;
    // Another owner can neither use this address nor touch this job.
    const foreignAddress = (await addAddress(other.client, US)).body.address!.id;
    expect((await client.request(path, { method: "PUT", json: { addressId: foreignAddress } })).status).toBe(404);
    expect((await other.client.request(path, { method: "PUT", json: { addressId: foreignAddress } })).status).toBe(404);
    expect((await client.request(path, { method: "PUT", json: { addressId } })).status).toBe(200);

    const edited = await client.request(`/api/portal/account/addresses/${addressId}`, {
      method: "PATCH",
      json: { ...US, recipient: "Ship Owner", line1: "99 Other Road", city: "Bangor", postalCode: "04401" },
    });
    expect(edited.status).toBe(200);
    const view = (await (await client.get(`/api/portal/jobs/${job.jobId}`)).json()) as { job: { returnAddress: { lines: string[] } } };
    expect(view.job.returnAddress.lines).toEqual(["Ship Owner", "14 Kestrel Lane", "PORT ALDER, ME 04101", "UNITED STATES"]);
    const tech = await signedIn(DEMO.tech);
    const detail = (await (await tech.get(`/api/bench/jobs/${job.jobId}`)).json()) as { shipTo: { lines: string[]; chosen: boolean } };
    expect(detail.shipTo).toEqual({ lines: ["Ship Owner", "14 Kestrel Lane", "PORT ALDER, ME 04101", "UNITED STATES"], chosen: true });
    // The printable estimate ships to the job's copy, not to the edited address-book entry.
    const estimatePdf = await client.get(`/api/documents/estimates/${job.jobId}/pdf`);
    expect(estimatePdf.status).toBe(200);
    const printed = await pdfText(estimatePdf);
    expect(printed).toMatch(/Ship to/i);
    expect(printed).toContain("14 Kestrel Lane");
    expect(printed).not.toContain("99 Other Road");
    // Removing the address leaves the job's copy.
    expect((await client.request(`/api/portal/account/addresses/${addressId}`, { method: "DELETE" })).status).toBe(200);
    const after = (await (await client.get(`/api/portal/jobs/${job.jobId}`)).json()) as { job: { returnAddress: { lines: string[] } } };
    expect(after.job.returnAddress.lines[1]).toBe("14 Kestrel Lane");
    // The owner's job page tells where the set goes back.
    expect(await (await client.get(`/portal/jobs/${job.jobId}`)).text()).toContain("Where we send the set back");
  });
});

describe("closing the account", () => {
  it("is refused while a job is open, naming it; then anonymises, ends sessions and keeps the job's records", async () => {
    const { client, email, password } = await newCustomer("close");
    await client.request("/api/portal/account", {
      method: "PATCH",
      json: { name: "Close Owner", phone: "+1 207 555 0199", contactPreference: "phone" },
    });
    await addAddress(client, US);
    const job = await seedJobWithEstimate({ email, state: "on_bench" });
    const [{ number }] = (await sql<{ number: number }>("select number from job where id = $1", [job.jobId])) as [{ number: number }];
    const refused = await client.post("/api/portal/account/close", { password, confirm: true });
    expect(refused.status).toBe(409);
    expect(((await refused.json()) as Answer).error?.message).toContain(`KL-${String(number).padStart(4, "0")}`);

    await sql("update job set state = 'returned' where id = $1", [job.jobId]);
    const wrong = await client.post("/api/portal/account/close", { password: "not-my-password", confirm: true });
    expect(wrong.status).toBe(400);
    expect(((await wrong.json()) as Answer).error?.fields?.password).toMatch(/^Password: /);
    const noTick = await client.post("/api/portal/account/close", { password });
    expect(((await noTick.json()) as Answer).error?.fields?.confirm).toMatch(/^Confirmation: /);

    const [{ id }] = (await sql<{ id: string }>(`select id from "user" where email = $1`, [email])) as [{ id: string }];
    const done = await client.post("/api/portal/account/close", { password, confirm: true });
    expect(done.status).toBe(200);
    const [u] = await sql<{ name: string; email: string; phone: string | null; closed_at: Date | null }>(
      `select name, email, phone, closed_at from "user" where id = $1`,
      [id],
    );
    expect(u).toMatchObject({ name: "Closed account", phone: null });
    expect(u!.email).not.toBe(email);
    expect(u!.email).toMatch(/@closed\.invalid$/);
    expect(u!.closed_at).not.toBeNull();
    for (const table of ["owner_address where owner_id", "session where user_id", "account where user_id"]) {
      expect(await sql(`select 1 from ${table} = $1`, [id]), table).toHaveLength(0);
    }
    // The shop's records stay, tied to the closed account: the job, its estimate and its history.
    expect(await sql("select 1 from job where id = $1 and customer_id = $2", [job.jobId, id])).toHaveLength(1);
    expect(await sql("select 1 from estimate_revision where job_id = $1", [job.jobId])).toHaveLength(1);
    expect(await sql("select 1 from audit_event where action = 'account.close' and entity_id = $1", [id])).toHaveLength(1);
    // Signed out everywhere, and the old address signs in no more.
    expect((await client.get("/api/portal/account")).status).toBe(401);
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password })).ok).toBe(false);
    // The office still reads the job, under the closed account's name.
    const owner = await signedIn(DEMO.owner);
    const detail = (await (await owner.get(`/api/bench/jobs/${job.jobId}`)).json()) as { customer: { name: string } };
    expect(detail.customer.name).toBe("Closed account");
  });
});
