import fc from "fast-check";
import { PDFParse } from "pdf-parse";
import { afterAll, describe, expect, it } from "vitest";
import { canonicalJson, CODE_LENGTH } from "@/lib/engine/certificates";
import { formatReading } from "@/lib/engine/certificates/tables";
import { verifyStoredCertificate } from "@/lib/server/services/certificates";
import { type CertificateDocument } from "@/lib/engine/certificates/document";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool, sql } from "../support/db";
import { TestClient } from "../support/http";
import { firstLink, waitForMail } from "../support/mail";
import { createCertificate, createReturnedJob, haldaneConsole, issueFor, stopQueue } from "./certificates-fixtures";

afterAll(async () => {
  await stopQueue();
  await closeTestPool();
});

type Row = {
  id: string;
  code: string;
  content: CertificateDocument;
  signature: string;
  key_id: string;
  keyId: string;
  term_ends_at: Date;
  customer_id: string;
};

async function loadRow(id: string): Promise<Row> {
  const [row] = await sql<Row>(
    `select id, code, content, signature, key_id, key_id as "keyId", term_ends_at, customer_id from certificate where id = $1`,
    [id],
  );
  return row!;
}

async function pdfText(res: Response): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
  try {
    return (await parser.getText()).text;
  } finally {
    await parser.destroy();
  }
}

describe("issuing a certificate when a set is returned", () => {
  it("snapshots exactly the readings, ticked lines and parts recorded for the job, signed", async () => {
    const job = await createReturnedJob({ profile: haldaneConsole, maker: "Haldane", model: "Console 9" });
    const t0 = Date.now() - 50;
    const { certificateId, code } = await issueFor(job.jobId);
    expect(code.replaceAll("-", "")).toHaveLength(CODE_LENGTH);
    const row = await loadRow(certificateId);
    const d = row.content;

    const stored = await sql<{ key: string; value: number; unit: string; verdict: string; tolerance_text: string }>(
      "select key, value, unit, verdict, tolerance_text from reading where job_id = $1 order by key",
      [job.jobId],
    );
    expect(stored.length).toBeGreaterThan(10);
    const onCert = new Map(d.readings.map((r) => [r.key, r]));
    expect(onCert.size).toBe(stored.length);
    for (const r of stored) {
      const c = onCert.get(r.key);
      expect(c, r.key).toBeDefined();
      expect(c!.value, r.key).toBe(r.value);
      expect(c!.unit, r.key).toBe(r.unit);
      expect(c!.verdict, r.key).toBe(r.verdict);
      expect(c!.toleranceText, r.key).toBe(r.tolerance_text);
    }
    // Every band: the printed dial range from the profile, its measured edges present.
    expect(d.bands.map((b) => [b.lowKHz, b.highKHz])).toEqual(haldaneConsole.bands.map((b) => [b.lowKHz, b.highKHz]));
    for (const b of d.bands) {
      expect(onCert.get(`band.${b.index}.edge.low`)?.value).toBe(stored.find((s) => s.key === `band.${b.index}.edge.low`)!.value);
      expect(onCert.get(`band.${b.index}.edge.high`)?.value).toBe(stored.find((s) => s.key === `band.${b.index}.edge.high`)!.value);
    }
    expect(d.work.map((w) => w.code).sort()).toEqual(job.tasks.map((t) => t.code).sort());
    expect(d.parts.map((p) => p.code).sort()).toEqual([...job.partCodes].sort());
    expect(d.set).toMatchObject({ maker: "Haldane", model: "Console 9", year: 1952, kind: "tube-transformer" });
    expect(d.technician.name).toBe("Tomas Reyne");
    expect(d.shop.name).toBe("Kestrel Lane Wireless");
    // The term runs from the day after the return (the usual convention for a warranty "of N days from return").
    const dayAfter = new Date(Date.parse(`${d.completedOn}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
    expect(d.warranty).toMatchObject({ designation: "limited", termDays: 90, startsOn: dayAfter });
    expect(d.terms.rightsSentence).toMatch(/other rights which vary from state to state/);
    expect(d.terms.howToClaim.length).toBeGreaterThan(0);
    expect(new Date(row.term_ends_at).toISOString().slice(0, 10)).toBe(d.warranty.endsOn);
    expect(verifyStoredCertificate(row)).toBe(true);

    const audit = await sql("select 1 from audit_event where entity = 'certificate' and entity_id = $1 and action = 'certificate.issue'", [
      certificateId,
    ]);
    expect(audit).toHaveLength(1);

    // Issuing again (a retried return) hands back the same certificate.
    expect(await issueFor(job.jobId)).toEqual({ certificateId, code });
    expect(await sql("select 1 from certificate where job_id = $1", [job.jobId])).toHaveLength(1);

    const mail = await waitForMail(DEMO.customer.email, /Warranty certificate for your Haldane Console 9/, { after: t0 });
    expect(firstLink(mail, `/verify/${code}`)).toContain(`/verify/${code}`);
    expect(firstLink(mail, `/api/certificates/${certificateId}/pdf`)).toContain("/pdf");
  });

  it("refuses a job that has not been returned", async () => {
    const job = await createReturnedJob();
    await sql("update job set state = 'paid_in_full' where id = $1", [job.jobId]);
    await expect(issueFor(job.jobId)).rejects.toMatchObject({ code: "conflict" });
  });
});

describe("the certificate PDF", () => {
  it("carries every measured band edge and the designation, for the holder and staff only", async () => {
    const c = await createCertificate({ profile: haldaneConsole, maker: "Haldane", model: "Console 9" });
    const owner = await signedIn(DEMO.customer);
    const res = await owner.get(`/api/certificates/${c.certificateId}/pdf`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("cache-control")).toContain("no-store");
    const text = (await pdfText(res)).replace(/\s+/g, " ");
    expect(text).toContain("Limited warranty");
    expect(text).toContain(c.code);
    const edges = c.readings.filter((r) => /^band\.\d+\.edge\./.test(r.key));
    expect(edges).toHaveLength(haldaneConsole.bands.length * 2);
    for (const e of edges) expect(text, e.key).toContain(formatReading(e.value, "kHz"));
    expect(text).toContain("at most 0.5 mA");
    expect(text).toMatch(/other rights which vary from state to state/);

    const tech = await signedIn(DEMO.tech);
    expect((await tech.get(`/api/certificates/${c.certificateId}/pdf`)).status).toBe(200);
    const other = await signedIn(DEMO.customer2);
    expect((await other.get(`/api/certificates/${c.certificateId}/pdf`)).status).toBe(404);
    expect((await new TestClient().get(`/api/certificates/${c.certificateId}/pdf`)).status).toBe(401);
  });
});

// The PDF's pages as a reader meets them: each page's text in drawing order (top to bottom, the order the
// renderer lays the document out) and how far down the page its text reaches. The repeated footer line is left
// out of both. pdfjs-dist (the parser pdf-parse is built on) gives each text run's position.
async function pdfPages(bytes: Uint8Array): Promise<{ text: string; reach: number }[]> {
  const { getDocument } = await import("pdfjs-dist/legacy/build/pdf.mjs");
  const doc = await getDocument({ data: bytes, isEvalSupported: false }).promise;
  try {
    const pages: { text: string; reach: number }[] = [];
    for (let n = 1; n <= doc.numPages; n++) {
      const page = await doc.getPage(n);
      const height = page.getViewport({ scale: 1 }).height;
      const items = (await page.getTextContent()).items.filter(
        (i): i is { str: string; transform: number[] } & typeof i => "str" in i && i.str.trim() !== "",
      );
      const footerLines = new Set(items.filter((i) => i.str.includes("Ed25519")).map((i) => i.transform[5]));
      const body = items.filter((i) => !footerLines.has(i.transform[5]));
      const lowest = Math.min(...body.map((i) => i.transform[5]!));
      pages.push({
        text: body
          .map((i) => i.str)
          .join(" ")
          .replace(/\s+/g, " "),
        reach: (height - lowest) / height,
      });
    }
    return pages;
  } finally {
    await doc.destroy();
  }
}

// What a "below" or "above" in the certificate's own wording points to, and the text that starts it.
const REFERENTS: { pattern: RegExp; target: string }[] = [
  { pattern: /exclusions (below|above)$/, target: "What is not covered" },
  { pattern: /address (below|above)$/, target: "Warrantor." },
];

describe("the certificate PDF reads in order", () => {
  for (const [name, opts] of [
    ["a one-band table set", {}],
    ["a four-band console", { profile: haldaneConsole, maker: "Haldane", model: "Console 9" }],
  ] as const) {
    it(`${name}: every "below" and "above" points the right way, and the last page is not a short tail`, async () => {
      const c = await createCertificate(opts);
      const owner = await signedIn(DEMO.customer);
      const res = await owner.get(`/api/certificates/${c.certificateId}/pdf`);
      expect(res.status).toBe(200);
      const pages = await pdfPages(new Uint8Array(await res.arrayBuffer()));
      const all = pages.map((p) => p.text).join(" ");

      const refs = [...all.matchAll(/\b(below|above)\b/g)];
      expect(refs.length).toBeGreaterThan(0);
      for (const m of refs) {
        const before = all.slice(Math.max(0, m.index - 60), m.index + m[0].length);
        const referent = REFERENTS.find((r) => r.pattern.test(before));
        // A reference the table does not know is a reference nobody has checked.
        expect(referent, `unchecked reference: "…${before}"`).toBeDefined();
        const targets = [...all.matchAll(new RegExp(referent!.target.replace(/[.]/g, "\\.") + "", "g"))].map((t) => t.index);
        if (m[1] === "below")
          expect(
            targets.some((t) => t > m.index),
            `"…${before}" but nothing of it follows`,
          ).toBe(true);
        else
          expect(
            targets.some((t) => t < m.index),
            `"…${before}" but nothing of it comes before`,
          ).toBe(true);
      }

      // The written terms are read as one piece: from their heading to the rights sentence on one page.
      const termsPage = pages.findIndex((p) => /warranty — the terms/i.test(p.text));
      expect(termsPage).toBeGreaterThanOrEqual(0);
      expect(pages[termsPage]!.text).toMatch(/other rights which vary from state to state/);

      // Typesetting practice (common practice: no short "widow" page at the end of a document): the last
      // page's text reaches at least a third of the way down it.
      expect(pages.length).toBeGreaterThan(1);
      expect(pages.at(-1)!.reach).toBeGreaterThan(1 / 3);
    });
  }
});

describe("signatures", () => {
  it("never verify after a random byte flip in the signature or the content", async () => {
    const c = await createCertificate();
    const row = await loadRow(c.certificateId);
    expect(verifyStoredCertificate(row)).toBe(true);
    const sig = Buffer.from(row.signature, "base64url");
    fc.assert(
      fc.property(fc.nat({ max: sig.length - 1 }), fc.integer({ min: 1, max: 255 }), (i, mask) => {
        const flipped = Buffer.from(sig);
        flipped[i] = flipped[i]! ^ mask;
        return verifyStoredCertificate({ content: row.content, signature: flipped.toString("base64url"), keyId: row.keyId }) === false;
      }),
      { numRuns: 300 },
    );
    const bytes = Buffer.from(canonicalJson(row.content), "utf8");
    fc.assert(
      fc.property(fc.nat({ max: bytes.length - 1 }), fc.integer({ min: 1, max: 255 }), (i, mask) => {
        const flipped = Buffer.from(bytes);
        flipped[i] = flipped[i]! ^ mask;
        let content: unknown;
        try {
          content = JSON.parse(flipped.toString("utf8"));
        } catch {
          return true; // not even JSON: nothing a row could hold
        }
        return (
          verifyStoredCertificate({ content: content as Record<string, unknown>, signature: row.signature, keyId: row.keyId }) === false
        );
      }),
      { numRuns: 300 },
    );
  });
});

describe("the public verification page", () => {
  it("shows what a buyer needs and nothing personal, and is not indexed", async () => {
    const c = await createCertificate({ serial: "AU-52-1187" });
    const html = await (await new TestClient().get(`/verify/${c.code}`)).text();
    expect(html).toContain("Valid");
    expect(html).toContain("Aurelian");
    expect(html).toContain("Model 5T");
    expect(html).toContain("AU••••87");
    expect(html).not.toContain("AU-52-1187");
    expect(html).not.toContain("Mira Holloway");
    expect(html).not.toContain(DEMO.customer.email);
    expect(html).toMatch(/<meta name="robots" content="noindex, nofollow"/);
    for (const e of c.readings.filter((r) => /^band\.\d+\.edge\./.test(r.key))) expect(html).toContain(formatReading(e.value, "kHz"));
    // Lower case and spaces are read as the same code.
    const loose = await new TestClient().get(`/verify/${c.code.toLowerCase()}`);
    expect(loose.status).toBe(307);
    expect(loose.headers.get("location")).toContain(`/verify/${c.code}`);
  });

  it("says a certificate altered in the database cannot be verified", async () => {
    const c = await createCertificate();
    const before = await (await new TestClient().get(`/verify/${c.code}`)).text();
    expect(before).not.toContain("cannot be verified");
    await sql("update certificate set content = jsonb_set(content, '{readings,0,value}', '1234.5') where id = $1", [c.certificateId]);
    const after = await (await new TestClient().get(`/verify/${c.code}`)).text();
    expect(after).toContain("This certificate cannot be verified");
    expect(after).not.toContain("Band edges");
    const owner = await signedIn(DEMO.customer);
    expect((await owner.get(`/api/certificates/${c.certificateId}/pdf`)).status).toBe(409);
  });

  it("shows expired, revoked (with the reason) and superseded certificates as such", async () => {
    const old = await createCertificate({ returnedDaysAgo: 120 });
    expect(await (await new TestClient().get(`/verify/${old.code}`)).text()).toContain("Expired");

    const owner = await signedIn(DEMO.owner);
    const customer = await signedIn(DEMO.customer);
    const r = await createCertificate();
    expect((await customer.post(`/api/certificates/${r.certificateId}/revoke`, { reason: "Set returned under a false name" })).status).toBe(
      404,
    );
    const bad = await owner.post(`/api/certificates/${r.certificateId}/revoke`, { reason: "" });
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.fields.reason).toBeTruthy();
    expect((await owner.post(`/api/certificates/${r.certificateId}/revoke`, { reason: "Issued for the wrong chassis" })).status).toBe(200);
    const revoked = await (await new TestClient().get(`/verify/${r.code}`)).text();
    expect(revoked).toContain("Revoked");
    expect(revoked).toContain("Issued for the wrong chassis");

    const s = await createCertificate();
    await sql("update reading set value = value + 0.5 where job_id = $1 and key = 'band.0.edge.low'", [s.jobId]);
    const re = await owner.post(`/api/certificates/${s.certificateId}/reissue`, { reason: "Low band edge re-measured" });
    expect(re.status).toBe(200);
    const { code: newCode, certificateId: newId } = (await re.json()) as { code: string; certificateId: string };
    const superseded = await (await new TestClient().get(`/verify/${s.code}`)).text();
    expect(superseded).toContain("Superseded");
    expect(superseded).toContain(newCode);
    const fresh = await (await new TestClient().get(`/verify/${newCode}`)).text();
    expect(fresh).toContain("Valid");
    expect(fresh).toContain(s.code);
    const newRow = await loadRow(newId);
    const low = s.readings.find((x) => x.key === "band.0.edge.low")!;
    expect(newRow.content.readings.find((x) => x.key === "band.0.edge.low")!.value).toBe(low.value + 0.5);
    expect(newRow.content.warranty.startsOn).toBe((await loadRow(s.certificateId)).content.warranty.startsOn);
    // A superseded certificate cannot be corrected or claimed again.
    expect((await owner.post(`/api/certificates/${s.certificateId}/reissue`, { reason: "Second try at it" })).status).toBe(409);
  });

  it("answers unknown and malformed codes plainly", async () => {
    const unknown = await (await new TestClient().get("/verify/0000-0000-0000-0000-0000-0000-0000")).text();
    expect(unknown).toContain("No certificate has this code");
    const malformed = await (await new TestClient().get("/verify/not-a-code")).text();
    expect(malformed).toContain("That is not a certificate code");
  });

  // Guessing codes is what a limit is for; opening a real certificate is what buyers do (common practice:
  // a limit on failed lookups, as with sign-in, and HTTP 429 with Retry-After per RFC 6585 §4).
  it("limits guessing per client address with 429 and Retry-After, and a page that says so", async () => {
    const guesser = new TestClient();
    const statuses: number[] = [];
    let limited: Response | undefined;
    for (let i = 0; i < 70 && !limited; i++) {
      const res = await guesser.get(`/verify/${String(i).padStart(4, "0")}-7777-7777-7777-7777-7777-7777`);
      statuses.push(res.status);
      if (res.status === 429) limited = res;
      else expect(await res.text()).toContain("No certificate has this code");
    }
    expect(statuses.slice(0, 60).every((s) => s === 404)).toBe(true);
    expect(limited?.status).toBe(429);
    const retryAfter = Number(limited!.headers.get("retry-after"));
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(60);
    const html = await limited!.text();
    expect(html).toContain("Too many unknown codes from your connection");
    expect(html).toContain("<main");
    // A real certificate still opens from the same address, and other addresses are not limited.
    const c = await createCertificate();
    const own = await guesser.get(`/verify/${c.code}`);
    expect(own.status).toBe(200);
    expect(await own.text()).toContain("Valid");
    expect((await new TestClient().get("/verify/0000-7777-7777-7777-7777-7777-7777")).status).toBe(404);
  });

  it("opens a real certificate any number of times from one address", async () => {
    const c = await createCertificate();
    const buyer = new TestClient();
    const answers = new Set<string>();
    for (let i = 0; i < 200; i++) {
      const res = await buyer.get(`/verify/${c.code}`);
      const html = await res.text();
      answers.add(`${res.status} ${html.includes(c.code) && html.includes("Valid") ? "the certificate" : "something else"}`);
    }
    expect([...answers]).toEqual(["200 the certificate"]);
  });

  it("serves the kept page without scripts, under the response's security policy", async () => {
    const c = await createCertificate();
    for (let i = 0; i < 2; i++) {
      const res = await new TestClient().get(`/verify/${c.code}`);
      expect(res.headers.get("content-security-policy")).toContain("script-src");
      const html = await res.text();
      expect(html).toContain(c.code);
      expect(html).not.toMatch(/<script\b/i);
      expect(html).toMatch(/<link[^>]+rel="stylesheet"/);
      // The fonts every other page announces in its Link header are preloaded from the kept HTML itself, so
      // they are there for the first paint and the text does not move when they arrive (a layout shift).
      const fonts = [...html.matchAll(/<link rel="preload" href="(\/_next\/static\/media\/[^"]+\.woff2)" as="font" crossorigin=""/g)].map(
        (m) => m[1],
      );
      const announced = (await new TestClient().get("/sign-in")).headers.get("link") ?? "";
      expect(fonts.length).toBeGreaterThan(0);
      for (const f of fonts) expect(announced).toContain(f);
    }
    // The address the app renders from is not a way around the checks.
    const direct = await new TestClient().get(`/verify/${c.code}/sheet`);
    expect(direct.status).toBeGreaterThanOrEqual(300);
    expect(direct.status).toBeLessThan(400);
    expect(direct.headers.get("location")).toContain(`/verify/${c.code}`);
    const forged = await new TestClient().get(`/verify/${c.code}/sheet`, { headers: { "x-bandedge-verify-render": "guess" } });
    expect(forged.headers.get("location")).toContain(`/verify/${c.code}`);
  });

  it("shows a revocation at the very next view after a page was kept", async () => {
    const c = await createCertificate();
    const buyer = new TestClient();
    for (let i = 0; i < 3; i++) expect(await (await buyer.get(`/verify/${c.code}`)).text()).toContain("Valid");
    const owner = await signedIn(DEMO.owner);
    expect((await owner.post(`/api/certificates/${c.certificateId}/revoke`, { reason: "Chassis number misread" })).status).toBe(200);
    const after = await (await buyer.get(`/verify/${c.code}`)).text();
    expect(after).toContain("Revoked");
    expect(after).toContain("Chassis number misread");
  });

  it("shows a row changed by hand as not valid once it changes, even after the page was kept", async () => {
    const c = await createCertificate();
    const buyer = new TestClient();
    const signedMaker = (await loadRow(c.certificateId)).content.set.maker;
    for (let i = 0; i < 3; i++) expect(await (await buyer.get(`/verify/${c.code}`)).text()).toContain("Valid");
    // The signed set changes maker: nothing in the services sees this, only the row does.
    await sql(`update certificate set content = jsonb_set(content, '{set,maker}', '"Corvane"') where id = $1`, [c.certificateId]);
    const after = await (await buyer.get(`/verify/${c.code}`)).text();
    expect(after).toContain("This certificate cannot be verified");
    expect(after).not.toContain("Valid");
    // And back to what was signed: genuine again.
    await sql(`update certificate set content = jsonb_set(content, '{set,maker}', to_jsonb($2::text)) where id = $1`, [
      c.certificateId,
      signedMaker,
    ]);
    expect(await (await buyer.get(`/verify/${c.code}`)).text()).toContain("Valid");
  });

  // 2026-03-01 02:00 UTC is 28 February, 18:00 in Los Angeles (UTC−8 in winter) and 1 March, 15:00 in Auckland
  // (UTC+13 in the southern summer) (IANA tz database, from memory). The zone is changed in SQL, as another
  // app instance or a hand edit would: only the shared row tells this instance that its kept page is stale.
  it("prints the revocation day in the shop's zone of the moment, even after the page was kept", async () => {
    const c = await createCertificate();
    const [{ time_zone: zoneBefore }] = (await sql<{ time_zone: string }>("select time_zone from shop_settings where id = 'shop'")) as [
      { time_zone: string },
    ];
    try {
      await sql("update shop_settings set time_zone = 'America/Los_Angeles' where id = 'shop'");
      await sql(`update certificate set revoked_at = '2026-03-01T02:00:00Z', revoke_reason = 'Chassis number misread' where id = $1`, [
        c.certificateId,
      ]);
      const buyer = new TestClient();
      for (let i = 0; i < 3; i++) expect(await (await buyer.get(`/verify/${c.code}`)).text()).toContain("Revoked on 28 February 2026");
      await sql("update shop_settings set time_zone = 'Pacific/Auckland' where id = 'shop'");
      const after = await (await buyer.get(`/verify/${c.code}`)).text();
      expect(after).toContain("Revoked on 1 March 2026");
      expect(after).not.toContain("28 February 2026");
    } finally {
      await sql("update shop_settings set time_zone = $1 where id = 'shop'", [zoneBefore]);
    }
  });

  // The client router asks for a Server Components payload (header RSC: 1) when it prefetches or follows a link
  // (Next.js App Router, common practice); a body it cannot read would stay open, so the answer has none and
  // the router loads the address as a document.
  it("answers the client router's payload request without a body", async () => {
    const c = await createCertificate();
    const client = new TestClient();
    let res = await client.get(`/verify/${c.code}`, { headers: { rsc: "1", "next-router-prefetch": "1" } });
    // The framework first sends the router to the address with its cache-busting parameter.
    for (let hops = 0; hops < 3 && res.status >= 300 && res.status < 400; hops++)
      res = await client.get(res.headers.get("location")!, { headers: { rsc: "1", "next-router-prefetch": "1" } });
    expect(res.status).toBe(204);
    expect(await res.text()).toBe("");
  });
});

describe("who may see certificates", () => {
  it("keeps the office list to the shop owner", async () => {
    await createCertificate();
    expect((await (await signedIn(DEMO.owner)).get("/office/certificates")).status).toBe(200);
    expect((await (await signedIn(DEMO.customer)).get("/office/certificates")).status).toBe(404);
    expect((await (await signedIn(DEMO.tech)).get("/office/certificates")).status).toBe(404);
  });
});
