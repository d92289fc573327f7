// The quote request by keyboard alone: Tab, typing, arrow keys, Space and Enter reach and operate every
// control, focus stays visible, and photo uploads are announced. Choosing the file in the system dialog is the
// one step that is not the page's (a keyboard user does it in the OS dialog); here playwright fills it in.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { newCustomer } from "../support/accounts";
import { launchBrowser, newContext, snap } from "../support/browser";
import { closeTestPool, sql } from "../support/db";
import { focused, signInByKeyboard, tabTo as tabToMatching, type Focused } from "../support/keyboard";
import { jpeg } from "../fixtures/images";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestPool();
});

// Every control reached here must also show its focus outline.
function tabTo(page: Page, match: (f: Focused) => boolean, what: string): Promise<Focused> {
  return tabToMatching(page, match, what, { max: 80, visible: true });
}

// Inside a radio group the arrow keys move the choice; bounded, so a broken group fails instead of looping.
async function arrowTo(page: Page, value: string, what: string): Promise<void> {
  for (let i = 0; i < 8; i++) {
    const f = await focused(page);
    if (f.type === "radio" && f.value === value) {
      if (!f.checked) await page.keyboard.press("Space");
      expect((await focused(page)).checked, what).toBe(true);
      return;
    }
    await page.keyboard.press("ArrowDown");
  }
  throw new Error(`could not choose ${what} with the arrow keys`);
}

async function typeInto(page: Page, id: string, text: string, what: string) {
  await tabTo(page, (f) => f.id === id, what);
  await page.keyboard.type(text);
}

async function liveRegionText(page: Page): Promise<string> {
  return page.evaluate(() =>
    Array.from(document.querySelectorAll('[role="status"], [aria-live="polite"], [aria-live="assertive"]'))
      .map((n) => n.textContent ?? "")
      .join(" | "),
  );
}

describe("the quote request by keyboard alone", () => {
  it("fills every required field, adds and removes photos, and sends the request", async () => {
    const owner = await newCustomer("kbd-quote");
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    // Keep playwright's file-chooser interception on for the whole page: it is switched per listener, and a
    // listener added just before a key press can lose the race with the dialog.
    page.on("filechooser", () => undefined);
    await signInByKeyboard(page, owner.email, owner.password, { visible: true });
    await page.goto("/portal");
    await tabTo(page, (f) => f.tag === "A" && f.text === "Request a quote", "the request link");
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/portal\/request/);
    await page.locator("#maker").waitFor();

    // The set.
    await typeInto(page, "maker", "Corvane", "the maker");
    await typeInto(page, "model", "Skylark Seven", "the model");
    await typeInto(page, "year", "1963", "the year");
    await tabTo(page, (f) => f.type === "radio" && f.name === "kind", "the kind of set");
    await arrowTo(page, "transistor-battery", "a transistor set on batteries");
    await tabTo(page, (f) => f.type === "checkbox" && f.name === "bands", "the first band");
    // Tab on through the bands to medium wave and short wave, ticking each with Space.
    for (const band of ["MW", "SW"]) {
      const f = await tabTo(page, (x) => x.type === "checkbox" && x.name === "bands" && x.value === band, `the ${band} band`);
      expect(f.checked).toBe(false);
      await page.keyboard.press("Space");
      expect((await focused(page)).checked, `${band} ticked`).toBe(true);
    }

    // What is wrong.
    await typeInto(page, "symptoms", "Crackles when the volume is turned and cuts out after a while.", "the symptoms");
    await tabTo(page, (f) => f.type === "radio" && f.name === "poweredRecently", "the powered-recently choice");
    await arrowTo(page, "no", "not powered recently");
    await snap(page, "quote-keyboard-01-set-described");

    // Photos: the picker's button opens the system dialog from the keyboard.
    const choose = await tabTo(page, (f) => f.tag === "BUTTON" && f.text === "Choose photos", "the photo picker");
    expect(choose.tag).toBe("BUTTON");
    const [chooser] = await Promise.all([page.waitForEvent("filechooser", { timeout: 10_000 }), page.keyboard.press("Enter")]);
    expect(chooser.isMultiple()).toBe(true);
    await chooser.setFiles([
      { name: "front.jpg", mimeType: "image/jpeg", buffer: await jpeg({ color: "#9c3d1c" }) },
      { name: "back.jpg", mimeType: "image/jpeg", buffer: await jpeg({ color: "#5b3a29" }) },
    ]);
    await expect.poll(() => page.locator('li[data-status="done"]').count(), { timeout: 60_000 }).toBe(2);
    await expect.poll(() => liveRegionText(page)).toMatch(/(front|back)\.jpg uploaded\./);
    // Focus stayed on the picker's button after the dialog closed.
    expect((await focused(page)).text).toBe("Choose photos");
    await snap(page, "quote-keyboard-02-photos-uploaded");

    // Space opens the dialog as well; a file that is not a photo is refused with a message, then removed.
    const [again] = await Promise.all([page.waitForEvent("filechooser", { timeout: 10_000 }), page.keyboard.press("Space")]);
    await again.setFiles([{ name: "notes.txt", mimeType: "text/plain", buffer: Buffer.from("not a photo") }]);
    await expect.poll(() => page.locator('li[data-status="refused"]').count()).toBe(1);
    await expect.poll(() => page.locator('li[data-status="refused"]').innerText()).toMatch(/Only photos \(JPEG, PNG or WebP\)/);

    // Each Remove button is named after its photo; removing one keeps the keyboard user's place.
    const removeTxt = await tabTo(page, (f) => f.tag === "BUTTON" && f.text === "Remove notes.txt", "the remove button of notes.txt");
    expect(removeTxt.text).toBe("Remove notes.txt");
    await page.keyboard.press("Enter");
    await expect.poll(() => page.locator("li[data-status]").count()).toBe(2);
    await expect.poll(() => liveRegionText(page)).toContain("notes.txt removed.");
    await expect
      .poll(async () => (await focused(page)).text, { message: "focus moves to a neighbouring control, not the page" })
      .toBe("Remove back.jpg");
    await page.keyboard.press("Shift+Tab");
    expect((await focused(page)).text).toBe("Remove front.jpg");
    await page.keyboard.press("Space");
    await expect.poll(() => page.locator("li[data-status]").count()).toBe(1);
    await expect.poll(() => liveRegionText(page)).toContain("front.jpg removed.");
    await expect.poll(async () => (await focused(page)).text).toBe("Remove back.jpg");
    await snap(page, "quote-keyboard-03-photo-removed");

    // Delivery and contact keep their defaults (mail-in, e-mail); the cautions box is ticked with Space.
    await tabTo(page, (f) => f.type === "radio" && f.name === "delivery", "the delivery choice");
    await arrowTo(page, "drop-off", "drop-off at the shop");
    await tabTo(page, (f) => f.type === "checkbox" && f.name === "cautionsAcknowledged", "the cautions box");
    await page.keyboard.press("Space");
    expect((await focused(page)).checked).toBe(true);
    await snap(page, "quote-keyboard-04-cautions");

    const submit = await tabTo(page, (f) => f.tag === "BUTTON" && f.text === "Send my quote request", "the send button");
    expect(submit.text).toBe("Send my quote request");
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/portal\/jobs\/[0-9a-f-]{36}\?new=1/, { timeout: 30_000 });
    const jobId = /\/portal\/jobs\/([0-9a-f-]{36})/.exec(page.url())![1]!;
    await expect.poll(() => page.getByText("Your request is with the shop").count()).toBe(1);
    await expect
      .poll(() =>
        page
          .locator('img[alt^="Photo: "]')
          .evaluateAll(
            (imgs) => imgs.length === 1 && imgs.every((i) => (i as HTMLImageElement).complete && (i as HTMLImageElement).naturalWidth > 0),
          ),
      )
      .toBe(true);
    await snap(page, "quote-keyboard-05-request-sent");

    const [job] = await sql<{
      state: string;
      delivery: string;
      poweredRecently: string;
      maker: string;
      model: string;
      year: number;
      kind: string;
      photos: number;
      names: string[];
    }>(
      `select j.state, j.delivery, j.powered_recently as "poweredRecently", s.maker, s.model, s.year, s.kind,
              (select count(*)::int from photo p where p.job_id = j.id) as photos,
              (select array_agg(p.display_name order by p.display_name) from photo p where p.job_id = j.id) as names
         from job j join radio_set s on s.id = j.set_id join "user" u on u.id = j.customer_id
        where j.id = $1 and u.email = $2`,
      [jobId, owner.email],
    );
    expect(job).toEqual({
      state: "requested",
      delivery: "drop-off",
      poweredRecently: "no",
      maker: "Corvane",
      model: "Skylark Seven",
      year: 1963,
      kind: "transistor-battery",
      photos: 1,
      names: ["back.jpg"],
    });
    const [bands] = await sql<{ bands: string[] }>(
      "select s.profile->'ownerReport'->'bands' as bands from job j join radio_set s on s.id = j.set_id where j.id = $1",
      [jobId],
    );
    expect(bands!.bands).toEqual(["MW", "SW"]);

    // The new job is listed on the owner's page and reachable from it by keyboard too.
    await page.goto("/portal");
    await tabTo(page, (f) => f.tag === "A" && f.text.includes("Corvane Skylark Seven"), "the new job in the list");
    await ctx.close();
  });
});
