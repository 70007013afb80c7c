import { test, expect, type Browser } from '@playwright/test';
import { apiJson, DEMO_PASSWORD, signIn, signInDialog, snap } from './support';

// OSHA 29 CFR 1910.147(e)(3) removal of an absent employee's lock, and the alarm for a counter that
// rises during a verified lockout (1910.147(d)(6)), driven through the screens in Chromium.
test.describe.configure({ mode: 'serial' });

/** The technician locks out C2 with every point of its approved procedure; returns the lockout id. */
async function techLocksOutC2(browser: Browser, prefix: string, verify: boolean) {
  const ctx = await browser.newContext();
  const page = await ctx.newPage();
  await signIn(page, 'tech@alder-row.example');
  const machines = (await apiJson(page.request, 'GET', '/safety/machines')) as { id: string; code: string; procedures: { id: string }[] }[];
  const c2 = machines.find((m) => m.code === 'C2')!;
  const proc = await apiJson(page.request, 'GET', `/safety/procedures/${c2.procedures[0].id}`);
  const points = proc.current.content.sources.map((s: { key: string }, i: number) => ({
    sourceKey: s.key,
    device: 'lock-and-tag',
    lockNumber: `${prefix}-${i + 1}`,
  }));
  const { id } = await apiJson(page.request, 'POST', '/safety/lockouts', {
    procedureId: c2.procedures[0].id,
    reason: 'Replace the clamp pads',
    points,
    password: DEMO_PASSWORD,
  });
  if (verify) {
    const d = await apiJson(page.request, 'GET', `/safety/lockouts/${id}`);
    await apiJson(page.request, 'POST', `/safety/lockouts/${id}/verify`, {
      testedPointIds: d.points.map((p: { id: string }) => p.id),
      startAttempted: true,
      password: DEMO_PASSWORD,
    });
  }
  return { id: id as string, ctx, page };
}

test('a supervisor removes an absent technician’s lock through the signed (e)(3) steps', async ({ page, browser }) => {
  const tech = await techLocksOutC2(browser, `AB${Date.now() % 100000}`, false);
  await tech.ctx.close();

  await signIn(page, 'admin@alder-row.example');
  await page.goto(`/safety/lockouts/${tech.id}`);
  const panel = page
    .getByRole('region', { name: 'Absent employee’s locks (1910.147(e)(3))' })
    .or(page.locator('section', { hasText: 'Absent employee’s locks' }).first());
  await expect(page.getByText('Absent employee’s locks (1910.147(e)(3))')).toBeVisible();
  await page.getByLabel('Whose locks').selectOption({ label: 'Imani Oduya' });
  await page.getByLabel('How you checked they are not at the facility').fill('Badge log: left at 14:02; not found on a walk-round');
  await page.getByText('The employee is not at the facility').click();
  await page.getByRole('button', { name: 'Sign: employee not at the facility' }).click();
  await signInDialog(page);
  await expect(page.getByText('Absence verified and signed')).toBeVisible();
  await page.getByLabel('What was done: attempt to contact the employee').fill('Called twice and left a voicemail at 14:30');
  await page.getByRole('button', { name: 'Sign: attempt to contact the employee' }).click();
  await signInDialog(page);
  await expect(page.getByText('Next: Removal authorized by the safety officer')).toBeVisible();
  expect(panel).toBeTruthy();

  // The safety officer, a different person, authorizes the removal.
  const safetyCtx = await browser.newContext();
  const safety = await safetyCtx.newPage();
  await signIn(safety, 'safety@alder-row.example');
  await safety.goto(`/safety/lockouts/${tech.id}`);
  await safety.getByLabel('What was done: removal authorized by the safety officer').fill('Authorized after checking the contact attempts');
  await safety.getByRole('button', { name: 'Sign: removal authorized by the safety officer' }).click();
  await signInDialog(safety);
  await safetyCtx.close();

  await page.reload();
  await page.getByLabel('What was done: locks removed, area checked').fill('Area checked, everyone clear, locks cut off');
  await page.getByRole('button', { name: 'Sign: locks removed, area checked' }).click();
  await signInDialog(page);
  await expect(page.getByText('Released').first()).toBeVisible();
  await page.getByLabel('What was done: employee informed before resuming work').fill('Told at the gate before the next shift');
  await page.getByRole('button', { name: 'Sign: employee informed before resuming work' }).click();
  await signInDialog(page);
  await expect(page.getByText('Employee informed before resuming work (1910.147(e)(3)(iii)) · signed by Rhea Castellan')).toBeVisible();
  await snap(page, 'absent-lock-removal');
});

test('a counter that rises during a verified lockout raises the alarm mail and the station mark', async ({ page, browser }) => {
  const tech = await techLocksOutC2(browser, `AL${Date.now() % 100000}`, true);
  const station = await apiJson(tech.page.request, 'GET', '/stations/C2');
  const meter = station.meters.find((m: { code: string }) => m.code === 'arc-starts');
  const start = meter.latest?.value ?? 0;
  await apiJson(tech.page.request, 'POST', `/meters/${meter.id}/readings`, { value: start });
  await apiJson(tech.page.request, 'POST', `/meters/${meter.id}/readings`, { value: start + 25 });

  await signIn(page, 'safety@alder-row.example');
  await page.getByRole('link', { name: 'Dev inbox' }).click();
  await page
    .getByRole('button', { name: /ALARM C2(-\w+)?: counter rose while locked out/ })
    .first()
    .click();
  await expect(page.locator('article')).toContainText('Machine ran while locked out — or an energy source is missing from the procedure');
  await expect(page.locator('article')).toContainText('rose by 25 starts');
  await snap(page, 'lockout-alarm-mail');

  await page.setViewportSize({ width: 800, height: 1280 });
  await page.goto('/station/C2');
  const mark = page.getByTestId('lockout-alarm');
  await expect(mark).toContainText('Alarm: counter rose while locked out');
  await expect(mark).toContainText('rose by 25 starts');
  await snap(page, 'lockout-alarm-station');

  const d = await apiJson(tech.page.request, 'GET', `/safety/lockouts/${tech.id}`);
  expect(d.state).toBe('verified');
  await apiJson(tech.page.request, 'POST', `/safety/lockouts/${tech.id}/release`, {
    areaChecked: true,
    peopleClear: true,
    affectedNotified: true,
    password: DEMO_PASSWORD,
  });
  await tech.ctx.close();
});
