// The owner attaches a photo to a message; the technician sees it in the job's thread and the owner's
// request photos, dial-scale ends and phone on the triage tab; the technician answers and the owner finds the
// answer marked new, at desktop width and on a phone. Images are checked as drawn (naturalWidth > 0): a
// broken image has none.
import type { Browser, Locator } from "playwright-core";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO, newCustomer } from "../support/accounts";
import { launchBrowser, newContext, PHONE, signInPage, snap } from "../support/browser";
import { closeTestPool } from "../support/db";
import { jpegWithGps } from "../fixtures/images";
import { quoteBody, ticketFor } from "../fixtures/uploads";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestPool();
});

const allDrawn = (imgs: Locator) =>
  imgs.evaluateAll(
    (els) => els.length > 0 && els.every((i) => (i as HTMLImageElement).complete && (i as HTMLImageElement).naturalWidth > 0),
  );

async function photo(color: string): Promise<Buffer> {
  return sharp({ create: { width: 640, height: 480, channels: 3, background: color } })
    .jpeg()
    .toBuffer();
}

describe("photos on the thread and on triage", () => {
  it("carries the owner's photos to the bench and the shop's answer back to the owner", async () => {
    const owner = await newCustomer("e2e-thread");
    const ticket = await ticketFor(owner.client, { name: "front.jpg", type: "image/jpeg", bytes: await photo("#9c3d1c") });
    const created = await owner.client.post(
      "/api/portal/jobs",
      quoteBody([ticket], {
        dialEnds: { MW: { low: "55", high: "160" } },
        contactPreference: "phone",
        phone: "+1 360 555 0199",
      }),
    );
    expect(created.status).toBe(201);
    const { jobId } = (await created.json()) as { jobId: string };

    // The owner writes with a phone photo (GPS and all) attached.
    const ownerCtx = await newContext(browser);
    const op = await ownerCtx.newPage();
    await signInPage(op, owner.email, owner.password);
    await op.goto(`/portal/jobs/${jobId}`);
    const text = "The label inside the back cover, photographed just now.";
    await op.getByLabel("Write to the shop").fill(text);
    await op.locator("#message-photos").setInputFiles([{ name: "label.jpg", mimeType: "image/jpeg", buffer: await jpegWithGps() }]);
    await expect.poll(() => op.locator('li[data-status="done"]').count(), { timeout: 60_000 }).toBe(1);
    await op.getByRole("button", { name: "Send message" }).click();
    const mine = op.locator("ol > li", { hasText: text });
    await expect.poll(() => mine.count(), { timeout: 15_000 }).toBe(1);
    await expect.poll(() => allDrawn(mine.locator("img")), { timeout: 15_000 }).toBe(true);
    // The picker is empty again for the next message.
    await expect.poll(() => op.locator("li[data-status]").count()).toBe(0);
    await snap(op, "thread-01-owner-sent-photo");

    // The technician: request photos on triage drawn, contact and dial ends shown, the message new with its photo.
    const techCtx = await newContext(browser);
    const tp = await techCtx.newPage();
    await signInPage(tp, DEMO.tech.email, DEMO.tech.password);
    await tp.goto(`/bench/jobs/${jobId}`);
    const triagePhotos = tp.getByRole("list", { name: "Owner's photos" }).locator("img");
    await expect.poll(() => triagePhotos.count(), { timeout: 15_000 }).toBe(1);
    await expect.poll(() => allDrawn(triagePhotos), { timeout: 15_000 }).toBe(true);
    await expect.poll(() => tp.getByTestId("owner-contact").textContent()).toContain("+1 360 555 0199");
    await expect.poll(() => tp.getByTestId("owner-dial-ends").textContent()).toContain("MW: 55 – 160");
    const theirs = tp.locator("#thread-heading ~ ol > li", { hasText: text });
    await expect.poll(() => theirs.count(), { timeout: 15_000 }).toBe(1);
    expect(await theirs.getAttribute("data-unread")).toBe("true");
    await expect.poll(() => allDrawn(theirs.locator("img")), { timeout: 15_000 }).toBe(true);
    await snap(tp, "thread-02-bench-triage-and-thread");

    // The technician answers the owner; the job stays in its state.
    const answer = "Thank you: the chassis number matches the service sheet we have.";
    await tp.getByLabel("Message to the owner").fill(answer);
    await tp.getByRole("button", { name: "Send to the owner" }).click();
    await expect.poll(() => tp.locator("#thread-heading ~ ol > li", { hasText: answer }).count(), { timeout: 15_000 }).toBe(1);

    // Bench on a phone.
    const techPhone = await newContext(browser, PHONE);
    const tpp = await techPhone.newPage();
    await signInPage(tpp, DEMO.tech.email, DEMO.tech.password);
    await tpp.goto(`/bench/jobs/${jobId}`);
    await expect.poll(() => allDrawn(tpp.getByRole("list", { name: "Owner's photos" }).locator("img")), { timeout: 15_000 }).toBe(true);
    await snap(tpp, "thread-03-bench-phone");

    // The owner on a phone: the job list says there is news, the thread marks it new.
    const phone = await newContext(browser, PHONE);
    const pp = await phone.newPage();
    await signInPage(pp, owner.email, owner.password);
    await pp.goto("/portal");
    await expect.poll(() => pp.getByTestId("unread-messages").textContent(), { timeout: 15_000 }).toBe("1 new message");
    await snap(pp, "thread-04-owner-list-phone");
    await pp.goto(`/portal/jobs/${jobId}`);
    const reply = pp.locator("ol > li", { hasText: answer });
    await expect.poll(() => reply.count(), { timeout: 15_000 }).toBe(1);
    expect(await reply.getAttribute("data-unread")).toBe("true");
    await snap(pp, "thread-05-owner-reply-phone");
    // Seen once, it is no longer counted as new.
    await expect
      .poll(async () => {
        await pp.goto("/portal");
        return pp.getByTestId("unread-messages").count();
      })
      .toBe(0);

    for (const c of [ownerCtx, techCtx, techPhone, phone]) await c.close();
  });
});
