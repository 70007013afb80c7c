import { test, expect } from '@playwright/test';
import { DEMO_PASSWORD, expectAccessible, signIn, snap } from './support';

test('the safety officer finds every lock by number and the attempts the product refused', async ({ page }) => {
  await signIn(page, 'safety@alder-row.example');

  // A refusal of our own, so the list has one whatever ran before: leaving a lockout one never joined.
  const lockouts = await (await page.request.get('/api/safety/lockouts?page=1&pageSize=1')).json();
  const lockoutId = lockouts.rows[0].id as string;
  const { token } = await (await page.request.get('/api/auth/csrf')).json();
  const refused = await page.request.post(`/api/safety/lockouts/${lockoutId}/leave`, { headers: { 'X-CSRF-Token': token }, data: { password: DEMO_PASSWORD } });
  expect(refused.status()).toBe(409);

  await page.goto('/safety');
  await page.getByRole('link', { name: 'Lock register' }).click();
  await expect(page.getByRole('heading', { name: 'Lock register' })).toBeVisible();
  const table = page.getByRole('table', { name: 'Locks by number, applied ones first' });
  await expect(table.getByRole('row').nth(1)).toBeVisible();
  const total = Number((await page.getByText(/^\d+ rows? · page/).innerText()).match(/^(\d+)/)![1]);
  expect(total).toBeGreaterThan(0);
  // The demo shop's locks are all numbered; a search narrows the list to one of them.
  const firstLock = (await table.getByRole('row').nth(1).getByRole('cell').first().innerText()).trim();
  // The search goes out once typing pauses: wait for its answer, or the unfiltered first row (the
  // same lock) would pass for the result and be re-drawn under the next step.
  const searched = page.waitForResponse((r) => new URL(r.url()).searchParams.get('q') === firstLock.toLowerCase());
  await page.getByLabel('Lock number or holder').fill(firstLock.toLowerCase());
  await searched;
  await expect(table.getByRole('row').nth(1).getByRole('cell').first()).toHaveText(firstLock);
  await table
    .getByRole('row')
    .nth(1)
    .getByText(/^\d+ uses?/)
    .click();
  await expect(table.getByRole('row').nth(1).getByRole('listitem').first()).toContainText('·');
  await page.getByLabel('Lock number or holder').fill('no-such-lock');
  await expect(page.getByText('No lock matches')).toBeVisible();
  await page.getByLabel('Lock number or holder').fill('');
  await expectAccessible(page, 'lock register');
  await snap(page, 'safety-lock-register');

  await page.goto('/safety');
  await page.getByRole('link', { name: 'Refusals and alarms' }).click();
  const events = page.getByRole('table', { name: 'Refusals and alarms, newest first' });
  await page.getByRole('combobox', { name: 'Kind' }).selectOption('refused');
  const ours = events.getByRole('row').filter({ hasText: 'Take a personal lock off' });
  await expect(ours.first()).toContainText('Refused');
  await expect(ours.first()).toContainText('Tomas Verhoek');
  await page.getByRole('combobox', { name: 'Kind' }).selectOption('alarm');
  await expect(ours).toHaveCount(0);
  await expectAccessible(page, 'refusals and alarms');
  await snap(page, 'safety-events');
});
