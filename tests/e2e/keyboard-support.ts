import { expect, type Locator, type Page } from '@playwright/test';
import { DEMO_PASSWORD } from './support';

/** Presses Tab (as a keyboard user would) until `target` has focus; fails if it never gets there. */
export async function tabTo(page: Page, target: Locator, max = 200) {
  await expect(target).toBeAttached();
  for (let i = 0; i < max; i++) {
    if (await target.evaluate((el) => el === document.activeElement)) return;
    await page.keyboard.press('Tab');
  }
  throw new Error(`Tab never reached ${target}`);
}

/** Signs in with the keyboard only: Tab to the fields, type, Enter. */
export async function signInByKeyboard(page: Page, email: string) {
  await page.goto('/sign-in');
  await expect(page).toHaveTitle('Sign in — Kerfbook');
  await tabTo(page, page.getByLabel('E-mail'));
  await page.keyboard.type(email);
  await tabTo(page, page.getByLabel('Password'));
  await page.keyboard.type(DEMO_PASSWORD);
  await page.keyboard.press('Enter');
  await expect(page.getByRole('button', { name: 'Sign out' })).toBeVisible();
}

/** The signing dialog opened from the keyboard: focus starts in it; type the password and press Enter. */
export async function signByKeyboard(page: Page) {
  // The signing dialog by its title: it can open inside another dialog (a correction).
  const dialog = page.getByRole('dialog', { name: /^Sign: / });
  await expect(dialog.getByLabel('Your password')).toBeFocused();
  await page.keyboard.type(DEMO_PASSWORD);
  await page.keyboard.press('Enter');
  await expect(dialog).toBeHidden();
}

/**
 * Marks every live region now on the page. A confirmation counts as announced only if it then
 * appears inside one of the marked regions: a region added together with its text is often not read.
 */
export async function markLiveRegions(page: Page) {
  await page.evaluate(() => document.querySelectorAll('[role="status"], [role="alert"], [aria-live]').forEach((el) => el.setAttribute('data-was-live', '')));
}

export function announced(page: Page, text: string | RegExp) {
  return page.locator('[data-was-live]').filter({ hasText: text });
}

/** After navigating: the page has its own title and focus sits on its main heading. */
export async function expectArrived(page: Page, title: string | RegExp, heading: string | RegExp) {
  await expect(page).toHaveTitle(title);
  const h1 = page.getByRole('heading', { level: 1, name: heading });
  await expect(h1).toBeFocused();
}

/** The element with focus: never the page body. */
export async function expectFocusNotLost(page: Page) {
  expect(await page.evaluate(() => document.activeElement?.tagName ?? 'none')).not.toMatch(/^(BODY|none)$/);
}

// WCAG 2.2, "relative luminance" and "contrast ratio" definitions (sRGB).
const luminance = ([r, g, b]: number[]) => {
  const c = [r, g, b].map((v) => {
    const s = v / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
};
export const contrast = (a: number[], b: number[]) => {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
};

/** The focused element's ring colour and the colour it is drawn on (the nearest opaque background). */
export async function focusRing(page: Page) {
  return page.evaluate(() => {
    const rgb = (s: string) => (s.match(/[\d.]+/g) ?? []).map(Number);
    const el = document.activeElement as HTMLElement;
    const style = getComputedStyle(el);
    // A ring drawn outside sits on the parent's background; one drawn inside, on the element's own.
    let node: HTMLElement | null = parseFloat(style.outlineOffset) < 0 ? el : el.parentElement;
    let bg = [255, 255, 255];
    while (node) {
      const c = rgb(getComputedStyle(node).backgroundColor);
      if (c.length >= 3 && (c.length < 4 || c[3] > 0.5)) {
        bg = c.slice(0, 3);
        break;
      }
      node = node.parentElement;
    }
    return { style: style.outlineStyle, width: parseFloat(style.outlineWidth), ring: rgb(style.outlineColor).slice(0, 3), bg };
  });
}

export async function expectVisibleRing(page: Page, what: string) {
  const r = await focusRing(page);
  expect(r.style, `${what}: focus ring style`).not.toBe('none');
  expect(r.width, `${what}: focus ring width`).toBeGreaterThanOrEqual(2);
  // WCAG 2.2 SC 1.4.11 non-text contrast: at least 3:1 against the adjacent colour.
  expect(contrast(r.ring, r.bg), `${what}: ring ${r.ring} on ${r.bg}`).toBeGreaterThanOrEqual(3);
}
