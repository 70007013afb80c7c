import { test, expect, type APIRequestContext, type Page } from '@playwright/test';
import { DEMO_PASSWORD, expectAccessible, signIn } from './support';

// A tag used alone shows its reason on the lockout (OSHA 29 CFR 1910.147(c)(3)), and outside
// personnel go through their signed steps on screen (1910.147(f)(2)): procedures exchanged, their
// lead's acknowledgement witnessed, our employees told, their locks on, the release held while they
// are on, their locks off, then the release. The spec uses its own machine and procedure.
test.describe.configure({ mode: 'serial' });

const SHOTS = '/tmp/shots-c';

async function apiCall(request: APIRequestContext, method: 'GET' | 'POST', url: string, data?: unknown) {
  const { token } = await (await request.get('/api/auth/csrf')).json();
  const res = await request.fetch(`/api${url}`, { method, headers: { 'X-CSRF-Token': token }, data });
  expect(res.status(), `${method} ${url}: ${await res.text()}`).toBeLessThan(300);
  return res.json();
}

async function signWith(page: Page) {
  const dialog = page.getByRole('dialog');
  await expect(dialog).toBeVisible();
  await dialog.getByLabel('Your password').fill(DEMO_PASSWORD);
  await dialog.getByRole('button', { name: 'Sign with my password' }).click();
  await expect(dialog).toBeHidden();
}

/** A machine of its own with an approved two-point procedure, and the technician trained on it. */
async function machineWithProcedure(page: Page, code: string) {
  await signIn(page, 'admin@alder-row.example');
  const machine = await apiCall(page.request, 'POST', '/machines', { code, name: 'Hydraulic unit for the contractor test', kind: 'hydraulic-unit' });
  await signIn(page, 'tech@alder-row.example');
  const tech = await apiCall(page.request, 'GET', '/me');
  const proc = await apiCall(page.request, 'POST', '/safety/procedures', {
    machineId: machine.id,
    title: `Energy isolation of ${code}`,
    scope: 'Pump, valve block and hose work by outside fitters.',
    sources: [
      {
        key: 'E1',
        kind: 'electrical',
        description: 'Pump motor supply',
        magnitude: '400 V 3-phase',
        isolationDevice: 'Disconnect Q1',
        location: 'Unit panel, right',
        relieveMethod: 'None needed after Q1 is open',
        verifyMethod: 'Try start at the panel',
      },
      {
        key: 'T1',
        kind: 'thermal',
        description: 'Hot oil and tank surfaces',
        magnitude: 'Up to 60 °C',
        isolationDevice: 'None: wait',
        location: 'Tank and return line',
        relieveMethod: 'Wait until the tank reads below 40 °C',
        verifyMethod: 'Tank thermometer',
      },
    ],
    steps: {
      prepare: ['Tell the operators the unit will be locked out.'],
      shutdown: ['Stop the pump at the panel.'],
      isolate: ['Open Q1.'],
      apply: ['Lock and tag Q1; tag the tank.'],
      relieve: ['Wait for the oil to cool.'],
      verify: ['Try to start the pump.'],
    },
    release: ['Refit guards.', 'Make sure everyone is clear.', 'Tell the operators; remove your own locks.'],
  });
  await signIn(page, 'safety@alder-row.example');
  await apiCall(page.request, 'POST', `/safety/procedures/${proc.id}/versions/1/approve`, { password: DEMO_PASSWORD });
  const today = new Date().toLocaleDateString('en-CA', { timeZone: 'America/Chicago' });
  await apiCall(page.request, 'POST', '/safety/training', {
    userId: tech.user.id,
    procedureId: proc.id,
    kind: 'authorized',
    trainedOn: today,
    password: DEMO_PASSWORD,
  });
  return machine.id as string;
}

test('a tag alone carries its reason, and outside personnel work under the lockout through their signed steps', async ({ page }) => {
  test.setTimeout(180_000);
  await page.setViewportSize({ width: 800, height: 1280 });
  const code = `OP${Date.now() % 100000}`;
  const machineId = await machineWithProcedure(page, code);

  // Tag only on T1: the reason is asked on the form, and refused without it.
  await signIn(page, 'tech@alder-row.example');
  await page.goto(`/safety/lockouts/new?machineId=${machineId}`);
  await expect(page.getByLabel('Energy-control procedure')).toHaveValue(/.+/);
  await page.getByLabel('Work to be done').fill('Outside fitters replace the pump coupling');
  await page.getByLabel('Device on E1').selectOption('lock-and-tag');
  await page.getByLabel('Lock or tag no. on E1').fill(`${code}-1`);
  await page.getByLabel('Device on T1').selectOption('tag-only');
  await page.getByLabel('Lock or tag no. on T1').fill(`${code}-T`);
  await expect(page.getByLabel('Why a tag alone on E1')).toHaveCount(0);
  await page.getByRole('button', { name: 'Sign: my locks are on' }).click();
  await expect(page.getByText(/A tag alone needs a reason/)).toBeVisible();
  await expect(page.getByRole('dialog')).toBeHidden();
  await page.getByLabel('Why a tag alone on T1').selectOption('cannot-take-lock');
  await page.screenshot({ path: `${SHOTS}/apply-form-tag-only.png`, fullPage: true });
  await page.getByRole('button', { name: 'Sign: my locks are on' }).click();
  await expect(page.getByRole('dialog')).toContainText('T1: tag only');
  await expect(page.getByRole('dialog')).toContainText('cannot take a lock (1910.147(c)(3)(i))');
  await signWith(page);
  await expect(page.getByRole('heading', { name: new RegExp(`^Lockout of ${code}`) })).toBeVisible();
  await expect(page.getByText('Tag alone: cannot take a lock (1910.147(c)(3)(i))')).toBeVisible();

  // Outside personnel: procedures exchanged (1910.147(f)(2)(i)).
  const panel = page.locator('section', { has: page.getByRole('heading', { name: 'Outside personnel (1910.147(f)(2))', level: 2 }) });
  await expect(panel.getByText('No outside personnel on this lockout.')).toBeVisible();
  const add = panel.getByRole('form', { name: 'Add outside personnel' });
  await expect(add.getByRole('note')).toContainText('Safety first');
  await add.getByLabel('Outside company').fill('Tallowmere Fluid Power');
  await add.getByLabel('Their lead’s name').fill('Ines Varrow');
  await add.getByLabel('Lead’s phone or e-mail').fill('ines.varrow@tallowmere.example');
  await add.getByLabel('Their personal lock numbers').fill(`${code}-C1, ${code}-C2`);
  await add.getByLabel('Their procedure’s title').fill('Site isolation for pump work');
  await add.getByLabel('Their procedure’s version').fill('rev 2');
  const exchange = add.getByRole('button', { name: 'Sign: procedures exchanged' });
  await expect(exchange).toBeDisabled();
  await add.getByLabel('I received and reviewed their energy-control procedure').check();
  await add.getByLabel('I gave them our procedure for this machine').check();
  await exchange.click();
  await signWith(page);
  const party = panel.getByRole('region', { name: 'Outside personnel: Tallowmere Fluid Power' });
  await expect(party.getByText(/Procedures exchanged: theirs received and reviewed, ours given/)).toBeVisible();

  // Their locks cannot go on before the acknowledgement and the telling.
  await expect(party.getByRole('button', { name: 'Sign: their locks are on' })).toBeDisabled();
  await party.getByLabel('Lead’s name, as they give it').fill('Ines Varrow');
  await party.getByLabel('What the lead said (their acknowledgement)').fill('I have your procedure for this unit and my fitters will work to it.');
  await party.getByRole('button', { name: 'Sign as witness: lead acknowledged' }).click();
  await signWith(page);
  await expect(party.getByText('Their lead acknowledged our procedure')).toBeVisible();
  await party.getByLabel('Their restrictions our people must keep').fill('Nobody opens the valve block while their tags are on.');
  await party.getByLabel('Affected employees you told').fill('Both shift operators of the unit');
  await party.getByRole('button', { name: 'Sign: our employees told' }).click();
  await signWith(page);
  await party.getByRole('button', { name: 'Sign: their locks are on' }).click();
  await signWith(page);
  await expect(party.getByText('Their locks are on')).toBeVisible();
  await expectAccessible(page, 'outside personnel panel');
  await page.screenshot({ path: `${SHOTS}/outside-personnel-locks-on.png`, fullPage: true });

  // The release is held while their locks are on; the refusal says why.
  await page.getByLabel('Work area checked: tools removed, guards back, machine intact').check();
  await page.getByLabel('Everyone is clear of the machine').check();
  await page.getByLabel('Affected employees told the devices are coming off').check();
  await page.getByRole('button', { name: 'Sign: release and remove my locks' }).click();
  await signWith(page);
  await expect(page.getByText(/Outside personnel's locks are still on this lockout: Tallowmere Fluid Power/)).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/release-held.png`, fullPage: true });

  // Their lead takes their locks off, witnessed; then the lockout is released.
  await party.getByLabel('Ines Varrow removed their own locks').check();
  await party.getByLabel("Tallowmere Fluid Power's people are clear").check();
  await party.getByRole('button', { name: 'Sign: their locks are off' }).click();
  await signWith(page);
  await expect(party.getByText('Their locks off, their people clear')).toBeVisible();
  await page.getByRole('button', { name: 'Sign: release and remove my locks' }).click();
  await signWith(page);
  await expect(page.getByRole('paragraph').filter({ hasText: /^Released$/ })).toBeVisible();
  await expect(party.getByRole('button', { name: /^Sign/ })).toHaveCount(0);
  await page.screenshot({ path: `${SHOTS}/outside-personnel-released.png`, fullPage: true });
});
