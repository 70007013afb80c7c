import { test, expect, type APIRequestContext, type Page } from '@playwright/test';
import { snap } from './support';
import { announced, expectArrived, expectFocusNotLost, expectVisibleRing, markLiveRegions, signByKeyboard, signInByKeyboard, tabTo } from './keyboard-support';

// The three main jobs, done with the keyboard alone (no clicks, no taps): focus is checked after
// every action, each page's title, the sorted header and what a screen reader hears.

async function apiCall(request: APIRequestContext, method: 'GET' | 'POST', url: string, data?: unknown) {
  const { token } = await (await request.get('/api/auth/csrf')).json();
  return request.fetch(`/api${url}`, { method, headers: { 'X-CSRF-Token': token }, data });
}

const SHOTS = '/tmp/shots-x';
const shot = (page: Page, name: string) => page.screenshot({ path: `${SHOTS}/${name}.png` });

// On cell 2, so the station specs find cell 1's torch and its scheduled work as the demo left them.
test('operator logs a consumable change at the station with the keyboard', async ({ page }) => {
  await signInByKeyboard(page, 'operator@alder-row.example');
  await expect(page).toHaveTitle('Today — Kerfbook');

  await tabTo(page, page.getByRole('link', { name: /^C2\b/ }).first());
  await page.keyboard.press('Enter');
  await expectArrived(page, 'Station C2 — Kerfbook', /^C2 · /);

  const torch = page.getByRole('region', { name: 'Torch C2-T' });
  await tabTo(page, torch.getByRole('button', { name: 'Log a change' }));
  await page.keyboard.press('Enter');
  await expect(torch.getByRole('heading', { name: 'Log a change on C2-T' })).toBeFocused();
  await tabTo(page, torch.getByRole('button', { name: 'Electrode + nozzle' }));
  await page.keyboard.press('Space');
  await expect(torch.getByRole('button', { name: 'Electrode + nozzle' })).toHaveAttribute('aria-pressed', 'true');

  // The selected reason is drawn dark: its focus ring must still show (WCAG 1.4.11).
  const worn = torch.getByRole('group', { name: 'Why the electrode came out' }).getByRole('button', { name: 'Worn' });
  await expect(worn).toHaveAttribute('aria-pressed', 'true');
  await tabTo(page, worn);
  await expectVisibleRing(page, 'selected change reason');
  await shot(page, 'focus-selected-reason');

  await markLiveRegions(page);
  await tabTo(page, torch.getByRole('button', { name: 'Record the change' }));
  await page.keyboard.press('Enter');
  const confirmation = announced(page, /Change recorded on C2-T: electrode \(worn\) and nozzle/);
  await expect(confirmation).toHaveCount(1);
  // The sheet is gone; focus is on its result, not lost to the page.
  await expect(confirmation).toBeFocused();
  await shot(page, 'station-after-record-focus');
});

test('technician works a work order that needs a lockout, with the keyboard', async ({ page }) => {
  test.setTimeout(300_000);
  await signInByKeyboard(page, 'tech@alder-row.example');
  // A machine with an approved procedure and no open lockout; the work needs a lockout.
  const machines = (await (await page.request.get('/api/safety/machines')).json()) as {
    id: string;
    code: string;
    procedures: { approvedVersion: number | null }[];
  }[];
  const open = (await (await page.request.get('/api/safety/lockouts')).json()) as
    { machineCode: string; state: string }[] | { rows: { machineCode: string; state: string }[] };
  const locked = new Set((Array.isArray(open) ? open : open.rows).filter((l) => l.state !== 'released').map((l) => l.machineCode));
  const machine = machines.find((m) => m.code !== 'C2' && !locked.has(m.code) && m.procedures.some((p) => p.approvedVersion));
  expect(machine, 'a machine with an approved procedure and no lockout').toBeTruthy();
  const title = 'Replace the clamp pads';
  const raised = await apiCall(page.request, 'POST', '/work-orders', { machineId: machine!.id, title, requiresLockout: true });
  expect(raised.status(), await raised.text()).toBeLessThan(300);
  const wo = (await raised.json()) as { id: string; number: number };
  // A second work order with the same title: rows must still be told apart.
  await apiCall(page.request, 'POST', '/work-orders', { machineId: machine!.id, title });

  const main = page.getByRole('navigation', { name: 'Main' });
  await tabTo(page, main.getByRole('link', { name: 'Work orders', exact: true }));
  await expectVisibleRing(page, 'menu link');
  await shot(page, 'focus-menu-link');
  await page.keyboard.press('Enter');
  await expectArrived(page, 'Work orders — Kerfbook', 'Work orders');

  const table = page.getByRole('table', { name: 'Work orders' });
  await markLiveRegions(page);
  await tabTo(page, page.getByLabel('Search'));
  await page.keyboard.type(title);
  await expect(announced(page, /^2 work orders match/)).toHaveCount(1);
  await expect(table.getByRole('link', { name: `WO ${wo.number}: ${title}`, exact: true })).toHaveCount(1);

  // Sorting by number from the keyboard: the header says so, and so does the live region.
  const byNumber = table.getByRole('button', { name: /^WO/ });
  await tabTo(page, byNumber);
  await expectVisibleRing(page, 'table header');
  await shot(page, 'focus-table-header');
  await page.keyboard.press('Enter');
  await expect(table.getByRole('columnheader', { name: /^WO/ })).toHaveAttribute('aria-sort', /ascending|descending/);
  await expect(announced(page, /2 work orders match, sorted by WO, (ascending|descending)/)).toHaveCount(1);
  await expect(byNumber).toBeFocused();

  await tabTo(page, table.getByRole('link', { name: `WO ${wo.number}: ${title}`, exact: true }));
  await page.keyboard.press('Enter');
  await expectArrived(page, `WO ${wo.number} — Kerfbook`, `WO ${wo.number} · ${title}`);

  // Start without a lockout: the caution dialog; Escape gives focus back to Start work.
  await tabTo(page, page.getByRole('button', { name: 'Start work' }));
  await page.keyboard.press('Enter');
  const caution = page.getByRole('dialog', { name: /Caution: lockout needed/ });
  await expect(caution).toBeVisible();
  await page.keyboard.press('Escape');
  await expect(caution).toBeHidden();
  await expect(page.getByRole('button', { name: 'Start work' })).toBeFocused();
  await page.keyboard.press('Enter');
  await tabTo(page, caution.getByRole('link', { name: 'Lock out first' }));
  await page.keyboard.press('Enter');
  await expectArrived(page, 'Lock out a machine — Kerfbook', 'Lock out a machine');

  const lockFields = page.getByLabel(/^Lock or tag no\. on /);
  await expect(lockFields.first()).toBeVisible();
  const n = await lockFields.count();
  await tabTo(page, page.getByLabel('Work to be done'));
  await page.keyboard.type(title);
  for (let i = 0; i < n; i++) {
    await tabTo(page, lockFields.nth(i));
    await page.keyboard.type(`KB-${i + 1}`);
  }
  await tabTo(page, page.getByRole('button', { name: 'Sign: my locks are on' }));
  await page.keyboard.press('Enter');
  await signByKeyboard(page);
  await expectArrived(page, new RegExp(`^Lockout of ${machine!.code} · .* — Kerfbook$`), new RegExp(`^Lockout of ${machine!.code} · `));

  // Verify: tick with Space, sign; the button goes away and focus goes to the result.
  await tabTo(page, page.getByLabel('I tried to start the machine with its normal controls; it did not start'));
  await page.keyboard.press('Space');
  const points = page.getByLabel(/: zero energy/);
  for (let i = 0; i < (await points.count()); i++) {
    await tabTo(page, points.nth(i));
    await page.keyboard.press('Space');
  }
  await markLiveRegions(page);
  await tabTo(page, page.getByRole('button', { name: 'Sign: zero energy verified' }));
  await page.keyboard.press('Enter');
  await signByKeyboard(page);
  const verified = announced(page, 'Isolation verified and signed. Work may start.');
  await expect(verified).toHaveCount(1);
  await expect(verified).toBeFocused();

  await tabTo(page, page.getByRole('link', { name: `WO ${wo.number}`, exact: true }));
  await page.keyboard.press('Enter');
  await expectArrived(page, `WO ${wo.number} — Kerfbook`, `WO ${wo.number} · ${title}`);

  // Start work: the button goes away; focus moves to the next move (Pause) and the start is announced.
  await markLiveRegions(page);
  await tabTo(page, page.getByRole('button', { name: 'Start work' }));
  await page.keyboard.press('Enter');
  await expect(page.getByRole('button', { name: 'Pause' })).toBeFocused();
  await expect(announced(page, 'Work started.')).toHaveCount(1);

  // Save time and notes: focus stays on the button, the result is announced.
  await tabTo(page, page.getByLabel('Time spent (minutes)'));
  await page.keyboard.type('40');
  await tabTo(page, page.getByRole('textbox', { name: 'Notes', exact: true }));
  await page.keyboard.type('Pads replaced, clamps checked.');
  await markLiveRegions(page);
  await tabTo(page, page.getByRole('button', { name: 'Save time and notes' }));
  await page.keyboard.press('Enter');
  await expect(announced(page, 'Saved.')).toHaveCount(1);
  await expect(page.getByRole('button', { name: 'Save time and notes' })).toBeFocused();

  // Release the lockout.
  await tabTo(page, page.getByRole('link', { name: 'Open the lockout' }));
  await page.keyboard.press('Enter');
  await expect(page.getByRole('heading', { level: 1, name: new RegExp(`^Lockout of ${machine!.code}`) })).toBeFocused();
  for (const label of [
    'Work area checked: tools removed, guards back, machine intact',
    'Everyone is clear of the machine',
    'Affected employees told the devices are coming off',
  ]) {
    await tabTo(page, page.getByLabel(label));
    await page.keyboard.press('Space');
  }
  await markLiveRegions(page);
  await tabTo(page, page.getByRole('button', { name: 'Sign: release and remove my locks' }));
  await page.keyboard.press('Enter');
  await signByKeyboard(page);
  const released = announced(page, 'Lockout released: your devices are recorded as removed.');
  await expect(released).toHaveCount(1);
  await expect(released).toBeFocused();

  await tabTo(page, page.getByRole('link', { name: `WO ${wo.number}`, exact: true }));
  await page.keyboard.press('Enter');
  await expectArrived(page, `WO ${wo.number} — Kerfbook`, `WO ${wo.number} · ${title}`);
  await expect(page.getByText('Ready to sign off')).toBeVisible();

  // Sign off: the panel goes away; the page's announcer says it and focus goes to the record of it.
  await markLiveRegions(page);
  await tabTo(page, page.getByRole('button', { name: 'Sign off the work' }));
  await page.keyboard.press('Enter');
  await expect(announced(page, /^Signed off\./)).toHaveCount(1);
  await expect(page.locator('#work-signed-off')).toBeFocused();
  await expect(page.locator('#work-signed-off')).toContainText('signed this off');
  await expectFocusNotLost(page);
  await shot(page, 'work-order-signed-off-focus');
});

test('safety officer audits, exports and corrects with the keyboard', async ({ page }) => {
  test.setTimeout(300_000);
  await signInByKeyboard(page, 'safety@alder-row.example');
  const me = (await (await page.request.get('/api/me')).json()) as { organization: { timeZone: string } };
  const tz = me.organization.timeZone;

  // Sign out sits on the dark top bar: its ring must show there.
  await tabTo(page, page.getByRole('button', { name: 'Sign out' }));
  await expectVisibleRing(page, 'Sign out');
  await shot(page, 'focus-sign-out');

  await tabTo(page, page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Safety audit' }));
  await page.keyboard.press('Enter');
  await expectArrived(page, 'Safety audit — Kerfbook', 'Safety audit');

  // Verify the chain: focus stays on the button (it is never disabled under the keyboard), the result is announced.
  await markLiveRegions(page);
  const verify = page.getByRole('button', { name: 'Verify the chain' });
  await tabTo(page, verify);
  await page.keyboard.press('Enter');
  await expect(announced(page, /Chain verified/)).toHaveCount(1);
  await expect(verify).toBeFocused();

  // A date typed the shop's way (month/day/year), quickly, in From: read as that day, not year 2.
  const isoDaysAgo = (days: number) => new Intl.DateTimeFormat('en-CA', { timeZone: tz }).format(new Date(Date.now() - days * 86_400_000));
  const from = isoDaysAgo(30);
  const [y, m, d] = from.split('-');
  const expected = (await (await page.request.get(`/api/safety/sign-offs?from=${from}&page=1&pageSize=25`)).json()) as { total: number };
  await markLiveRegions(page);
  await tabTo(page, page.getByLabel('From', { exact: true }));
  await page.keyboard.type(`${m}/${d}/${y}`, { delay: 0 });
  await page.keyboard.press('Tab');
  await expect(page).toHaveURL(new RegExp(`[?&]from=${from}`));
  await expect(page.getByLabel('From', { exact: true })).toHaveValue(`${m}/${d}/${y}`);
  const count = `${expected.total} ${expected.total === 1 ? 'signature matches' : 'signatures match'}`;
  await expect(announced(page, new RegExp(`^${count}`))).toHaveCount(1);

  // Sorting "Signed": the header carries aria-sort and the announcement says the order.
  const table = page.getByRole('table', { name: 'Safety signatures' });
  const signed = table.getByRole('button', { name: /^Signed/ });
  await markLiveRegions(page);
  await tabTo(page, signed);
  await page.keyboard.press('Enter');
  await expect(table.getByRole('columnheader', { name: /^Signed/ })).toHaveAttribute('aria-sort', 'ascending');
  await expect(announced(page, `${count}, sorted by Signed, ascending`)).toHaveCount(1);
  await expect(signed).toBeFocused();
  await page.keyboard.press('Enter');
  await expect(table.getByRole('columnheader', { name: /^Signed/ })).toHaveAttribute('aria-sort', 'descending');
  await expect(announced(page, `${count}, sorted by Signed, descending`)).toHaveCount(1);
  await expect(table.locator('th[aria-sort]')).toHaveCount(1);

  // Export with the same filters, from the keyboard.
  await tabTo(page, page.getByRole('link', { name: 'Export CSV' }));
  const [csv] = await Promise.all([page.waitForEvent('download'), page.keyboard.press('Enter')]);
  expect(csv.url()).toContain(`from=${from}`);

  // Escape from the correction dialog gives focus back to the button that opened it.
  const add = table.getByRole('button', { name: /^Add correction to #\d+/ }).first();
  const addName = (await add.getAttribute('aria-label'))!;
  await tabTo(page, add);
  await page.keyboard.press('Enter');
  const dialog = page.getByRole('dialog', { name: /^Add a correction to #\d+/ });
  await expect(dialog).toBeVisible();
  await page.keyboard.press('Escape');
  await expect(dialog).toBeHidden();
  await expect(table.getByRole('button', { name: addName, exact: true })).toBeFocused();

  // The correction itself: focus goes to the result once both dialogs are gone.
  await page.keyboard.press('Enter');
  await expect(dialog).toBeVisible();
  await tabTo(page, dialog.getByLabel('What was wrong and what is right'));
  await page.keyboard.type('Wrong lock number written; the lock on the point was KB-7.');
  await markLiveRegions(page);
  await tabTo(page, dialog.getByRole('button', { name: 'Sign: correction' }));
  await page.keyboard.press('Enter');
  await signByKeyboard(page);
  const corrected = announced(page, /^Correction signed as #\d+\.$/);
  await expect(corrected).toHaveCount(1);
  await expect(corrected).toBeFocused();
  await snap(page, 'keyboard-audit-corrected');
});
