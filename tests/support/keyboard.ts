import type { Page } from "playwright-core";
import { expect } from "vitest";

// Helpers for the keyboard-only browser tests: what has focus, Tab until something matches, sign in by keys.

export type Focused = {
  tag: string;
  id: string;
  role: string | null;
  type: string;
  name: string;
  value: string;
  checked: boolean;
  text: string;
  outline: string;
};

export async function focused(page: Page): Promise<Focused> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    const input = el instanceof HTMLInputElement ? el : null;
    const style = el ? getComputedStyle(el) : null;
    return {
      tag: el?.tagName ?? "",
      id: el?.id ?? "",
      role: el?.getAttribute("role") ?? null,
      type: input?.type ?? "",
      name: el?.getAttribute("name") ?? "",
      value: input?.value ?? "",
      checked: input?.checked ?? false,
      text: (el?.innerText || el?.getAttribute("aria-label") || "").replace(/\s+/g, " ").trim(),
      // The focus indicator the user sees: the outline drawn for :focus-visible.
      outline:
        style && style.outlineStyle !== "none" && parseFloat(style.outlineWidth) >= 2 ? `${style.outlineWidth} ${style.outlineStyle}` : "",
    };
  });
}

/**
 * Presses Tab (never the mouse) until the focused element matches, within a bounded number of steps.
 * With `visible`, the element reached must also show its focus outline.
 */
export async function tabTo(
  page: Page,
  match: (f: Focused) => boolean,
  what: string,
  { max = 120, visible = false }: { max?: number; visible?: boolean } = {},
): Promise<Focused> {
  for (let i = 0; i < max; i++) {
    await page.keyboard.press("Tab");
    const f = await focused(page);
    if (match(f)) {
      if (visible) expect(f.outline, `focus is visible on ${what}`).not.toBe("");
      return f;
    }
  }
  throw new Error(`could not reach ${what} with the Tab key`);
}

export async function signInByKeyboard(
  page: Page,
  email: string,
  password: string,
  { visible = false }: { visible?: boolean } = {},
): Promise<void> {
  await page.goto("/sign-in");
  await tabTo(page, (f) => f.id === "email", "the e-mail field", { visible });
  await page.keyboard.type(email);
  await page.keyboard.press("Tab");
  await page.keyboard.type(password);
  await page.keyboard.press("Enter");
  await page.waitForURL((u) => !u.pathname.startsWith("/sign-in") && !u.pathname.startsWith("/after-sign-in"), { timeout: 20_000 });
}
