import { test, expect, type Page } from '@playwright/test';
import { signIn, snap } from './support';

const tablet = { viewport: { width: 800, height: 1280 }, hasTouch: true, isMobile: true };
const shot = async (page: Page, name: string) => {
  await snap(page, name);
  if (process.env.SHOTS_DIR) await page.screenshot({ path: `${process.env.SHOTS_DIR}/${name}.png`, fullPage: true });
};

test.describe('machine state at the station', () => {
  test.use(tablet);

  test('operator reports a fault in three taps, the brake stops, the technician signs the repair off and it runs again', async ({ page, browser }) => {
    await signIn(page, 'operator@alder-row.example');
    await page.goto('/station/B1');
    const banner = page.getByRole('region', { name: 'Machine state' });
    await expect(banner).toHaveAttribute('data-state', 'in-service');

    let taps = 0;
    const tap = async (name: string) => {
      taps++;
      await page.getByRole('button', { name, exact: true }).tap();
    };
    await tap('Report a fault');
    await tap('Leaking');
    await page.getByLabel('Note (optional)').fill('Oil under the left cylinder');
    await tap('Stop the machine and report');
    expect(taps).toBe(3);
    await expect(banner).toHaveAttribute('data-state', 'out-of-service');
    await expect(banner).toContainText('Out of service');
    await expect(banner).toContainText('Leaking: Oil under the left cylinder');
    const woLink = page.getByRole('link', { name: /^Open WO \d+$/ });
    await expect(woLink).toBeVisible();
    await shot(page, 'station-out-of-service');
    const woHref = (await woLink.getAttribute('href'))!;

    // The technician signs the repair off on their own tablet.
    const techContext = await browser.newContext(tablet);
    const tech = await techContext.newPage();
    await signIn(tech, 'tech@alder-row.example');
    await tech.goto('/machines');
    const row = tech.getByRole('row').filter({ has: tech.getByRole('link', { name: 'B1', exact: true }) });
    await expect(row.getByText('Out of service')).toBeVisible();
    await shot(tech, 'machines-list-states');
    await tech.goto(woHref);
    await expect(tech.getByRole('heading', { name: /^WO \d+ · Fault on B1: Leaking/ })).toBeVisible();
    await tech.getByRole('button', { name: 'Sign off the work' }).tap();
    await expect(tech.getByText(/signed this off on/)).toBeVisible();
    await tech.goto('/station/B1');
    await expect(tech.getByRole('region', { name: 'Machine state' })).toHaveAttribute('data-state', 'in-service');
    await shot(tech, 'station-back-in-service');

    // The stop is recorded with its start, its end and who ended it.
    const downtimes = await tech.request.get('/api/machines/B1/downtimes');
    expect(downtimes.ok()).toBe(true);
    const [stop] = (await downtimes.json()) as { kind: string; endedAt: string | null; endedBy: string | null; failureCode: string | null }[];
    expect(stop).toMatchObject({ kind: 'failure', failureCode: 'LEAK' });
    expect(stop.endedAt).not.toBeNull();
    expect(stop.endedBy).toBeTruthy();

    await tech.goto('/reliability');
    await expect(tech.getByRole('heading', { name: 'Reliability' })).toBeVisible();
    await expect(tech.getByRole('img', { name: 'Downtime timeline' })).toBeVisible();
    await expect(tech.getByRole('img', { name: 'Failure downtime by failure mode' })).toBeVisible();
    await shot(tech, 'reliability-page');
    await techContext.close();
  });
});
