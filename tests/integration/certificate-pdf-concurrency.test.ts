import { PDFParse } from "pdf-parse";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO, signedIn } from "../support/accounts";
import { closeTestPool } from "../support/db";
import { createCertificate, haldaneConsole, IDS, stopQueue } from "./certificates-fixtures";

afterAll(async () => {
  await stopQueue();
  await closeTestPool();
});

async function pdfText(bytes: Uint8Array): Promise<string> {
  // A copy: the parser hands its input to a worker of its own, which detaches the buffer.
  const parser = new PDFParse({ data: new Uint8Array(bytes) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, " ");
  } finally {
    await parser.destroy();
  }
}

describe("certificate PDFs rendered off the request thread", () => {
  it("serve several at once, each its own certificate, while JSON routes keep answering", async () => {
    const mira = await createCertificate({ profile: haldaneConsole, maker: "Haldane", model: "Console 9" });
    const jonah = await createCertificate({ customerId: IDS.jonah, maker: "Aurelian", model: "Model 5T" });
    const owner = await signedIn(DEMO.customer);
    const staff = await signedIn(DEMO.tech);

    // Six at once, alternating holders: more than there are render threads, within the waiting line.
    const asked = Array.from({ length: 6 }, (_, i) => (i % 2 === 0 ? { client: owner, cert: mira } : { client: staff, cert: jonah }));
    let outstanding = asked.length;
    const pdfs = asked.map(async ({ client, cert }) => {
      const res = await client.get(`/api/certificates/${cert.certificateId}/pdf`);
      const bytes = new Uint8Array(await res.arrayBuffer());
      outstanding--;
      return { res, bytes, cert };
    });

    // JSON asked for while the PDFs are still being made.
    expect(outstanding).toBe(asked.length);
    const jobs = await owner.get("/api/portal/jobs");
    expect(jobs.status).toBe(200);
    expect(jobs.headers.get("content-type")).toContain("application/json");
    const list = (await jobs.json()) as { jobs: { id: string }[] };
    expect(list.jobs.map((j) => j.id)).toContain(mira.jobId);
    const health = await owner.get("/api/health");
    expect(await health.json()).toEqual({ ok: true, service: "bandedge" });

    const done = await Promise.all(pdfs);
    for (const { res, bytes, cert } of done) {
      expect(res.status, cert.code).toBe(200);
      expect(res.headers.get("content-type")).toBe("application/pdf");
      expect(res.headers.get("content-disposition")).toBe(`attachment; filename="certificate-${cert.code}.pdf"`);
      expect(Buffer.from(bytes.subarray(0, 5)).toString("latin1")).toBe("%PDF-");
      const raw = Buffer.from(bytes).toString("latin1");
      // The QR code is an embedded image and the text is set in the embedded IBM Plex fonts.
      expect(raw).toMatch(/\/Subtype\s*\/Image/);
      expect(raw).toMatch(/\/BaseFont\s*\/[A-Z]{6}\+IBMPlexSans/);
      expect(raw).toMatch(/\/BaseFont\s*\/[A-Z]{6}\+IBMPlexMono/);
      const text = await pdfText(bytes);
      expect(text).toContain(cert.code);
      expect(text).toMatch(/(Full|Limited) warranty/);
      expect(text).toMatch(/other rights which vary from state to state/);
      const otherCode = cert === mira ? jonah.code : mira.code;
      expect(text).not.toContain(otherCode);
    }
    expect(await pdfText(done[0]!.bytes)).toContain("Haldane Console 9");
    expect(await pdfText(done[1]!.bytes)).toContain("Aurelian Model 5T");
  });
});
