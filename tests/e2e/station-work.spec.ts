import { test, expect } from '@playwright/test';
import { apiJson, expectAccessible, signIn, signOut, snap } from './support';

const tablet = { viewport: { width: 800, height: 1280 }, hasTouch: true, isMobile: true };

/** JSON call with the session's CSRF token, as the app itself does. */
test.describe('station records do scheduled work', () => {
  test.use(tablet);

  test('an electrode + nozzle change at the station signs off the open work order of the plan that names it', async ({ page }) => {
    // The state this test needs, made here: a plan on P1 done by an electrode + nozzle change,
    // due one arc start after it starts, and a pass that raises its work order.
    await signIn(page, 'admin@alder-row.example');
    const station = await apiJson(page.request, 'GET', '/stations/P1');
    const torch = station.torches.find((t: { code: string }) => t.code === 'P1-T');
    const startsMeter = torch.startsMeter;
    const title = `Electrode and nozzle check ${Date.now().toString(36)}`;
    const plan = await apiJson(page.request, 'POST', '/plans', {
      machineId: station.machine.id,
      title,
      instructions: 'Look at the electrode pit and the nozzle bore.',
      checklist: [],
      parts: [],
      responsibleRole: 'operator',
      triggers: [{ kind: 'meter', meterId: startsMeter.id, every: 1 }],
      stationRecord: { kind: 'consumable-change', categories: ['electrode', 'nozzle'] },
    });
    await apiJson(page.request, 'POST', '/meter-readings', { readings: [{ meterId: startsMeter.id, value: (startsMeter.latest?.value ?? 0) + 5 }] });
    await apiJson(page.request, 'POST', '/job-runs');
    const detail = await apiJson(page.request, 'GET', `/plans/${plan.id}`);
    expect(detail.openWorkOrder, 'the pass raised the plan’s work').not.toBeNull();
    const wo = detail.openWorkOrder as { id: string; number: number };
    await signOut(page);

    await signIn(page, 'operator@alder-row.example');
    await page.goto('/station/P1');
    const dueList = page.getByRole('region', { name: 'Due on P1' });
    await expect(dueList).toContainText(`#${wo.number}`);
    await snap(page, 'station-work-before');
    await page.getByRole('button', { name: 'Log a change' }).tap();
    await page.getByRole('button', { name: 'Electrode + nozzle' }).tap();
    // The pre-filled counter is selected on focus: one keystroke replaces it.
    const counter = page.getByLabel(/^Arc starts/);
    const before = await counter.inputValue();
    await counter.tap();
    await expect.poll(() => counter.evaluate((el: HTMLInputElement) => el.value.slice(el.selectionStart ?? 0, el.selectionEnd ?? 0))).toBe(before);
    await page.getByRole('button', { name: 'Record the change' }).tap();
    // The demo's own electrode/nozzle plan on P1 may have open work too: it is signed off beside ours.
    const done = page
      .getByRole('status')
      .filter({ hasText: new RegExp(`It also did the scheduled work (WO \\d+, )*WO ${wo.number}(, WO \\d+)*, now signed off\\.`) });
    await expect(done).toBeVisible();
    await expect(dueList).not.toContainText(`#${wo.number}`);
    const changes = page.getByRole('table', { name: 'Recent consumable changes' });
    const link = changes.getByRole('link', { name: `WO ${wo.number} signed off` });
    await expect(link).toBeVisible();
    await snap(page, 'station-work-after');
    await expectAccessible(page, 'station after a change that did scheduled work');

    await link.tap();
    await expect(page).toHaveURL(new RegExp(`/work-orders/${wo.id}$`));
    const signedOff = page.getByRole('status').filter({ hasText: 'Done at the station' });
    await expect(signedOff).toContainText('recorded it at the station');
    await expect(signedOff).toContainText('Consumable change on P1-T: electrode + nozzle');
    await snap(page, 'station-work-order-done');
    await expectAccessible(page, 'work order done at the station');
  });
});
