import { test, expect, type APIRequestContext, type Page } from '@playwright/test';
import { mkdirSync } from 'node:fs';
import { DEMO_PASSWORD, expectAccessible, signIn, signOut, snap } from './support';

// OSHA 29 CFR 1910.147(f)(1): the holder takes devices off to test the machine, puts them back on and
// verifies isolation again, through the lockout page in Chromium. A machine and procedure of its own,
// so no other spec's lockouts meet it.
const SHOTS = '/tmp/shots-b';
mkdirSync(SHOTS, { recursive: true });

async function apiCall(request: APIRequestContext, method: 'GET' | 'POST', url: string, data?: unknown) {
  const { token } = await (await request.get('/api/auth/csrf')).json();
  const res = await request.fetch(`/api${url}`, { method, headers: { 'X-CSRF-Token': token }, data });
  expect(res.ok(), `${method} ${url}: ${await res.text()}`).toBeTruthy();
  return res.json();
}

async function signWith(page: Page) {
  const dialog = page.getByRole('dialog');
  await expect(dialog).toBeVisible();
  await dialog.getByLabel('Your password').fill(DEMO_PASSWORD);
  await dialog.getByRole('button', { name: 'Sign with my password' }).click();
  await expect(dialog).toBeHidden();
}

const source = (key: string, kind: string, isolationDevice: string) => ({
  key,
  kind,
  description: `${kind} supply`,
  magnitude: kind === 'electrical' ? '400 V AC' : '6 bar',
  isolationDevice,
  location: 'Rear of the unit',
  relieveMethod: 'Wait for the spindle to stop; vent the line',
  verifyMethod: 'Press start: nothing moves; gauge reads zero',
});
const step = (s: string) => [s];

test('the holder opens a test window, puts the locks back on and verifies again; the page shows each step', async ({ page }) => {
  const code = `TW${Date.now() % 100000}`;
  await signIn(page, 'tech@alder-row.example');
  const machine = await apiCall(page.request, 'POST', '/machines', { code, name: 'Edge sander', kind: 'other' });
  const procedure = await apiCall(page.request, 'POST', '/safety/procedures', {
    machineId: machine.id,
    title: 'Edge sander energy control',
    scope: 'Belt change and guide adjustment on the edge sander.',
    sources: [source(`E1`, 'electrical', 'Main switch'), source(`A1`, 'pneumatic', 'Air valve with lockable cover')],
    steps: {
      prepare: step('Tell the operator'),
      shutdown: step('Stop the belt'),
      isolate: step('Main switch off, air valve closed'),
      apply: step('Lock the main switch and the air valve'),
      relieve: step('Vent the air line'),
      verify: step('Press start: nothing moves; the air gauge reads 0 bar'),
    },
    release: ['Refit the guard, make sure everyone is clear, remove your locks'],
  });
  const tech = (await apiCall(page.request, 'GET', '/safety/people')).find((p: { role: string }) => p.role === 'technician');
  await signOut(page);
  await signIn(page, 'safety@alder-row.example');
  await apiCall(page.request, 'POST', `/safety/procedures/${procedure.id}/versions/1/approve`, { password: DEMO_PASSWORD });
  const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
  await apiCall(page.request, 'POST', '/safety/training', {
    userId: tech.id,
    procedureId: procedure.id,
    kind: 'authorized',
    trainedOn: yesterday,
    password: DEMO_PASSWORD,
  });
  await signOut(page);

  await signIn(page, 'tech@alder-row.example');
  const { id } = await apiCall(page.request, 'POST', '/safety/lockouts', {
    procedureId: procedure.id,
    reason: 'Change the sanding belt',
    points: [
      { sourceKey: `E1`, device: 'lock-and-tag', lockNumber: `${code}-L1` },
      { sourceKey: `A1`, device: 'valve-cover', lockNumber: `${code}-L2` },
    ],
    password: DEMO_PASSWORD,
  });
  const d = await apiCall(page.request, 'GET', `/safety/lockouts/${id}`);
  await apiCall(page.request, 'POST', `/safety/lockouts/${id}/verify`, {
    testedPointIds: d.points.map((p: { id: string }) => p.id),
    startAttempted: true,
    password: DEMO_PASSWORD,
  });

  await page.goto(`/safety/lockouts/${id}`);
  await page.getByRole('button', { name: 'Test or position' }).click();
  await page.getByLabel('What you test or position').fill('Run the belt briefly to check tracking');
  await page.getByText('(i) Machine cleared of tools and materials').click();
  await page.getByText('(ii) Employees removed from the machine area').click();
  await page.getByText(`E1 · Electrical supply: remove lock ${code}-L1`).click();
  await expect(page.getByRole('note').filter({ hasText: 'Safety first' }).first()).toBeVisible();
  await snap(page, 'testing-window-start');
  await page.screenshot({ path: `${SHOTS}/testing-window-start.png`, fullPage: true });
  await page.getByRole('button', { name: 'Sign: devices off for testing' }).click();
  await signWith(page);

  // (iv) The window is open: the banner says so, the machine state too.
  const banner = page.getByRole('alert').filter({ hasText: 'Energized for testing — locks off' });
  await expect(banner).toBeVisible();
  await expect(banner).toContainText('Run the belt briefly to check tracking');
  await expect(banner).toContainText(`E1 (lock ${code}-L1)`);
  const status = await apiCall(page.request, 'GET', `/machines/${code}/status`);
  expect(status.state).toBe('locked-out');
  expect(status.reason).toMatch(/^Energized for testing under the lockout held by .* — locks off: Run the belt briefly to check tracking$/);
  await expectAccessible(page, 'lockout page with a test window open');
  await page.screenshot({ path: `${SHOTS}/testing-window-open.png`, fullPage: true });

  // (v) Devices back on, then isolation verified again.
  await page.getByText('Machine stopped and de-energized').click();
  await page.getByLabel(`Lock back on E1 (was ${code}-L1)`).fill(`${code}-L1`);
  await page.getByRole('button', { name: 'Sign: devices back on' }).click();
  await signWith(page);
  await expect(page.getByText('Locks back on — verify isolation again', { exact: true })).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/testing-window-reapplied.png`, fullPage: true });
  await page.getByText('I tried to start the machine with its normal controls; it did not start').click();
  await page.getByText(`E1 · Electrical supply: zero energy`).click();
  await page.getByText(`A1 · Pneumatic supply: zero energy`).click();
  await page.getByRole('button', { name: 'Sign: zero energy verified again' }).click();
  await signWith(page);
  await expect(page.getByText('Locked out: do not operate')).toBeVisible();

  const signatures = page
    .locator('section, div')
    .filter({ has: page.getByText('Signatures on this lockout', { exact: true }) })
    .last();
  for (const label of ['Locks off for testing or positioning', 'Locks back on after testing', 'Zero energy verified again after testing'])
    await expect(signatures.getByText(label, { exact: false })).toBeVisible();
  await expect(page.getByText('Test and positioning windows')).toBeVisible();
  await expect(page.getByText(/verified again .*/).first()).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/testing-window-done.png`, fullPage: true });

  // Leave the shared database as found: release the lockout.
  await apiCall(page.request, 'POST', `/safety/lockouts/${id}/release`, {
    areaChecked: true,
    peopleClear: true,
    affectedNotified: true,
    password: DEMO_PASSWORD,
  });
  await page.reload();
  await expect(page.getByText('Released', { exact: true }).first()).toBeVisible();
});
