import { test, expect, type Browser } from '@playwright/test';
import { apiJson, DEMO_PASSWORD, signIn, signInDialog, snap } from './support';

// OSHA 29 CFR 1910.147(e)(3) removal of an absent employee's lock, and the alarm for a counter that
// rises in a counter import during a verified lockout (1910.147(d)(6)), driven through the screens in Chromium.
test.describe.configure({ mode: 'serial' });

/** The technician locks out a demo machine with every point of its approved procedure; returns the lockout id. */
async function techLocksOut(browser: Browser, code: string, prefix: string, verify: boolean) {
  const ctx = await browser.newContext();
  const page = await ctx.newPage();
  await signIn(page, 'tech@alder-row.example');
  const machines = (await apiJson(page.request, 'GET', '/safety/machines')) as { id: string; code: string; procedures: { id: string }[] }[];
  const machine = machines.find((m) => m.code === code)!;
  const proc = await apiJson(page.request, 'GET', `/safety/procedures/${machine.procedures[0].id}`);
  const points = proc.current.content.sources.map((s: { key: string }, i: number) => ({
    sourceKey: s.key,
    device: 'lock-and-tag',
    lockNumber: `${prefix}-${i + 1}`,
  }));
  const { id } = await apiJson(page.request, 'POST', '/safety/lockouts', {
    procedureId: machine.procedures[0].id,
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
  const tech = await techLocksOut(browser, 'C2', `AB${Date.now() % 100000}`, false);
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

test('a counter import that advances C1’s arc starts during its verified lockout raises the alarm mail and the station mark', async ({ page, browser }) => {
  const tech = await techLocksOut(browser, 'C1', `AL${Date.now() % 100000}`, true);
  const lockout = await apiJson(tech.page.request, 'GET', `/safety/lockouts/${tech.id}`);
  const torch = (await apiJson(tech.page.request, 'GET', '/stations/C1')).torches[0].startsMeter as { latest: { value: number } | null };
  const start = torch.latest?.value ?? 0;
  // Two readings of the counter file, both inside the verified lockout: the torch fired 25 times while locked out.
  const from = Date.parse(lockout.verifiedAt);
  const span = Date.now() - from;
  const at = (part: number) => new Date(from + span * part).toISOString();
  const csv = ['machine_code,meter_code,read_at,value,reset', `C1-T,arc-starts,${at(0.3)},${start},no`, `C1-T,arc-starts,${at(0.6)},${start + 25},no`].join(
    '\n',
  );
  await tech.page.goto('/counter-import');
  await tech.page.getByLabel('CSV file (at most 50 MB)').setInputFiles({ name: 'counters.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
  await tech.page.getByRole('button', { name: 'Check the file' }).click();
  await tech.page.getByRole('button', { name: /^Import 2 readings/ }).click();
  await expect(tech.page.getByText('2 readings added from 2 rows')).toBeVisible();

  await signIn(page, 'safety@alder-row.example');
  await page.getByRole('link', { name: 'Dev inbox' }).click();
  await page
    .getByRole('button', { name: /ALARM C1(-\w+)?: counter rose while locked out/ })
    .first()
    .click();
  await expect(page.locator('article')).toContainText('Machine ran while locked out — or an energy source is missing from the procedure');
  await expect(page.locator('article')).toContainText('rose by 25 starts');
  await snap(page, 'lockout-alarm-mail');

  await page.setViewportSize({ width: 800, height: 1280 });
  await page.goto('/station/C1');
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
