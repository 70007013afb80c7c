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

// One request per pause in typing, not one per key: the page's clock is paused while typing, so
// however fast or slow the machine types, nothing may go out until the test lets the pause pass.
test('a search goes to the server once typing pauses, not on every key', async ({ page }) => {
  await page.setViewportSize({ width: 1366, height: 900 });
  await signIn(page, 'admin@alder-row.example');
  await page.clock.install();
  const searched: string[] = [];
  page.on('request', (r) => {
    const url = new URL(r.url());
    if (url.pathname === '/api/plans' && url.searchParams.has('q')) searched.push(url.searchParams.get('q')!);
  });
  await page.goto('/plans');
  await expect(page.getByRole('table', { name: 'Maintenance plans' }).locator('tbody tr').first()).toBeVisible();
  // From here the page's timers move only when the test moves them.
  await page.clock.pauseAt(Date.now() + 60_000);
  await page.getByLabel('Search').pressSequentially('nozzle');
  await page.clock.runFor(100);
  expect(searched).toEqual([]);
  await page.clock.runFor(400);
  await page.clock.resume();
  await expect(page.locator('[data-result-count]')).toHaveText(/plans? match/);
  await expect.poll(() => searched).toEqual(['nozzle']);
});
