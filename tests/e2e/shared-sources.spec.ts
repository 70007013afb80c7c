import { test, expect, type APIRequestContext, type Page } from '@playwright/test';
import { DEMO_PASSWORD, expectAccessible, signIn, snap } from './support';

// A shared isolation point: the demo hydraulic unit H1 feeds both cells through H1-E2. Locking H1
// out shows both cells locked out at their stations; releasing it clears them. The lockout made
// here is released again, so the specs after this one find the demo as it was.
test.describe.configure({ mode: 'serial' });

const tablet = { width: 800, height: 1280 };

async function apiCall(request: APIRequestContext, method: 'GET' | 'POST', url: string, data?: unknown) {
  const { token } = await (await request.get('/api/auth/csrf')).json();
  const res = await request.fetch(`/api${url}`, { method, headers: { 'X-CSRF-Token': token }, data });
  expect(res.status(), `${method} ${url}: ${await res.text()}`).toBeLessThan(300);
  return res.json();
}

async function shot(page: Page, name: string) {
  await snap(page, name);
  if (process.env.SHOTS_DIR) await page.screenshot({ path: `${process.env.SHOTS_DIR}/${name}.png`, fullPage: true });
}

type SafetyMachine = { id: string; code: string; procedures: { id: string }[] };

test('locking out the hydraulic unit shows both cells locked out at their stations until it is released', async ({ page, browser }) => {
  const techCtx = await browser.newContext();
  const tech = await techCtx.newPage();
  await signIn(tech, 'tech@alder-row.example');
  const machines = (await apiCall(tech.request, 'GET', '/safety/machines')) as SafetyMachine[];
  const h1 = machines.find((m) => m.code === 'H1')!;
  const proc = await apiCall(tech.request, 'GET', `/safety/procedures/${h1.procedures[0].id}`);
  const shared = proc.current.content.sources.find((s: { feeds?: string[] }) => s.feeds?.length);
  expect(shared.key).toBe('H1-E2');

  // The procedure says which machines the point also feeds.
  await tech.goto(`/safety/procedures/${proc.id}`);
  await expect(tech.getByText('Also feeds C1, C2: locking it locks them out too.')).toBeVisible();
  await shot(tech, 'shared-point-procedure');

  const suffix = Date.now() % 100000;
  const { id } = await apiCall(tech.request, 'POST', '/safety/lockouts', {
    procedureId: proc.id,
    reason: 'Replace the pressure hose to the cells',
    points: proc.current.content.sources.map((s: { key: string }, i: number) => ({
      sourceKey: s.key,
      device: 'lock-and-tag',
      lockNumber: `SH${suffix}-${i + 1}`,
    })),
    password: DEMO_PASSWORD,
  });

  try {
    await signIn(page, 'operator@alder-row.example');
    await page.setViewportSize(tablet);
    for (const code of ['C1', 'C2']) {
      await page.goto(`/station/${code}`);
      const banner = page.getByRole('alert').filter({ hasText: 'Locked out — do not operate' });
      await expect(banner).toContainText('Shared point H1-E2 on H1 is locked');
      await expect(banner).toContainText('Replace the pressure hose to the cells');
      await expect(banner).toContainText('Imani Oduya’s lock since');
      await expectAccessible(page, `station ${code} locked through a shared point`);
      await shot(page, `shared-point-station-${code}`);
    }
    const status = await apiCall(page.request, 'GET', '/machines/C2/status');
    expect(status).toMatchObject({ state: 'locked-out', reason: 'H1-E2 on H1 locked out: Replace the pressure hose to the cells' });

    // The people who work the cells were told.
    await signIn(page, 'safety@alder-row.example');
    await page.getByRole('link', { name: 'Dev inbox' }).click();
    await page.getByRole('button', { name: 'C1, C2 locked out through H1: Replace the pressure hose to the cells' }).first().click();
    await expect(page.locator('article')).toContainText('C1 Punch/plasma cell 1: through H1-E2 on H1 hydraulic unit');
  } finally {
    await apiCall(tech.request, 'POST', `/safety/lockouts/${id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: DEMO_PASSWORD,
    });
  }

  await signIn(page, 'operator@alder-row.example');
  for (const code of ['C1', 'C2']) {
    await page.goto(`/station/${code}`);
    await expect(page.getByRole('button', { name: 'Log a change' })).toBeVisible();
    await expect(page.getByRole('alert').filter({ hasText: 'Locked out — do not operate' })).toHaveCount(0);
    expect((await apiCall(page.request, 'GET', `/machines/${code}/status`)).state).not.toBe('locked-out');
  }
  await techCtx.close();
});

test('the editor offers the shared point that feeds a cell when its procedure leaves it out', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  const machines = (await apiCall(page.request, 'GET', '/safety/machines')) as SafetyMachine[];
  const c1 = machines.find((m) => m.code === 'C1')!;
  // Nothing is saved here: the demo's C1 procedure stays as it is.
  await page.goto(`/safety/procedures/${c1.procedures[0].id}/edit`);
  // The shared point is the cell's sixth source, after its own five.
  const sixth = page.getByRole('group', { name: 'Energy source 6', exact: true });
  await expect(sixth.getByLabel('Tag at the point')).toHaveValue('H1-E2');
  await expect(page.getByText('Shared points named')).toBeVisible();
  await sixth.getByRole('button', { name: 'Remove energy source 6' }).click();
  await expect(sixth).toHaveCount(0);
  const offer = page.getByRole('button', { name: 'Add the shared point H1-E2' });
  await expect(offer).toBeVisible();
  await expect(page.getByText(/H1-E2 on H1 hydraulic unit .*feeds this machine/)).toBeVisible();
  await shot(page, 'shared-point-offer');
  await offer.click();
  // Copied with its tag and how it is isolated, relieved and verified.
  await expect(sixth.getByLabel('Tag at the point')).toHaveValue('H1-E2');
  await expect(sixth.getByLabel('Isolation device')).toHaveValue('Lockable supply valve V12; dump valve V11');
  await expect(page.getByText('Shared points named')).toBeVisible();

  // The hydraulic unit's own procedure: the point lists the cells it feeds.
  const h1 = machines.find((m) => m.code === 'H1')!;
  await page.goto(`/safety/procedures/${h1.procedures[0].id}/edit`);
  const feeds = page.getByRole('group', { name: 'Machines H1-E2 also feeds' });
  await expect(feeds.getByRole('button', { name: /^C1/ })).toHaveAttribute('aria-pressed', 'true');
  await expect(feeds.getByRole('button', { name: /^C2/ })).toHaveAttribute('aria-pressed', 'true');
  await expect(feeds.getByRole('button', { name: /^P1/ })).toHaveAttribute('aria-pressed', 'false');
  await expectAccessible(page, 'procedure editor with a shared point');
  await shot(page, 'shared-point-feeds-picker');
});
