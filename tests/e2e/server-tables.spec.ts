import { expect, test } from '@playwright/test';
import { expectAccessible, signIn } from './support';

// Plans, people and the activity log share the server-paged DataTable: filters go back to page 1,
// the new count and sort are said out loud, and headers carry aria-sort.
test('plans, people and activity tables filter, page and sort on the server', async ({ page }) => {
  test.setTimeout(90_000);
  await page.setViewportSize({ width: 1366, height: 900 });
  await signIn(page, 'admin@alder-row.example');
  for (const [path, name, table] of [
    ['/plans', 'plans', 'Maintenance plans'],
    ['/admin/users', 'users', 'People in this shop'],
    ['/admin/audit', 'activity', 'Activity log'],
  ] as const) {
    await page.goto(path);
    await expect(page.getByRole('table', { name: table })).toBeVisible();
    await expect(page.getByRole('table', { name: table }).locator('tbody tr').first()).toBeVisible();
    await expectAccessible(page, name);
  }
  // A filter goes back to page 1 and the count is said out loud.
  await page.goto('/admin/audit');
  await page.getByRole('button', { name: 'Next' }).click();
  await expect(page.getByText(/rows? · page 2 of/)).toBeVisible();
  await page.getByRole('combobox', { name: 'Who' }).selectOption('system');
  await expect(page.locator('[data-result-count]')).toHaveText(/entr(y|ies) match/);
  await expect(page.getByText(/rows? · page 1 of/)).toBeVisible();
  await page.goto('/admin/users');
  await page.getByLabel('Search').fill('zzz-nobody');
  await expect(page.getByText('Nobody matches these filters')).toBeVisible();
  await expect(page.locator('[data-result-count]')).toHaveText(/^0 people match/);
  await page.goto('/plans');
  await page.getByRole('combobox', { name: 'Plans' }).selectOption('all');
  await page.getByRole('button', { name: /^Machine/ }).click();
  await expect(page.getByRole('columnheader', { name: /Machine/ })).toHaveAttribute('aria-sort', 'ascending');
  await expect(page.locator('[data-result-count]')).toHaveText(/plans? match.*sorted by Machine, ascending/);
});
