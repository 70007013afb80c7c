import { test, expect } from '@playwright/test';
import { apiJson, DEMO_PASSWORD, expectAccessible, signIn, signOut, snap } from './support';

const tablet = { viewport: { width: 800, height: 1280 }, hasTouch: true, isMobile: true };

test.describe('a failed safety-critical check on a work order', () => {
  test.use(tablet);

  test('the technician raises the repair (the brake stops), the safety officer signs a deviation for the other line', async ({ page }) => {
    // The state this test needs, made here on a brake of its own: guard work with two
    // safety-critical lines, raised by a counter trigger, both lines answered Not OK.
    await signIn(page, 'admin@alder-row.example');
    const code = `PB-${Date.now().toString(36).toUpperCase()}`;
    const brake = await apiJson(page.request, 'POST', '/machines', { code, name: 'Press brake for the guard test', kind: 'press-brake' });
    const meter = await apiJson(page.request, 'POST', '/meters', { machineId: brake.id, code: 'cycles', name: 'Press cycles', kind: 'count', unit: 'cycles' });
    await apiJson(page.request, 'POST', '/meter-readings', { readings: [{ meterId: meter.id, value: 0 }] });
    await apiJson(page.request, 'POST', '/plans', {
      machineId: brake.id,
      title: 'Guard function test',
      instructions: 'Test the light curtain and the foot pedal.',
      checklist: [
        { key: 'curtain', label: 'Light curtain stops the ram', kind: 'check', safetyCritical: true },
        { key: 'pedal', label: 'Foot pedal guard in place', kind: 'check', safetyCritical: true },
      ],
      parts: [],
      responsibleRole: 'technician',
      triggers: [{ kind: 'meter', meterId: meter.id, every: 1 }],
    });
    await apiJson(page.request, 'POST', '/meter-readings', { readings: [{ meterId: meter.id, value: 5 }] });
    await apiJson(page.request, 'POST', '/job-runs');
    const list = await apiJson(page.request, 'GET', `/work-orders?machineId=${brake.id}&page=1&pageSize=5`);
    expect(list.rows.length, 'the pass raised the guard work').toBe(1);
    const wo = list.rows[0] as { id: string; number: number };
    await signOut(page);

    await signIn(page, 'tech@alder-row.example');
    await apiJson(page.request, 'PUT', `/work-orders/${wo.id}/checklist`, {
      results: [
        { key: 'curtain', result: 'fail', note: 'Ram kept moving with the test rod in the field' },
        { key: 'pedal', result: 'fail', note: 'Guard cracked' },
      ],
    });
    await page.goto(`/work-orders/${wo.id}`);
    const failed = page.getByRole('region', { name: 'Safety-critical checks not OK' });
    await expect(failed.getByText('Light curtain stops the ram')).toBeVisible();
    await expect(page.getByRole('button', { name: 'Sign off the work' })).toBeDisabled();
    // A technician may not sign a deviation: only the repair is offered.
    await expect(failed.getByRole('button', { name: 'Sign a deviation' })).toHaveCount(0);
    await expectAccessible(page, 'work order with failed safety checks');
    await snap(page, 'failed-checks-technician');
    await failed.getByRole('button', { name: 'Raise the repair' }).first().tap();
    const dialog = page.getByRole('dialog', { name: `Raise the repair and stop ${code}?` });
    await expect(dialog).toBeVisible();
    await dialog.getByRole('button', { name: 'Raise the repair' }).tap();
    await expect(page.getByRole('status').filter({ hasText: `is out of service until it is signed off` })).toContainText(`${code} is out of service`);
    await expect(failed.getByText(/Repair raised by Imani Oduya/)).toBeVisible();
    const status = await apiJson(page.request, 'GET', `/machines/${encodeURIComponent(code)}/status`);
    expect(status.state).toBe('out-of-service');
    await signOut(page);

    await signIn(page, 'safety@alder-row.example');
    await page.goto(`/work-orders/${wo.id}`);
    const pedal = failed.getByRole('listitem').filter({ hasText: 'Foot pedal guard in place' });
    await pedal.getByRole('button', { name: 'Sign a deviation' }).tap();
    const form = page.getByRole('form', { name: 'Deviation for “Foot pedal guard in place”' });
    await form.getByLabel('Why the machine may run, and under which measures').fill('short');
    await form.getByLabel('Your password, to sign the deviation').fill(DEMO_PASSWORD);
    await form.getByRole('button', { name: 'Sign the deviation' }).tap();
    await expect(form.getByRole('alert')).toContainText('at least 10 characters');
    await form.getByLabel('Why the machine may run, and under which measures').fill('Two-hand control only until the new guard arrives; supervisor present.');
    await form.getByRole('button', { name: 'Sign the deviation' }).tap();
    await expect(pedal.getByText(/Deviation signed by Tomas Verhoek/)).toContainText('Two-hand control only');
    await snap(page, 'failed-checks-followed-up');
    await expectAccessible(page, 'work order with both failed checks followed up');
  });
});

test('a light curtain mounted closer than ISO 13855 asks for fails its check and stops the brake', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  const code = `PB-LC-${Date.now().toString(36).toUpperCase()}`;
  const brake = await apiJson(page.request, 'POST', '/machines', { code, name: 'Press brake for the curtain check', kind: 'press-brake' });
  await page.goto(`/machines/${brake.id}`);
  await expect(page.getByRole('heading', { name: 'Light-curtain stopping-time check' })).toBeVisible();
  const panel = page.getByRole('main');
  await expect(panel.getByText('No light-curtain check recorded yet')).toBeVisible();
  const form = panel.getByRole('form', { name: 'Record a light-curtain check' });
  await form.getByRole('button', { name: 'Record the check' }).click();
  await expect(form.getByText('Enter a number')).toHaveCount(3);
  // ISO 13855:2010, d ≤ 40 mm (clause 6.2.3, number from memory): S = 2000 mm/s × 0.1 s + 8 × (14 − 14) mm = 200 mm (≥ 100 mm, ≤ 500 mm).
  await form.getByLabel('Stopping time of the whole system (ms)').fill('100');
  await form.getByLabel('Detection capability d (mm)').fill('14');
  await form.getByLabel('Measured distance, curtain to danger zone (mm)').fill('150');
  await form.getByRole('button', { name: 'Record the check' }).click();
  await expect(panel.getByRole('status').filter({ hasText: 'Last check failed' })).toContainText('needs at least 200 mm');
  await expect(panel.getByRole('status').filter({ hasText: 'Last check failed' })).toContainText('The brake was taken out of service.');
  const status = await apiJson(page.request, 'GET', `/machines/${encodeURIComponent(code)}/status`);
  expect(status.state).toBe('out-of-service');
  await form.getByLabel('Stopping time of the whole system (ms)').fill('100');
  await form.getByLabel('Detection capability d (mm)').fill('14');
  await form.getByLabel('Measured distance, curtain to danger zone (mm)').fill('250');
  await form.getByRole('button', { name: 'Record the check' }).click();
  await expect(panel.getByRole('status').filter({ hasText: 'Last check passed' })).toContainText('measured 250 mm');
  await expect(panel.getByRole('table', { name: 'Light-curtain checks, newest first' }).getByRole('row')).toHaveCount(3);
  await expectAccessible(page, 'light-curtain check');
  await snap(page, 'light-curtain-check');
});
