import { test, expect, type Page } from '@playwright/test';
import { mkdirSync } from 'node:fs';
import { expectAccessible, signIn, signInDialog } from './support';
import { WORK_STATE_LABELS } from '../../shared/schemas/work-orders';

// Flows across screens: the station to the PPE check and back, a meter's unit following its kind,
// the work-order list on a phone, a lockout from its work order, a plan's own work newest first.
// The demo shop is shared with the other specs: what these tests write (one PPE check on C2, one
// meter on the fume extractor F1) is nothing the other specs count on.

const SHOTS = '/tmp/shots-b';
mkdirSync(SHOTS, { recursive: true });

async function apiJson<T>(page: Page, url: string): Promise<T> {
  const res = await page.request.get(url);
  expect(res.ok(), `${url}: ${res.status()}`).toBe(true);
  return (await res.json()) as T;
}

test('the PPE check opens from the station with its machine chosen and returns to the station once signed', async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 800, height: 1280 }, hasTouch: true });
  const page = await context.newPage();
  await signIn(page, 'operator@alder-row.example');
  await page.goto('/station/C2');
  await expect(page.getByRole('heading', { level: 1, name: /^C2 · / })).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/station-ppe-link-tablet.png` });
  await page.getByRole('link', { name: 'PPE check at C2' }).tap();

  await expect(page).toHaveURL(/\/safety\/ppe\?machineId=[0-9a-f-]{36}&back=%2Fstation%2FC2$/);
  await expect(page.getByRole('button', { name: /^C2/ })).toHaveAttribute('aria-pressed', 'true');
  const notOn = () => page.getByRole('button', { pressed: false }).filter({ hasText: 'Not yet on' });
  await expect(notOn().first()).toBeVisible();
  while ((await notOn().count()) > 0) await notOn().first().tap();
  await expect(page.getByText('Everything on')).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/ppe-from-station-tablet.png`, fullPage: true });
  await page.getByRole('button', { name: 'Sign: PPE check done' }).tap();
  await signInDialog(page);

  await expect(page).toHaveURL(/\/station\/C2$/);
  await expect(page.getByRole('heading', { level: 1, name: /^C2 · / })).toBeVisible();
  await expect(page.getByRole('status').filter({ hasText: 'PPE check signed' })).toContainText('C2 · ');
  await expectAccessible(page, 'station after the PPE check');
  await page.screenshot({ path: `${SHOTS}/station-after-ppe-tablet.png` });
  await context.close();
});

test('a new running-time meter counts in hours and saves', async ({ page }) => {
  await signIn(page, 'admin@alder-row.example');
  const machines = await apiJson<{ rows: { id: string; code: string }[] } | { id: string; code: string }[]>(page, '/api/machines?pageSize=100');
  const rows = Array.isArray(machines) ? machines : machines.rows;
  const f1 = rows.find((m) => m.code === 'F1');
  expect(f1, 'the demo fume extractor').toBeTruthy();
  await page.goto(`/machines/${f1!.id}`);
  await page.getByText('Add a meter').click();
  const form = page.getByRole('form', { name: 'Add a meter' });
  await expect(form.getByLabel('Unit')).toHaveValue('starts');
  await form.getByLabel('Kind').selectOption({ label: 'Running time (hours)' });
  await expect(form.getByLabel('Unit')).toHaveValue('h');
  const code = `fan-hours-${Date.now().toString(36)}`;
  await form.getByLabel('Meter code').fill(code);
  await form.getByLabel('Meter name').fill('Fan running hours');
  await form.getByRole('button', { name: 'Add meter' }).click();
  await expect(form.getByRole('status')).toHaveText('Added meter Fan running hours.');
  await expect(form.getByRole('alert')).toHaveCount(0);
  await form.screenshot({ path: `${SHOTS}/meter-form-running-time.png` });
});

test('on a phone the work-order list fits the screen and its filters fold away', async ({ browser }) => {
  const phone = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true });
  const page = await phone.newPage();
  await signIn(page, 'tech@alder-row.example');
  await page.goto('/work-orders');
  const list = page.getByRole('list', { name: 'Work orders' });
  const first = list.getByRole('listitem').first();
  await expect(first).toBeVisible();
  // Number and work, machine, due and state on each card.
  await expect(first.getByRole('link', { name: /^WO \d+: / })).toBeVisible();
  await expect(first).toContainText(/WO \d+ · /);
  await expect(first).toContainText(/^.*[A-Z]\d(-[A-Z])? · /);
  await expect(first).toContainText('Due ');
  await expect(first).toContainText(new RegExp(Object.values(WORK_STATE_LABELS).join('|')));
  await expect(page.getByRole('table', { name: 'Work orders' })).toBeHidden();
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);

  // Filters are folded behind one button.
  const toggle = page.getByRole('button', { name: 'Filters' });
  await expect(toggle).toHaveAttribute('aria-expanded', 'false');
  await expect(page.getByLabel('Search')).toBeHidden();
  await page.screenshot({ path: `${SHOTS}/work-orders-phone.png`, fullPage: true });
  await toggle.tap();
  await expect(page.getByRole('button', { name: 'Hide filters' })).toHaveAttribute('aria-expanded', 'true');
  await expect(page.getByLabel('Search')).toBeVisible();
  await expect(page.getByRole('combobox', { name: 'Due' })).toBeVisible();
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
  await page.screenshot({ path: `${SHOTS}/work-orders-phone-filters.png`, fullPage: true });
  // Cards have no headers to press: the order is chosen among the filters.
  await page.getByRole('combobox', { name: 'Sort by' }).selectOption({ label: 'Newest first' });
  await expect(page).toHaveURL(/sort=number&dir=desc/);
  await expect
    .poll(async () => {
      const shown = (await list.getByRole('link', { name: /^WO \d+: / }).allInnerTexts()).map((t) => Number(/WO (\d+)/.exec(t)?.[1]));
      return shown.length > 1 && shown.every((n, i) => i === 0 || n < shown[i - 1]);
    })
    .toBe(true);
  await expectAccessible(page, 'work orders (phone)');
  await page.getByRole('button', { name: 'Hide filters' }).tap();
  await expect(page.getByLabel('Search')).toBeHidden();
  await phone.close();
});

test('a lockout applied from a work order names that work as the work to be done', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  const list = await apiJson<{ rows: { id: string; number: number; title: string; machine: { id: string } }[] }>(page, '/api/work-orders?pageSize=1');
  const wo = list.rows[0];
  expect(wo, 'a demo work order').toBeTruthy();
  await page.goto(`/safety/lockouts/new?machineId=${wo.machine.id}&workOrderId=${wo.id}`);
  await expect(page.getByText(`For WO ${wo.number}`)).toBeVisible();
  await expect(page.getByLabel('Work to be done')).toHaveValue(`WO ${wo.number}: ${wo.title}`);
  await page.screenshot({ path: `${SHOTS}/lockout-from-work-order.png`, fullPage: true });
});

test("a plan's own work orders are listed newest first", async ({ page }) => {
  await signIn(page, 'admin@alder-row.example');
  const plans = await apiJson<{ rows: { id: string }[] }>(page, '/api/plans?pageSize=100');
  let planId: string | null = null;
  for (const p of plans.rows) {
    const work = await apiJson<{ total: number }>(page, `/api/work-orders?planId=${p.id}&pageSize=1`);
    if (work.total >= 3) {
      planId = p.id;
      break;
    }
  }
  expect(planId, 'a demo plan with three or more work orders').not.toBeNull();
  await page.goto(`/plans/${planId}`);
  const table = page.getByRole('table', { name: 'Work orders from this plan' });
  await expect(table.getByRole('row').nth(3)).toBeVisible();
  const numbers = (await table.getByRole('link', { name: /^WO \d+: / }).allInnerTexts()).map(Number);
  expect(numbers.length).toBeGreaterThanOrEqual(3);
  expect(numbers).toEqual([...numbers].sort((a, b) => b - a));
  await expect(table.getByRole('columnheader', { name: /WO/ })).toHaveAttribute('aria-sort', 'descending');
  await page.screenshot({ path: `${SHOTS}/plan-work-newest-first.png`, fullPage: true });
});

test("a plan's meter bar shows the share of the interval used since it was last done", async ({ page }) => {
  await signIn(page, 'admin@alder-row.example');
  type Detail = { id: string; meterDue: { meterId: string; startValue?: number; dueValue: number; current: number | null }[] };
  const plans = await apiJson<{ rows: { id: string }[] }>(page, '/api/plans?pageSize=100');
  let found: { plan: Detail; m: Detail['meterDue'][number] } | null = null;
  for (const p of plans.rows) {
    const plan = await apiJson<Detail>(page, `/api/plans/${p.id}`);
    // A meter still inside its interval, far enough in that the reading over the mark would read otherwise.
    const m = plan.meterDue.find((x) => x.current !== null && x.startValue !== undefined && x.current < x.dueValue && x.startValue > 0);
    if (m) {
      found = { plan, m };
      break;
    }
  }
  expect(found, 'a demo plan with a meter inside its interval').not.toBeNull();
  const { plan, m } = found!;
  // (current − start) ÷ (due − start), the interval's own share; not current ÷ due.
  const used = Math.round(((m.current! - m.startValue!) / (m.dueValue - m.startValue!)) * 100);
  const overMark = Math.round((m.current! / m.dueValue) * 100);
  await page.goto(`/plans/${plan.id}`);
  const bar = page.getByRole('img', { name: /% of the interval used$/ }).first();
  await expect(bar).toHaveAccessibleName(new RegExp(`: ${used} % of the interval used$`));
  if (used !== overMark) await expect(bar).not.toHaveAccessibleName(new RegExp(`: ${overMark} % of`));
  await page.screenshot({ path: `${SHOTS}/plan-meter-bar.png`, fullPage: true });
});
