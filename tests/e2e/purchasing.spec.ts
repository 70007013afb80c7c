import { test, expect, type APIRequestContext, type Page } from '@playwright/test';
import { mkdirSync } from 'node:fs';
import { signIn, signOut, snap } from './support';

const SHOTS = '/tmp/shots-d';
mkdirSync(SHOTS, { recursive: true });
const shot = async (page: Page, name: string) => {
  await snap(page, name);
  await page.screenshot({ path: `${SHOTS}/${name}.png`, fullPage: true });
};

/** JSON call with the session's CSRF token, as the app itself does. */
async function apiCall(request: APIRequestContext, method: 'GET' | 'POST', url: string, data?: unknown) {
  const { token } = await (await request.get('/api/auth/csrf')).json();
  return request.fetch(`/api${url}`, { method, headers: { 'X-CSRF-Token': token }, data });
}

test('a purchase request is raised, approved, ordered and received; the low flag clears on ordering', async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 1000 });
  const pn = `NZ-E2E-${Date.now().toString(36).toUpperCase()}`;
  await signIn(page, 'tech@alder-row.example');
  // A part that runs low: 20 in, 15 used today, a lead time of 10 days.
  const supplier = await apiCall(page.request, 'POST', '/suppliers', { name: `Nozzle wholesale ${pn}` });
  expect(supplier.status()).toBe(201);
  const created = await apiCall(page.request, 'POST', '/part-types', {
    partNumber: pn,
    name: 'Test nozzle',
    category: 'nozzle',
    leadTimeDays: 10,
    openingStock: 20,
    unitCost: 9,
    packSize: 5,
    minOrderQty: 10,
    supplierId: (await supplier.json()).id,
  });
  expect(created.status()).toBe(201);
  const partId = (await created.json()).id as string;
  expect((await apiCall(page.request, 'POST', '/stock-moves', { partTypeId: partId, kind: 'used', quantity: -15, reason: 'Used' })).status()).toBe(201);

  await page.goto('/purchasing');
  const low = page.getByTestId(`low-${pn}`);
  await expect(low).toBeVisible();
  // Technicians raise requests but do not approve them.
  await low.getByLabel(`Quantity of ${pn}`).fill('10');
  await low.getByRole('button', { name: 'Raise request' }).click();
  await expect(low.getByRole('status')).toContainText(/Request \d+ raised for 10 pcs/);
  const requests = page.getByRole('table', { name: 'Purchase requests' });
  const row = requests.getByRole('row').filter({ hasText: pn }).filter({ hasText: 'Waiting for approval' });
  await expect(row).toBeVisible();
  await expect(row.getByRole('button', { name: 'Approve' })).toHaveCount(0);
  await shot(page, 'purchasing-raised');

  await signOut(page);
  await signIn(page, 'admin@alder-row.example');
  await page.goto('/purchasing');
  const adminRow = page.getByRole('table', { name: 'Purchase requests' }).getByRole('row').filter({ hasText: pn });
  await adminRow.getByRole('button', { name: 'Approve' }).click();
  await expect(adminRow).toContainText('Approved, not yet ordered');
  // Approved but not ordered: still low.
  await expect(page.getByTestId(`low-${pn}`)).toBeVisible();
  await adminRow.getByRole('button', { name: 'Mark as ordered' }).click();
  await expect(adminRow).toContainText('On order');
  // On hand 5 + on order 10 is above the reorder point: the flag clears.
  await expect(page.getByTestId(`low-${pn}`)).toHaveCount(0);
  expect(await (await page.request.get(`/api/part-types/${partId}`)).json()).toMatchObject({ onHand: 5, onOrder: 10, low: false });
  await shot(page, 'purchasing-ordered');

  await signOut(page);
  await signIn(page, 'tech@alder-row.example');
  await page.goto('/purchasing');
  const techRows = page.getByRole('table', { name: 'Purchase requests' }).getByRole('row');
  const techRow = techRows.filter({ hasText: pn });
  // A partial receipt, then too many (refused), then the rest.
  await techRow.getByRole('textbox').fill('4');
  await techRow.getByRole('button', { name: 'Book receipt' }).click();
  await expect(techRow.getByRole('cell').nth(3)).toHaveText('4');
  await techRow.getByRole('textbox').fill('7');
  await techRow.getByRole('button', { name: 'Book receipt' }).click();
  await expect(techRow.getByRole('alert')).toContainText('Only 6 still open');
  await techRow.getByRole('textbox').fill('6');
  await techRow.getByRole('button', { name: 'Book receipt' }).click();
  await expect(techRow).toHaveCount(0);
  expect(await (await page.request.get(`/api/part-types/${partId}`)).json()).toMatchObject({ onHand: 15, onOrder: 0 });
  await page.getByLabel('Show').selectOption('received');
  await expect(techRow).toContainText('Received');
  await shot(page, 'purchasing-received');
});

test('screens: the life page with bounds and cheapest change, the station with reasons per part', async ({ page }) => {
  await signIn(page, 'admin@alder-row.example');
  await page.setViewportSize({ width: 1280, height: 1000 });
  await page.goto('/consumable-life');
  await expect(page.getByText('Cheapest change', { exact: true })).toBeVisible();
  await expect(page.getByText(/Fisher-matrix bounds/)).toBeVisible();
  await shot(page, 'life-page');
  await page.setViewportSize({ width: 800, height: 1280 });
  await page.goto('/station/C1');
  await expect(page.getByTestId('change-point').first()).toContainText('B10');
  await shot(page, 'station-tablet-plan');
  await page.getByRole('button', { name: 'Log a change' }).click();
  await page.getByRole('button', { name: 'Electrode + nozzle' }).click();
  const nozzle = page.getByRole('group', { name: 'Why the nozzle came out' });
  await expect(nozzle.getByRole('button', { name: 'With its partner' })).toHaveAttribute('aria-pressed', 'true');
  await nozzle.getByRole('button', { name: 'Worn' }).click();
  await expect(nozzle.getByRole('button', { name: 'Worn' })).toHaveAttribute('aria-pressed', 'true');
  await shot(page, 'station-change-reasons');
});
