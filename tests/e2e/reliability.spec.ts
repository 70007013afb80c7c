import { test, expect } from '@playwright/test';
import { expectAccessible, signIn, snap } from './support';

test('a technician adds a failure code of the shop, is told about a duplicate, and retires it without losing it', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  await page.goto('/reliability');
  await page.getByText('Edit the shop’s codes').click();
  const form = page.getByRole('form', { name: 'Add a code' });
  const code = `B${Date.now().toString(36).slice(-5).toUpperCase()}`;
  await form.getByLabel('List').selectOption('mode');
  await form.getByLabel('Code').fill(code);
  await form.getByLabel('Name').fill('Burr left on the part');
  await form.getByRole('button', { name: 'Add the code' }).click();
  await expect(form.getByRole('status')).toHaveText(`Added ${code} · Burr left on the part.`);
  const modes = page.getByRole('table', { name: 'Failure mode (what was seen)' });
  await expect(modes.getByRole('row').filter({ hasText: code })).toBeVisible();
  // The reliability filter offers the new mode at once.
  await expect(page.getByLabel('Failure mode').locator('option', { hasText: code })).toHaveCount(1);

  await form.getByLabel('Code').fill(code);
  await form.getByLabel('Name').fill('The same code again');
  await form.getByRole('button', { name: 'Add the code' }).click();
  await expect(form.getByRole('alert')).toBeVisible();

  await modes.getByRole('button', { name: `Retire ${code}` }).click();
  await expect(modes.getByRole('button', { name: `Use ${code} again` })).toBeVisible();
  await expectAccessible(page, 'failure codes');
  await snap(page, 'failure-codes');
});

test('a technician stops a machine for a failure, codes the stop and returns it; the reliability page counts it', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  const { token } = await (await page.request.get('/api/auth/csrf')).json();
  const code = `X-${Date.now().toString(36).toUpperCase()}`;
  const made = await page.request.post('/api/machines', { headers: { 'X-CSRF-Token': token }, data: { code, name: 'Deburring unit', kind: 'other' } });
  expect(made.ok(), await made.text()).toBeTruthy();
  const machine = await made.json();

  await page.goto(`/machines/${machine.id}`);
  await expect(page.getByText(`No stops recorded for ${code}`)).toBeVisible();
  const stopForm = page.getByRole('form', { name: `Take ${code} out of service` });
  await stopForm.getByLabel('Kind of stop').selectOption('failure');
  await stopForm.getByRole('button', { name: 'Take out of service' }).click();
  await expect(stopForm.getByRole('alert')).toContainText('Say why');
  await stopForm.getByLabel('Why').fill('Hydraulic hose burst at the clamp');
  await stopForm.getByRole('button', { name: 'Take out of service' }).click();
  const stops = page.getByRole('list', { name: `Stops of ${code}, newest first` });
  const stop = stops.getByRole('listitem').first();
  await expect(stop).toContainText('Failure: Hydraulic hose burst at the clamp');
  await expect(stop).toContainText('still stopped');
  await stop.getByLabel('Failure mode').selectOption('LEAK');
  await stop.getByLabel('Cause').selectOption('HYDR');
  await expect.poll(async () => (await (await page.request.get(`/api/machines/${code}/downtimes`)).json())[0].causeCode).toBe('HYDR');

  await page.getByRole('button', { name: 'Return to service' }).click();
  await page
    .getByRole('dialog', { name: `Return ${code} to service?` })
    .getByRole('button', { name: 'Return to service' })
    .click();
  await expect(stop).not.toContainText('still stopped');
  await expect(page.getByRole('form', { name: `Take ${code} out of service` })).toBeVisible();
  await expectAccessible(page, 'machine stops');
  await snap(page, 'machine-stops');

  await page.goto(`/reliability?machine=${machine.id}&code=LEAK`);
  await expect(page.locator('dt', { hasText: /^Failures$/ }).locator('xpath=following-sibling::dd')).toHaveText('1');
});

test('the demo shop’s year of coded stops gives the reliability page figures to read', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  await page.goto('/reliability');
  // Each main machine of the demo had a failure stop in the last few weeks (seed/demo-stops.ts).
  for (const code of ['B1', 'C1', 'C2', 'H1', 'P1']) {
    const row = page.getByRole('row').filter({ has: page.getByRole('cell', { name: new RegExp(`^${code} `) }) });
    await expect(row.getByRole('cell').nth(1)).not.toHaveText('0');
  }
  await snap(page, 'reliability-demo');
});
