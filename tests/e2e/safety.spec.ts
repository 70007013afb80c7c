import { test, expect, type Page, type APIRequestContext } from '@playwright/test';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { DEMO_PASSWORD, expectAccessible, signIn, snap } from './support';
import { readPdf } from '../setup/pdf';

const TECH = 'Imani Oduya';
const OPERATOR = 'Dario Fenwick';
const SAFETY = 'Tomas Verhoek';

/** JSON call with the session's CSRF token, as the app itself does. */
async function apiCall(request: APIRequestContext, method: 'GET' | 'POST', url: string, data?: unknown) {
  const { token } = await (await request.get('/api/auth/csrf')).json();
  return request.fetch(`/api${url}`, { method, headers: { 'X-CSRF-Token': token }, data });
}

/** The signing dialog: a wrong password first (it must say so and sign nothing), then the right one. */
async function signWith(page: Page, password = DEMO_PASSWORD) {
  const dialog = page.getByRole('dialog');
  await expect(dialog).toBeVisible();
  await dialog.getByLabel('Your password').fill(password);
  await dialog.getByRole('button', { name: 'Sign with my password' }).click();
}

test.describe.configure({ mode: 'serial' });

let lockoutUrl = '';
let workOrderId: string | null = null;

test('a technician applies and verifies a lockout', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  const machines = (await (await page.request.get('/api/safety/machines')).json()) as {
    id: string;
    code: string;
    procedures: { approvedVersion: number | null }[];
  }[];
  const c2 = machines.find((m) => m.code === 'C2');
  expect(c2?.procedures[0]?.approvedVersion, 'the demo seed gives C2 an approved procedure').toBeTruthy();

  // With the work-orders API present, the lockout protects a work order that needs one.
  const raised = await apiCall(page.request, 'POST', '/work-orders', { machineId: c2!.id, title: 'Replace the clamp pads on C2', requiresLockout: true });
  if (raised.status() === 201 || raised.status() === 200) {
    workOrderId = (await raised.json()).id;
    test.info().annotations.push({ type: 'work order', description: `linked to work order ${workOrderId}` });
  } else {
    test.info().annotations.push({ type: 'work order', description: `work-orders API answered ${raised.status()}; lockout tested without a work order` });
  }

  await page.goto(workOrderId ? `/safety/lockouts/new?machineId=${c2!.id}&workOrderId=${workOrderId}` : '/safety/lockouts/new');
  await expect(page.getByRole('heading', { name: 'Lock out a machine' })).toBeVisible();
  if (!workOrderId) await page.getByLabel('Machine', { exact: true }).selectOption(c2!.id);
  await expect(page.getByLabel('Energy-control procedure')).toHaveValue(/.+/);
  await page.getByLabel('Work to be done').fill('Replace the clamp pads');
  const lockFields = page.getByLabel(/^Lock or tag no\. on /);
  // C2-E1 … C2-E5 in the demo procedure (tags that cannot be read as machine codes), and H1-E2, the hydraulic unit's shared point that feeds C2.
  await expect(lockFields).toHaveCount(6);
  // Sign without lock numbers: the form says which are missing and nothing opens.
  await page.getByRole('button', { name: 'Sign: my locks are on' }).click();
  await expect(page.getByText('Enter the lock number').first()).toBeVisible();
  await expect(page.getByRole('dialog')).toBeHidden();
  const n = await lockFields.count();
  for (let i = 0; i < n; i++) await lockFields.nth(i).fill(`E2E-${i + 1}`);
  await expectAccessible(page, 'lockout apply form');
  await snap(page, 'safety-lockout-apply');
  await page.getByRole('button', { name: 'Sign: my locks are on' }).click();
  await expect(page.getByRole('dialog')).toContainText('I applied my own lockout or tagout devices at the isolation points listed.');
  await expectAccessible(page, 'signing dialog');
  await page.screenshot({ path: 'tests/e2e/artifacts/safety-sign-dialog.png' });
  await signWith(page, 'not the password');
  await expect(page.getByRole('dialog').getByRole('alert')).toHaveText('Wrong password: nothing was signed');
  await signWith(page);
  await expect(page.getByRole('heading', { name: /^Lockout of C2/ })).toBeVisible();
  await expect(page.getByText('Locks on, isolation not yet verified')).toBeVisible();
  lockoutUrl = page.url();

  // Verify: try-start and every point ticked before the button works.
  const verify = page.getByRole('button', { name: 'Sign: zero energy verified' });
  await expect(verify).toBeDisabled();
  await page.getByLabel('I tried to start the machine with its normal controls; it did not start').check();
  for (const key of ['C2-E1', 'C2-E2', 'C2-E3', 'C2-E4', 'C2-E5', 'H1-E2']) await page.getByLabel(new RegExp(`^${key} · .*: zero energy`)).check();
  await verify.click();
  await signWith(page);
  await expect(page.getByText('Locked out: do not operate')).toBeVisible();
  await expect(page.getByText(`#`).filter({ hasText: 'Zero energy verified' })).toBeVisible();
  await expectAccessible(page, 'lockout detail');
  await snap(page, 'safety-lockout-verified');

  if (workOrderId) {
    // The work order cannot be closed while its lockout is on.
    await apiCall(page.request, 'POST', `/work-orders/${workOrderId}/move`, { move: 'start' });
    const early = await apiCall(page.request, 'POST', `/work-orders/${workOrderId}/close`, { labourMinutes: 30 });
    expect(early.status()).toBe(409);
    expect((await early.json()).message).toMatch(/lockout .* not been released/);
  }
});

test('an operator does the shift PPE check on a tablet', async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 800, height: 1280 }, hasTouch: true });
  const page = await context.newPage();
  await signIn(page, 'operator@alder-row.example');
  await page.getByRole('link', { name: 'PPE check' }).first().click();
  await expect(page.getByRole('heading', { name: 'PPE check' })).toBeVisible();
  await page.getByRole('button', { name: /^C1/ }).tap();
  const sign = page.getByRole('button', { name: 'Sign: PPE check done' });
  await expect(sign).toBeDisabled();
  await expect(page.getByText('Do not start yet')).toBeVisible();
  // Filter lens at 130 A: OSHA 29 CFR 1910.133(a)(5) minimum shade 8.
  await expect(page.getByText('Shade 8 or darker at 130 A (suggested 9)')).toBeVisible();
  const items = page.getByRole('button', { pressed: false }).filter({ hasText: 'Not yet on' });
  const count = await items.count();
  expect(count).toBeGreaterThanOrEqual(4);
  for (let i = 0; i < count; i++) await page.getByRole('button', { pressed: false }).filter({ hasText: 'Not yet on' }).first().tap();
  await expect(page.getByText('Everything on')).toBeVisible();
  // The sign step scrolls into view once the last item is on.
  await expect(sign).toBeInViewport();
  await expectAccessible(page, 'PPE check (tablet)');
  await snap(page, 'safety-ppe-check-tablet');
  await sign.tap();
  await signWith(page);
  await expect(page.getByText('PPE check signed')).toBeVisible();
  // Signed: only the signed check shows (who, items), not the reset item list and its red warning.
  const signed = page.getByRole('region', { name: /PPE check signed/ });
  await expect(signed).toContainText(`signed by ${OPERATOR}`);
  await expect(signed.getByRole('listitem')).toHaveCount(count);
  await expect(page.getByText('Do not start yet')).toBeHidden();
  await expect(page.getByRole('button', { name: 'Sign: PPE check done' })).toBeHidden();
  await snap(page, 'safety-ppe-signed-tablet');
  await page.getByRole('button', { name: 'Start a new check' }).tap();
  await expect(page.getByText('Do not start yet')).toBeVisible();

  // Plasma cutting done: a fire watch for the time the site's rule sets (OSHA 1910.252(a)(2)(iii)(B): 30 min).
  await page.goto('/safety/hot-work');
  await page.getByLabel('Machine').selectOption({ label: 'P1 · Plasma table' });
  await page.getByRole('button', { name: 'Sign: start fire watch' }).tap();
  await signWith(page);
  await expect(page.getByText(/Fire watch started: stay until/)).toBeVisible();
  const watch = page.getByRole('article', { name: 'Fire watch at P1' });
  await expect(watch.getByRole('timer')).toHaveText(/^(30:00|29:\d\d)$/);
  await expect(watch.getByRole('button', { name: 'Sign: watch ended, no fire found' })).toBeDisabled();
  await expectAccessible(page, 'fire watch (tablet)');
  await snap(page, 'safety-fire-watch-tablet');
  await context.close();
});

test('the technician releases the lockout and closes the work order', async ({ page }) => {
  await signIn(page, 'tech@alder-row.example');
  if (workOrderId) {
    // Load the work order first so its page is cached, then reach the lockout in-app: no reloads from here on.
    await page.goto(`/work-orders/${workOrderId}`);
    await expect(page.getByText('Lockout applied')).toBeVisible();
    await page.getByRole('link', { name: 'Open the lockout' }).click();
  } else {
    await page.goto(lockoutUrl);
  }
  const release = page.getByRole('button', { name: 'Sign: release and remove my locks' });
  await expect(release).toBeDisabled();
  await page.getByLabel('Work area checked: tools removed, guards back, machine intact').check();
  await page.getByLabel('Everyone is clear of the machine').check();
  await page.getByLabel('Affected employees told the devices are coming off').check();
  await release.click();
  await signWith(page);
  await expect(page.getByText('Released', { exact: true }).first()).toBeVisible();
  await expect(page.getByText(/All devices were removed/)).toBeVisible();
  await snap(page, 'safety-lockout-released');
  if (workOrderId) {
    // Back to the work order by its link, without a reload: it must already know the lockout is released.
    await page.getByRole('link', { name: /^WO \d+$/ }).click();
    await expect(page).toHaveURL(new RegExp(`/work-orders/${workOrderId}$`));
    await expect(page.getByText('Ready to sign off')).toBeVisible();
    await expect(page.getByText('Apply lockout before work')).toBeHidden();
    await expect(page.getByRole('button', { name: 'Sign off the work' })).toBeEnabled();
    const closed = await apiCall(page.request, 'POST', `/work-orders/${workOrderId}/close`, { labourMinutes: 45 });
    expect(closed.status(), await closed.text()).toBeLessThan(300);
    const wo = await (await page.request.get(`/api/work-orders/${workOrderId}`)).json();
    expect(wo.status).toBe('done');
  }
});

test('the safety officer filters the audit, verifies the chain and exports CSV and PDF', async ({ page }) => {
  await signIn(page, 'safety@alder-row.example');
  await page.getByRole('link', { name: 'Safety audit' }).click();
  await expect(page.getByRole('heading', { name: 'Safety audit' })).toBeVisible();

  await page.getByRole('button', { name: 'Verify the chain' }).click();
  await expect(page.getByText('Chain verified', { exact: true })).toBeVisible();
  await expect(page.getByText(/all \d+ signatures are intact and in order/)).toBeVisible();

  const table = page.getByRole('table', { name: 'Safety signatures' });
  await page.getByRole('combobox', { name: 'Person' }).selectOption({ label: TECH });
  await page.getByRole('combobox', { name: 'Meaning' }).selectOption({ label: 'Lockout released' });
  await expect(table.getByRole('row')).not.toHaveCount(1);
  await expect(table.getByRole('cell', { name: TECH }).first()).toBeVisible();
  await expect(table.getByText(/^C2: area checked, people clear, affected employees told; removed C2-E1 lock E2E-1/)).toBeVisible();
  await expectAccessible(page, 'safety audit');
  await snap(page, 'safety-audit');

  // Filters live in the URL: a reload (or a shared link) shows the same view.
  await expect(page).toHaveURL(/[?&]meaning=lockout-released/);
  await page.reload();
  await expect(page.getByRole('combobox', { name: 'Meaning' })).toHaveValue('lockout-released');
  await expect(page.getByRole('combobox', { name: 'Person' })).toHaveValue(/.+/);
  await expect(table.getByText(/^C2: area checked, people clear, affected employees told; removed C2-E1 lock E2E-1/)).toBeVisible();

  // The correction form opens as a dialog over the table, not below it.
  await table
    .getByRole('button', { name: /^Add correction/ })
    .first()
    .click();
  const correction = page.getByRole('dialog', { name: /^Add a correction to #\d+/ });
  await expect(correction).toBeVisible();
  await expect(correction.getByRole('button', { name: 'Sign: correction' })).toBeDisabled();
  await expectAccessible(page, 'correction dialog');
  await snap(page, 'safety-audit-correction-dialog');
  await correction.getByRole('button', { name: 'Cancel' }).click();
  await expect(correction).toBeHidden();

  // A reversed date range is an error on "To", not "no signatures".
  await page.getByLabel('From', { exact: true }).fill('2026-03-10');
  await page.getByLabel('To', { exact: true }).fill('2026-03-01');
  await expect(page.getByLabel('To', { exact: true })).toHaveAttribute('aria-invalid', 'true');
  await expect(page.getByRole('alert').filter({ hasText: '"To" must be on or after "From" (2026-03-10)' })).toBeVisible();
  await expect(page.getByText('No signatures match these filters')).toBeHidden();
  await snap(page, 'safety-audit-reversed-dates');

  const dir = mkdtempSync(path.join(tmpdir(), 'kb-e2e-audit-'));
  await page.getByRole('combobox', { name: 'Meaning' }).selectOption({ label: 'Any meaning' });
  await page.getByRole('combobox', { name: 'Person' }).selectOption({ label: 'Everyone' });
  const today = new Date().toISOString().slice(0, 10);
  await page.getByLabel('From', { exact: true }).fill(new Date(Date.now() - 2 * 86_400_000).toISOString().slice(0, 10));
  await page.getByLabel('To', { exact: true }).fill(today);

  const [csvDownload] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Export CSV' }).click()]);
  const csvPath = path.join(dir, 'audit.csv');
  await csvDownload.saveAs(csvPath);
  const csv = readFileSync(csvPath, 'utf8');
  expect(csv).toContain('printed_name');
  for (const name of [TECH, OPERATOR]) expect(csv).toContain(name);
  expect(csv).toContain('Locks applied');
  expect(csv).toContain('Maintenance technician');
  expect(csv).not.toContain('ALTERED');

  const [pdfDownload] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Export PDF' }).click()]);
  const pdfPath = path.join(dir, 'audit.pdf');
  await pdfDownload.saveAs(pdfPath);
  const pdf = await readPdf(readFileSync(pdfPath));
  expect(pdf.firstPagePng.length).toBeGreaterThan(20_000); // a page with ink on it, not a blank sheet
  const text = pdf.text.replace(/\s+/g, ' ');
  expect(text.toLowerCase()).toContain('chain verified');
  for (const name of [TECH, OPERATOR]) expect(text).toContain(name);
  writeFileSync('tests/e2e/artifacts/safety-audit-pdf.png', pdf.firstPagePng);
  expect(SAFETY).toBeTruthy();
});

test('the safety screens read well and pass the accessibility scan', async ({ page }) => {
  await signIn(page, 'safety@alder-row.example');
  const screens: [string, string, RegExp][] = [
    ['/safety', 'safety-hub', /Safety log/],
    ['/safety/procedures', 'safety-procedures', /Energy-control procedures/],
    ['/safety/ppe/requirements', 'safety-ppe-requirements', /PPE requirements/],
    ['/safety/records', 'safety-records', /Inspections and training/],
    ['/safety/hot-work', 'safety-hot-work', /Fire watch/],
    ['/safety/settings', 'safety-settings', /Site safety settings/],
    ['/safety/lockouts', 'safety-lockouts', /^Lockouts$/],
  ];
  for (const [url, name, heading] of screens) {
    await page.goto(url);
    await expect(page.getByRole('heading', { level: 1, name: heading })).toBeVisible();
    await page.waitForLoadState('networkidle');
    await expectAccessible(page, name);
    await snap(page, name);
  }
  await page.goto('/safety/settings');
  const shades = page.getByRole('table', { name: 'Plasma cutting shades in use' });
  await expect(shades.getByRole('cell', { name: 'Light (under 300 A)' })).toBeVisible();
  await expect(shades.getByRole('cell', { name: 'light', exact: true })).toHaveCount(0);

  // Each row of "Safety work due" opens the place where that work is done, prefilled.
  await page.goto('/safety');
  const due = page.getByRole('table', { name: 'Safety work due' });
  await due
    .getByRole('link', { name: /^Retrain .* on C1/ })
    .first()
    .click();
  await expect(page).toHaveURL(/\/safety\/records\?train=[^&]+&procedure=/);
  const training = page.getByRole('form', { name: 'Record training' });
  await expect(training).toBeVisible();
  await expect(training.getByLabel('Person')).toHaveValue(/.+/);
  await expect(training.getByLabel('Procedure (its approved version)')).toHaveValue(/.+/);
  await expect(training.getByLabel('Kind of training')).toHaveValue('affected'); // the demo operator is trained as an affected employee
  await snap(page, 'safety-records-from-due-task');
  await page.goto('/safety');
  await due.getByRole('link', { name: /^PPE check at P1/ }).click();
  await expect(page).toHaveURL(/\/safety\/ppe\?machineId=/);
  await expect(page.getByRole('button', { name: /^P1/ })).toHaveAttribute('aria-pressed', 'true');

  await page.goto('/safety/procedures');
  await page.getByRole('link', { name: /Full energy isolation of Punch\/plasma cell 1/ }).click();
  await expect(page.getByText('Apply energy control — in this order')).toBeVisible();
  await expectAccessible(page, 'procedure');
  await snap(page, 'safety-procedure');
  // A new procedure needs every phase of 1910.147(d): the form says what is missing.
  await page.goto('/safety/procedures/new');
  await page.getByRole('button', { name: 'Save as draft version 1' }).click();
  await expect(page.getByText('Title is required')).toBeVisible();
  await expect(page.getByText('Verify isolation: add at least one step')).toBeVisible();
  await expectAccessible(page, 'procedure editor');
  await snap(page, 'safety-procedure-editor');

  // A technician changes the approved procedure (a draft); the safety officer, not its author, approves it with a signature.
  const techContext = await page.context().browser()!.newContext();
  const tech = await techContext.newPage();
  await signIn(tech, 'tech@alder-row.example');
  await tech.goto('/safety/procedures');
  await tech.getByRole('link', { name: /Energy isolation of Press brake/ }).click();
  await tech.getByRole('link', { name: /Change this procedure/ }).click();
  await tech.getByLabel('Scope: which work this procedure is for').fill('Tool changes, back-gauge work, and cleaning between the beams.');
  await tech.getByRole('button', { name: 'Save draft' }).click();
  await expect(tech.getByRole('heading', { name: 'Draft version 2' })).toBeVisible();
  await techContext.close();
  await page.goto('/safety/procedures');
  await page.getByRole('link', { name: /Energy isolation of Press brake/ }).click();
  await expect(page.getByRole('heading', { name: 'Draft version 2' })).toBeVisible();
  // The approver reads what the draft changes, marked, beside the approve action.
  const changes = page.getByRole('list', { name: 'Changes from version 1' });
  await expect(changes.getByRole('listitem')).toHaveCount(1);
  await expect(changes.getByRole('listitem').first()).toContainText('Scope · changed');
  await expect(changes.locator('ins')).toHaveText('Now: Tool changes, back-gauge work, and cleaning between the beams.');
  // Both texts side by side, the changed line marked on each side, the approve action under the draft's column.
  const sideBySide = page.getByRole('table', { name: 'Version 1 beside draft version 2' });
  await expect(sideBySide.locator('tr[data-mark="changed"]')).toHaveCount(1);
  await expect(sideBySide.locator('tr[data-mark="changed"] del')).toContainText('Tool changes');
  await expect(sideBySide.locator('tr[data-mark="changed"] ins')).toHaveText('Now: Tool changes, back-gauge work, and cleaning between the beams.');
  await expect(sideBySide.locator('tr[data-mark="same"]').first()).toBeVisible();
  await page.getByLabel('Only the changed lines').check();
  await expect(sideBySide.locator('tr[data-mark="same"]')).toHaveCount(0);
  await snap(page, 'safety-procedure-side-by-side');
  await sideBySide.getByRole('button', { name: 'Sign: approve version 2' }).click();
  await signWith(page);
  await expect(page.getByText('Version 2 approved and in force.')).toBeVisible();
  await expect(page.getByRole('link', { name: /v1 superseded/i })).toBeVisible();

  // The lockout page on a phone: the technician at the machine.
  const phone = await page
    .context()
    .browser()!
    .newContext({ viewport: { width: 390, height: 844 }, hasTouch: true });
  const mobile = await phone.newPage();
  await signIn(mobile, 'tech@alder-row.example');
  await mobile.goto('/safety/lockouts');
  await mobile
    .getByRole('link', { name: /^F1 · Fume extractor/ })
    .first()
    .tap();
  await expect(mobile.getByText('Locked out: do not operate')).toBeVisible();
  await expectAccessible(mobile, 'lockout on a phone');
  await snap(mobile, 'safety-lockout-phone');
  await phone.close();
  const placard = await page.request.get(
    await page
      .getByRole('link', { name: 'Print placard (PDF)' })
      .getAttribute('href')
      .then((h) => h!),
  );
  expect(placard.headers()['content-type']).toBe('application/pdf');
});
