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
