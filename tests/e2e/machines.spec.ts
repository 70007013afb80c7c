import { test, expect } from '@playwright/test';
import { expectAccessible, signIn, snap } from './support';

test('technician walks machines, meters, stock and consumable life', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  await expect(page.getByRole('heading', { name: 'Stock to reorder' })).toBeVisible();
  await expect(page.getByRole('list', { name: 'Parts at or below their reorder point' })).toContainText('TX-2208');
  await snap(page, 'home-technician-stock');

  await page.getByRole('link', { name: 'Machines', exact: true }).click();
  const table = page.getByRole('table', { name: 'Machines and components' });
  await expect(table.getByRole('link', { name: 'C1-T' })).toBeVisible();
  await expectAccessible(page, 'machines');
  await snap(page, 'machines');

  // A duplicate code is refused on its field.
  const form = page.getByRole('form', { name: 'Add a machine' });
  await form.getByLabel('Code').fill('c1');
  await form.getByLabel('Name').fill('Another cell');
  await form.getByRole('button', { name: 'Add machine' }).click();
  await expect(form.getByText('Code C1 is taken')).toBeVisible();

  await table.getByRole('link', { name: 'C1', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'C1 · Punch/plasma cell 1' })).toBeVisible();
  await expect(page.getByRole('table', { name: 'Punch tools' })).toContainText('Sharpening due');
  await expectAccessible(page, 'machine detail');
  await snap(page, 'machine-detail');

  await page.getByRole('table', { name: 'Meters' }).getByRole('link', { name: 'Arc starts' }).click();
  await expect(page.getByRole('heading', { name: 'C1-T · Arc starts' })).toBeVisible();
  await expect(page.getByRole('img', { name: /Arc starts: \d+ readings over the last 365 days/ })).toBeVisible();
  // A lower count than the last is refused with the reason on the field.
  await page.getByLabel('Reading (starts)').fill('5');
  await page.getByRole('button', { name: 'Record reading' }).click();
  await expect(page.getByText(/5 starts is lower than the reading before it/).first()).toBeVisible();
  await expectAccessible(page, 'meter detail');
  await snap(page, 'meter-detail');

  await page.getByRole('link', { name: 'Stock', exact: true }).click();
  await expect(page.getByRole('table', { name: 'Part catalogue' })).toContainText('TX-2201');
  await page.getByRole('button', { name: 'Moves of TX-2201' }).click();
  await expect(page.getByRole('table', { name: 'Stock moves' })).toContainText('Consumable change on C1-T');
  // A use is typed as a plain count; the move takes it out.
  const moveForm = page.getByRole('form', { name: 'Stock move for TX-2201' });
  await moveForm.getByLabel('Move').selectOption({ label: 'Used (takes out)' });
  await moveForm.getByLabel(/How many/).fill('1');
  await expect(moveForm.getByText('Takes 1 pc out')).toBeVisible();
  await moveForm.getByLabel('Why').fill('Test cut');
  await moveForm.getByRole('button', { name: 'Record move' }).click();
  await expect(moveForm.getByRole('status')).toContainText('Recorded: took out 1 pc.');
  await expect(page.getByRole('table', { name: 'Stock moves' }).getByRole('row').nth(1)).toContainText('-1 pc');
  await expectAccessible(page, 'stock');
  await snap(page, 'stock');

  await page.getByRole('link', { name: 'Consumable life' }).click();
  await expect(page.getByText(/Weibull fit by maximum likelihood/)).toBeVisible();
  await expect(page.getByRole('img', { name: /Histogram of \d+ achieved lives/ })).toBeVisible();
  await expectAccessible(page, 'consumable life');
  await snap(page, 'consumable-life');
});

test('operator finds the stations on the home page of a phone', async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true });
  const page = await context.newPage();
  await signIn(page, 'operator@alder-row.example');
  // The stations come before every other panel on the operator's home.
  await expect(page.getByRole('heading', { level: 2 }).first()).toHaveText('Stations');
  await expect(page.getByRole('link', { name: /^C2/ })).toBeInViewport();
  await page.getByRole('link', { name: /^C2/ }).tap();
  await expect(page.getByRole('heading', { name: 'C2 · Punch/plasma cell 2' })).toBeVisible();
  await expect(page.getByRole('button', { name: 'Log a change' })).toBeVisible();
  await expectAccessible(page, 'station on a phone');
  await snap(page, 'station-phone');
  await page.screenshot({ path: 'tests/e2e/artifacts/station-phone-top.png' });
  await context.close();
});
