import { test, expect, type Page } from '@playwright/test';
import { expectAccessible, signIn } from './support';

// Gloved hands on a tablet: every target at least 44×44 CSS px (WCAG 2.5.5, the product's own
// rule), and nothing anywhere under 24×24 (WCAG 2.2 SC 2.5.8). Text links inside a sentence are
// the exception both criteria allow.

type Small = { what: string; width: number; height: number };

/** Every visible thing a finger can press on the page, with the size of what it actually hits. */
async function targets(page: Page): Promise<Small[]> {
  return page.evaluate(() => {
    const out: { what: string; width: number; height: number }[] = [];
    const selector = 'a[href], button, input:not([type="hidden"]), select, textarea, summary, [role="button"], [role="link"], [tabindex]:not([tabindex="-1"])';
    for (const el of Array.from(document.querySelectorAll<HTMLElement>(selector))) {
      const style = getComputedStyle(el);
      let box = el.getBoundingClientRect();
      // Screen-reader-only controls (the hidden calendar input, the skip link) are nobody's target.
      if (box.width <= 1 || box.height <= 1 || style.visibility === 'hidden' || el.closest('[hidden], details:not([open]) > :not(summary)')) continue;
      // A checkbox or radio is pressed through its label as well: the label's box is the target.
      if (el instanceof HTMLInputElement && (el.type === 'checkbox' || el.type === 'radio')) {
        const label = el.closest('label') ?? (el.id ? document.querySelector(`label[for="${el.id}"]`) : null);
        if (label) {
          const l = label.getBoundingClientRect();
          if (l.width * l.height > box.width * box.height) box = l;
        }
      }
      // A link inside running text: the sentence around it is more than the link.
      if (el.tagName === 'A' && style.display === 'inline') {
        const parentText = (el.parentElement?.textContent ?? '').trim();
        if (parentText.length > (el.textContent ?? '').trim().length + 10) continue;
      }
      const name = (el.getAttribute('aria-label') ?? el.textContent ?? el.getAttribute('name') ?? '').trim().slice(0, 40);
      out.push({
        what: `${el.tagName.toLowerCase()}${el.getAttribute('type') ? `[${el.getAttribute('type')}]` : ''} "${name}"`,
        width: Math.round(box.width * 10) / 10,
        height: Math.round(box.height * 10) / 10,
      });
    }
    return out;
  });
}

async function expectGloveSized(page: Page, label: string) {
  const all = await targets(page);
  expect(all.length, `${label}: targets found`).toBeGreaterThan(5);
  expect(
    all.filter((t) => t.width < 44 || t.height < 44).map((t) => `${label}: ${t.what} ${t.width}×${t.height}`),
    `${label}: targets under 44×44`,
  ).toEqual([]);
}

const tablet = { viewport: { width: 800, height: 1280 }, hasTouch: true };

test.describe('targets for gloved hands on a tablet', () => {
  test.use(tablet);

  test('station page, work-order list and a work order: nothing under 44×44', async ({ page }) => {
    await signIn(page, 'tech@alder-row.example');
    await page.goto('/station/C1');
    await expect(page.getByRole('heading', { level: 1, name: /^C1 · / })).toBeVisible();
    await page.waitForLoadState('networkidle');
    await expectGloveSized(page, 'station C1');
    await page.screenshot({ path: '/tmp/shots-x/targets-station-tablet.png', fullPage: true });

    await page.goto('/work-orders');
    await expect(page.getByRole('table', { name: 'Work orders' }).getByRole('row').nth(1)).toBeVisible();
    await page.waitForLoadState('networkidle');
    await expectGloveSized(page, 'work orders');
    await page.screenshot({ path: '/tmp/shots-x/targets-work-orders-tablet.png', fullPage: true });
    await expectAccessible(page, 'work orders (tablet)');

    await page.getByRole('table', { name: 'Work orders' }).getByRole('link').first().tap();
    await expect(page.getByRole('heading', { level: 1, name: /^WO \d+ · / })).toBeVisible();
    await page.waitForLoadState('networkidle');
    await expectGloveSized(page, 'work order');
    await page.screenshot({ path: '/tmp/shots-x/targets-work-order-tablet.png', fullPage: true });
    await expectAccessible(page, 'work order (tablet)');
  });

  test('the home page, machines list and audit filters: nothing under 44×44 either', async ({ page }) => {
    await signIn(page, 'tech@alder-row.example');
    await expect(page.getByRole('heading', { name: 'My open work' })).toBeVisible();
    await page.waitForLoadState('networkidle');
    await expectGloveSized(page, 'technician home');
    await page.goto('/machines');
    await expect(page.getByRole('table', { name: 'Machines and components' }).getByRole('link', { name: 'C1', exact: true })).toBeVisible();
    await expectGloveSized(page, 'machines');
    await page.screenshot({ path: '/tmp/shots-x/targets-machines-tablet.png', fullPage: true });
  });
});

test('on a phone nothing is under 24×24 and the work order keeps 44 px targets', async ({ browser }) => {
  const phone = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true });
  const page = await phone.newPage();
  await signIn(page, 'operator@alder-row.example');
  for (const url of ['/station/C1', '/work-orders']) {
    await page.goto(url);
    await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
    await page.waitForLoadState('networkidle');
    const tiny = (await targets(page)).filter((t) => t.width < 24 || t.height < 24);
    expect(tiny.map((t) => `${url}: ${t.what} ${t.width}×${t.height}`)).toEqual([]);
    await expectGloveSized(page, `${url} (phone)`);
  }
  await page.screenshot({ path: '/tmp/shots-x/targets-work-orders-phone.png', fullPage: true });
  await phone.close();
});
