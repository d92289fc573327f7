import { randomUUID } from "node:crypto";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { PDFParse } from "pdf-parse";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO } from "../support/accounts";
import { launchBrowser, newContext, signInPage, snap } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import { testEnv } from "../support/env";
import { TestClient } from "../support/http";
import { firstLink, waitForMail, type ReceivedMail } from "../support/mail";
import { jpeg } from "../fixtures/images";
import { seedJobWithEstimate } from "../fixtures/jobs";
import { quoteBody, ticketFor } from "../fixtures/uploads";
import { AURELIAN_PROFILE, createJob } from "../integration/bench-fixtures";
import { createCertificate, stopQueue } from "../integration/certificates-fixtures";

// Stored text is shown as text everywhere: a script-bearing value typed into each writable field comes back
// literally on the pages that show it, in the e-mails (escaped, inert when the HTML is opened) and in the
// certificate PDF, and nothing it carries ever runs.

// Each field gets its own tag, so a failure names the field. Short forms for fields with tight limits.
const img = (tag: string) => `<img src=x onerror="window.__pwned='${tag}';alert('${tag}')">`;
const svg = (tag: string) => `"><svg onload="window.__pwned='${tag}'">`;
const script = (tag: string) => `<script>window.__pwned='${tag}'</script>`;
const all = (tag: string) => `${img(tag)} ${script(tag)} ${svg(tag)}`;

const P = {
  // Printed in a narrow box of the certificate: short enough to stay on one line there.
  name: `Ada <img src=x onerror=alert(7)>`,
  maker: img("maker"),
  model: svg("model"),
  serial: script("ser"),
  dialMarkings: all("dial"),
  symptoms: `Hums, then ${all("symptoms")}`,
  priorWork: `Recapped by a friend ${all("prior")}`,
  photo: `${img("photo")}.jpg`,
  message: `My answer: ${all("message")}`,
  question: `Does the lamp light? ${all("question")}`,
  note: `Bench note ${all("note")}`,
  lineTitle: `Inspect ${img("line")}`,
  lineReason: `Because ${script("reason")}`,
  partTitle: `Cap ${svg("part")}`,
  changeSummary: `Added a part ${all("summary")}`,
  ownerDecline: `Too dear ${all("odecline")}`,
  shopDecline: `No parts ${all("sdecline")}`,
  readingNote: `Plug reversed ${script("reading")}`,
  shopName: `Kestrel ${img("shop")}`,
  address: `1 Dial Row ${svg("addr")}`,
  terms: `Owners ${all("terms")}`,
  catalogueTitle: `Y-cap ${img("catalogue")}`,
  claim: `It hums again ${all("claim")}`,
  claimReason: `Dropped ${all("claimreason")}`,
  revoke: `Wrong serial ${all("revoke")}`,
  invite: `Felix ${img("invite")}`,
} as const;

type Tagged = keyof typeof P;

let browser: Browser;
const contexts: BrowserContext[] = [];

const state = {
  email: "",
  password: `tuning-fork-${randomUUID().slice(0, 6)}`,
  customerId: "",
  customer: new TestClient(),
  tech: new TestClient(),
  owner: new TestClient(),
  jobId: "",
  declinedByOwnerJob: "",
  declinedByShopJob: "",
  benchJob: "",
  certificateId: "",
  certificateCode: "",
  certificateJob: "",
  claimId: "",
  started: Date.now(),
};

// ---- What a page shows, and whether anything ran -------------------------------------------------------

/** Text as rendered (text nodes outside scripts, with no CSS transforms), form values and label-like attributes. */
function shownStrings(page: Page): Promise<string> {
  return page.evaluate(() => {
    const parts: string[] = [document.title];
    const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT, {
      acceptNode: (n) => (n.parentElement?.closest("script,style,noscript,template") ? NodeFilter.FILTER_REJECT : NodeFilter.FILTER_ACCEPT),
    });
    let text = "";
    while (walker.nextNode()) text += walker.currentNode.nodeValue ?? "";
    parts.push(text);
    document.querySelectorAll<HTMLInputElement | HTMLTextAreaElement>("input, textarea").forEach((e) => parts.push(e.value));
    document.querySelectorAll("[alt], [title], [aria-label]").forEach((e) => {
      for (const a of ["alt", "title", "aria-label"]) if (e.hasAttribute(a)) parts.push(e.getAttribute(a) ?? "");
    });
    return parts.join("\n");
  });
}

/** Elements a payload would have created if it had been parsed as markup. */
function liveMarkup(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const found = [...document.querySelectorAll("[onerror], [onload], img[src='x'], svg[onload]")].map((e) => e.outerHTML.slice(0, 160));
    for (const s of document.scripts) if ((s.textContent ?? "").trim().startsWith("window.__pwned")) found.push(s.outerHTML.slice(0, 160));
    return found;
  });
}

const pwned = (page: Page) => page.evaluate(() => (window as unknown as { __pwned?: unknown }).__pwned ?? null);

async function newPage(who?: { email: string; password: string }): Promise<Page> {
  const ctx = await newContext(browser);
  contexts.push(ctx);
  const page = await ctx.newPage();
  const dialogs: string[] = [];
  page.on("dialog", (d) => {
    dialogs.push(d.message());
    void d.dismiss();
  });
  (page as Page & { dialogs?: string[] }).dialogs = dialogs;
  if (who) await signInPage(page, who.email, who.password);
  return page;
}

const dialogsOf = (page: Page) => (page as Page & { dialogs?: string[] }).dialogs ?? [];

/**
 * Opens `path` (and every tab on it, when asked), waits until each expected value is shown literally,
 * then checks that nothing ran: no dialog, no window.__pwned, no element made from a payload.
 */
async function expectLiteral(page: Page, path: string, fields: Tagged[], shot: string, { tabs = false } = {}) {
  await page.goto(path);
  await page.waitForLoadState("networkidle");
  const collect = async () => {
    let seen = await shownStrings(page);
    if (tabs) {
      const count = await page.getByRole("tab").count();
      for (let i = 0; i < count; i++) {
        await page.getByRole("tab").nth(i).click();
        await page.waitForLoadState("networkidle");
        seen += `\n${await shownStrings(page)}`;
      }
    }
    return seen;
  };
  let seen = "";
  await expect
    .poll(
      async () => {
        seen = await collect();
        return fields.filter((f) => !seen.includes(P[f]));
      },
      { timeout: 20_000, message: `${path}: values not shown literally` },
    )
    .toEqual([]);
  await snap(page, `stored-text-${shot}`);
  expect(await pwned(page), `${path}: a payload ran`).toBeNull();
  expect(await liveMarkup(page), `${path}: markup made from a payload`).toEqual([]);
  expect(dialogsOf(page), `${path}: a dialog opened`).toEqual([]);
}

// ---- E-mails and the PDF -----------------------------------------------------------------------------

async function expectMailInert(page: Page, mail: ReceivedMail, fields: Tagged[]) {
  for (const f of fields) {
    expect(mail.html.includes(P[f]), `${mail.subject}: "${f}" appears as raw markup`).toBe(false);
    // The plain-text part wraps long lines and may capitalise headings: compared without spaces and case.
    expect(squash(mail.text).toLowerCase(), `${mail.subject}: "${f}" in the plain-text part`).toContain(squash(P[f]).toLowerCase());
  }
  expect(mail.html).not.toMatch(/<(img|svg)\b[^>]*\son(error|load)\s*=/i);
  expect(mail.html).not.toMatch(/<script>\s*window\.__pwned/i);
  expect(mail.html).toMatch(/&lt;(img|svg|script)/);
  // Opened as a mail client would open it: the values read literally and nothing runs.
  await page.setContent(mail.html, { waitUntil: "load" });
  const seen = await shownStrings(page);
  for (const f of fields) expect(seen, `${mail.subject}: "${f}" as shown`).toContain(P[f]);
  expect(await pwned(page), `${mail.subject}: a payload ran`).toBeNull();
  expect(await liveMarkup(page)).toEqual([]);
  expect(dialogsOf(page)).toEqual([]);
}

async function pdfText(client: TestClient, certificateId: string): Promise<string> {
  const res = await client.get(`/api/certificates/${certificateId}/pdf`);
  expect(res.status).toBe(200);
  expect(res.headers.get("content-type")).toBe("application/pdf");
  const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
  try {
    return (await parser.getText()).text;
  } finally {
    await parser.destroy();
  }
}

const squash = (s: string) => s.replace(/\s+/g, "");

async function ok(res: Response, what: string): Promise<unknown> {
  const text = await res.text();
  if (res.status >= 300) throw new Error(`${what}: ${res.status} ${text.slice(0, 400)}`);
  return text ? JSON.parse(text) : null;
}

// ---- The shop settings are shared: the suite puts the original values back through the office API --------

let originalSettings: Record<string, unknown> | undefined;

async function restoreSettings() {
  if (!originalSettings) return;
  // Another suite may save in between (a 409 for a stale version): read the version again and retry.
  for (let attempt = 0; ; attempt++) {
    const now = (await ok(await state.owner.get("/api/office/settings"), "settings")) as { version: number };
    const res = await state.owner.request("/api/office/settings", { method: "PUT", json: { ...originalSettings, version: now.version } });
    if (res.status === 409 && attempt < 3) continue;
    await ok(res, "restore settings");
    break;
  }
  originalSettings = undefined;
}

beforeAll(async () => {
  browser = await launchBrowser();
  await state.tech.signIn(DEMO.tech.email, DEMO.tech.password);
  await state.owner.signIn(DEMO.owner.email, DEMO.owner.password);
});

afterAll(async () => {
  await restoreSettings();
  for (const c of contexts) await c.close().catch(() => undefined);
  await browser?.close();
  await stopQueue();
  await closeTestPool();
});

describe("stored text is shown literally", () => {
  it("a sign-up name and a whole quote request", async () => {
    state.email = `literal-${randomUUID().slice(0, 8)}@example.com`;
    await ok(await state.customer.signUp(P.name, state.email, state.password), "sign-up");
    const verify = await waitForMail(state.email, "Confirm your e-mail");
    const mailPage = await newPage();
    await expectMailInert(mailPage, verify, ["name"]);
    await state.customer.follow(firstLink(verify, "verify-email"));
    await state.customer.signIn(state.email, state.password);
    const [u] = await sql<{ id: string }>(`select id from "user" where email = $1`, [state.email]);
    state.customerId = u!.id;

    const ticket = await ticketFor(state.customer, { name: P.photo, type: "image/jpeg", bytes: await jpeg({ width: 400, height: 300 }) });
    const body = quoteBody([ticket], {
      maker: P.maker,
      model: P.model,
      serial: P.serial,
      dialMarkings: P.dialMarkings,
      symptoms: P.symptoms,
      priorWork: P.priorWork,
    });
    const created = (await ok(await state.customer.post("/api/portal/jobs", body), "quote request")) as { jobId: string };
    state.jobId = created.jobId;
    const received = await waitForMail(state.email, "We received your quote request");
    await expectMailInert(mailPage, received, ["name", "maker", "model"]);
  });

  it("triage: a question, the owner's answer, a bench note, estimate lines and a change summary", async () => {
    const job = `/api/bench/jobs/${state.jobId}`;
    await ok(await state.tech.post(`${job}/triage`, {}), "triage");
    await ok(await state.tech.post(`${job}/question`, { question: P.question, idempotencyKey: randomUUID() }), "question");
    const question = await waitForMail(state.email, "A question about your");
    const mailPage = await newPage();
    await expectMailInert(mailPage, question, ["question", "maker", "model"]);
    await ok(
      await state.customer.post(`/api/portal/jobs/${state.jobId}/messages`, { body: P.message, idempotencyKey: randomUUID() }),
      "answer",
    );
    await ok(await state.tech.post(`${job}/notes`, { body: P.note, idempotencyKey: randomUUID() }), "bench note");

    const line = (over: Record<string, unknown>) => ({
      key: randomUUID().slice(0, 8),
      kind: "labour",
      category: "inspection",
      minutes: 30,
      quantity: 1,
      reason: "",
      readings: [],
      unitCost: "",
      markupPercent: "",
      covered: false,
      ...over,
    });
    const lines = [
      line({ code: "inspect.literal", title: P.lineTitle, reason: P.lineReason }),
      line({
        code: "part.literal",
        kind: "part",
        category: "parts",
        minutes: 0,
        title: P.partTitle,
        unitCost: "4.50",
        markupPercent: "35",
      }),
    ];
    const draft = (await ok(await state.tech.get(`${job}/estimate`), "estimate")) as { version: number };
    const saved = (await ok(
      await state.tech.request(`${job}/estimate`, { method: "PUT", json: { version: draft.version, lines } }),
      "save estimate",
    )) as { version: number };
    await ok(await state.tech.post(`${job}/estimate/send`, { version: saved.version }), "send estimate");
    const ready = await waitForMail(state.email, "is ready");
    await expectMailInert(mailPage, ready, ["name", "maker", "model"]);
    const again = (await ok(
      await state.tech.request(`${job}/estimate`, {
        method: "PUT",
        json: {
          version: saved.version,
          lines: [...lines, line({ code: "test.literal", category: "test", title: "Burn-in for two hours" })],
        },
      }),
      "save revision 2",
    )) as { version: number };
    await ok(await state.tech.post(`${job}/estimate/send`, { version: again.version, changeSummary: P.changeSummary }), "send revision 2");
    const revised = await waitForMail(state.email, "Revised estimate");
    await expectMailInert(mailPage, revised, ["changeSummary", "maker", "model"]);
  });

  it("the owner's job page and the bench job page show every one of them as text", async () => {
    const portal = await newPage({ email: state.email, password: state.password });
    await expectLiteral(
      portal,
      `/portal/jobs/${state.jobId}`,
      ["maker", "model", "serial", "symptoms", "priorWork", "message", "question", "lineTitle", "partTitle", "changeSummary"],
      "portal-job",
    );
    await expectLiteral(portal, "/portal", ["maker", "model"], "portal-list");

    const bench = await newPage(DEMO.tech);
    await expectLiteral(
      bench,
      `/bench/jobs/${state.jobId}`,
      ["name", "maker", "model", "symptoms", "priorWork", "photo", "message", "question", "note", "lineTitle", "lineReason", "partTitle"],
      "bench-job",
      { tabs: true },
    );
    await expectLiteral(bench, "/bench", ["name", "maker", "model"], "bench-queue-all");
    // The dial markings the owner typed are kept with the set as typed (no page shows them yet).
    const detail = (await ok(await state.tech.get(`/api/bench/jobs/${state.jobId}`), "bench job")) as {
      set: { profile: { ownerReport?: { dialMarkings?: string } } };
    };
    expect(detail.set.profile.ownerReport?.dialMarkings).toBe(P.dialMarkings);
  });

  it("decline reasons from the owner and from the shop", async () => {
    const seeded = await seedJobWithEstimate({ email: state.email });
    state.declinedByOwnerJob = seeded.jobId;
    await ok(
      await state.customer.post(`/api/portal/jobs/${seeded.jobId}/estimate/decline`, {
        revisionId: seeded.revisionId,
        reason: P.ownerDecline,
      }),
      "owner declines",
    );
    const triaged = await createJob({ customerEmail: state.email, state: "in_triage", technicianEmail: DEMO.tech.email });
    state.declinedByShopJob = triaged.jobId;
    await ok(await state.tech.post(`/api/bench/jobs/${triaged.jobId}/decline`, { reason: P.shopDecline }), "shop declines");

    const portal = await newPage({ email: state.email, password: state.password });
    await expectLiteral(portal, `/portal/jobs/${state.declinedByOwnerJob}`, ["ownerDecline"], "portal-declined-by-owner");
    await expectLiteral(portal, `/portal/jobs/${state.declinedByShopJob}`, ["shopDecline"], "portal-declined-by-shop");
    const bench = await newPage(DEMO.tech);
    await expectLiteral(bench, `/bench/jobs/${state.declinedByOwnerJob}`, ["ownerDecline"], "bench-declined-by-owner", { tabs: true });
    await expectLiteral(bench, `/bench/jobs/${state.declinedByShopJob}`, ["shopDecline"], "bench-declined-by-shop", { tabs: true });
  });

  it("a reading note: kept as typed, and the bench sheet that carries it runs nothing", async () => {
    const onBench = await createJob({
      customerEmail: state.email,
      maker: P.maker,
      model: P.model,
      state: "on_bench",
      profile: { ...AURELIAN_PROFILE },
      technicianEmail: DEMO.tech.email,
    });
    state.benchJob = onBench.jobId;
    await ok(
      await state.tech.post(`/api/bench/jobs/${onBench.jobId}/readings`, { key: "leakage.plug-b", value: 0.12, note: P.readingNote }),
      "reading",
    );
    const sheet = (await ok(await state.tech.get(`/api/bench/jobs/${onBench.jobId}/sheet`), "sheet")) as {
      requirements: { key: string; note: string | null }[];
    };
    expect(sheet.requirements.find((r) => r.key === "leakage.plug-b")?.note).toBe(P.readingNote);
    const bench = await newPage(DEMO.tech);
    await expectLiteral(bench, `/bench/jobs/${onBench.jobId}`, ["maker", "model"], "bench-sheet", { tabs: true });
  });

  it("the office's shop name, address, part names and warranty wording, and the certificate made with them", async () => {
    const current = (await ok(await state.owner.get("/api/office/settings"), "settings")) as {
      values: Record<string, unknown>;
      version: number;
    };
    originalSettings = structuredClone(current.values);
    try {
      const v = structuredClone(current.values) as {
        identity: { name: string; addressText: string };
        warrantyTerms: { whoIsCovered: string; shopWording: string };
      } & Record<string, unknown>;
      v.identity.name = P.shopName;
      v.identity.addressText = `${P.address}\nPort Alder`;
      v.warrantyTerms.whoIsCovered = P.terms;
      v.warrantyTerms.shopWording = P.terms;
      await ok(
        await state.owner.request("/api/office/settings", { method: "PUT", json: { ...v, version: current.version } }),
        "save settings",
      );

      const office = await newPage(DEMO.owner);
      await expectLiteral(office, "/office/settings", ["shopName", "address", "terms"], "office-settings");
      // A part's name is the shop's text too: the parts page prints it as typed.
      const [yCap] = await sql<{ id: string; name: string }>("select id, name from part where code = 'cap.y2'");
      await ok(
        await state.owner.request(`/api/office/parts/${yCap!.id}`, { method: "PATCH", json: { name: P.catalogueTitle } }),
        "rename a part",
      );
      try {
        await expectLiteral(office, "/office/parts", ["catalogueTitle"], "office-parts");
      } finally {
        await sql("update part set name = $2 where id = $1", [yCap!.id, yCap!.name]);
      }

      // Issued while these settings are in force: the certificate keeps the shop's words as signed.
      const cert = await createCertificate({ customerId: state.customerId, maker: P.maker, model: P.model, serial: "AU-52-7301" });
      state.certificateId = cert.certificateId;
      state.certificateCode = cert.code;
      state.certificateJob = cert.jobId;
    } finally {
      await restoreSettings();
    }
    const issued = await waitForMail(state.email, "Warranty certificate for your");
    const mailPage = await newPage();
    await expectMailInert(mailPage, issued, ["name", "maker", "model"]);

    const raw = await pdfText(state.customer, state.certificateId);
    mkdirSync(testEnv.artifacts, { recursive: true });
    writeFileSync(join(testEnv.artifacts, "stored-text-certificate.txt"), raw);
    const text = squash(raw);
    for (const f of ["shopName", "address", "terms", "maker", "model", "name"] as const)
      expect(text, `certificate PDF: "${f}"`).toContain(squash(P[f]));

    const visitor = await newPage();
    await expectLiteral(visitor, `/verify/${state.certificateCode}`, ["shopName", "maker", "model"], "verify-valid");
  });

  it("a claim description and the decision reason", async () => {
    const opened = (await ok(
      await state.customer.post("/api/claims", {
        certificateId: state.certificateId,
        symptomCategory: "hum",
        description: P.claim,
        statements: [],
        photos: [],
      }),
      "claim",
    )) as { claim: { id: string } };
    state.claimId = opened.claim.id;
    const bench = await newPage(DEMO.tech);
    await expectLiteral(bench, "/bench/claims", ["maker", "model"], "bench-claims");
    await expectLiteral(bench, `/bench/claims/${state.claimId}`, ["claim", "maker", "model"], "bench-claim");

    await ok(
      await state.tech.post(`/api/claims/${state.claimId}/decision`, {
        decision: "reject",
        reason: P.claimReason,
        findings: ["excl.physical-damage"],
      }),
      "decision",
    );
    const decided = await waitForMail(state.email, "Warranty claim not covered");
    const mailPage = await newPage();
    await expectMailInert(mailPage, decided, ["claimReason", "maker", "model"]);
    const portal = await newPage({ email: state.email, password: state.password });
    await expectLiteral(portal, `/portal/claims/${state.claimId}`, ["claim", "claimReason", "maker", "model"], "portal-claim");
    await expectLiteral(portal, "/portal/claims", ["maker", "model"], "portal-claims");
    await expectLiteral(portal, `/portal/jobs/${state.certificateJob}`, ["maker", "model"], "portal-certificate-job");
  });

  it("a revocation reason on the verification page and the PDF", async () => {
    await ok(await state.owner.post(`/api/certificates/${state.certificateId}/revoke`, { reason: P.revoke }), "revoke");
    const visitor = await newPage();
    await expectLiteral(visitor, `/verify/${state.certificateCode}`, ["revoke", "maker", "model"], "verify-revoked");
    const office = await newPage(DEMO.owner);
    await expectLiteral(office, "/office/certificates", ["maker", "model"], "office-certificates");
    await expectLiteral(office, "/office/audit?action=certificate.revoke", ["revoke"], "office-audit-revoke");
    await expectLiteral(office, "/office/audit?action=estimate.decline", ["name", "ownerDecline"], "office-audit-decline");
    const text = squash(await pdfText(state.customer, state.certificateId));
    expect(text).toContain(squash(P.revoke));
  });

  it("a staff invitation's name, through the office's own form", async () => {
    const email = `invitee-${randomUUID().slice(0, 8)}@kestrel-lane.example`;
    const office = await newPage(DEMO.owner);
    await office.goto("/office/staff");
    await office.getByLabel("Name").fill(P.invite);
    await office.getByLabel("E-mail").fill(email);
    await office.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => office.getByText(`Invitation sent to ${email}.`).count()).toBe(1);
    await expectLiteral(office, "/office/staff", ["invite"], "office-staff");
    const invite = await waitForMail(email, "invited");
    const mailPage = await newPage();
    await expectMailInert(mailPage, invite, ["invite"]);
  });
});
