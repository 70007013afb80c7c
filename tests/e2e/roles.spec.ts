import { test, expect } from '@playwright/test';
import { expectAccessible, signIn, signOut, snap } from './support';

const roles = [
  { email: 'operator@alder-row.example', role: 'Operator', heading: /Hello, Dario/, section: 'At the machine' },
  { email: 'tech@alder-row.example', role: 'Maintenance technician', heading: /Hello, Imani/, section: 'Work to do' },
  { email: 'safety@alder-row.example', role: 'Safety officer', heading: /Hello, Tomas/, section: 'Safety programme' },
  { email: 'admin@alder-row.example', role: 'Admin', heading: /Hello, Rhea/, section: 'Shop overview' },
];

test('the sign-in page is accessible and explains a bad sign-in', async ({ page }) => {
  await page.goto('/');
  await expect(page).toHaveURL(/\/sign-in/);
  await expectAccessible(page, 'sign-in');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByText('Enter a valid e-mail address')).toBeVisible();
  await page.getByLabel('E-mail').fill('operator@alder-row.example');
  await page.getByLabel('Password').fill('wrong password');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('alert')).toContainText('E-mail or password is wrong');
  await snap(page, 'sign-in-error');
});

for (const r of roles) {
  test(`${r.role} signs in, sees their home and signs out`, async ({ page }) => {
    await signIn(page, r.email);
    await expect(page.getByRole('heading', { name: r.heading })).toBeVisible();
    await expect(page.getByText(r.section, { exact: true })).toBeVisible();
    await expect(page.getByText(r.role, { exact: true })).toBeVisible();
    await expectAccessible(page, `${r.role} home`);
    await snap(page, `home-${r.role.toLowerCase().replace(/\s+/g, '-')}`);
    await signOut(page);
    await page.goto('/');
    await expect(page).toHaveURL(/\/sign-in/);
  });
}

test('admin invites a person who accepts through the mailed link', async ({ page, browser }) => {
  await signIn(page, 'admin@alder-row.example');
  // The admin pages are one menu entry, with tabs on each page.
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Shop admin', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'People' })).toBeVisible();
  await expect(page.getByRole('navigation', { name: 'Shop admin' }).getByRole('link', { name: 'People', exact: true })).toHaveAttribute('aria-current', 'page');
  await expectAccessible(page, 'people');
  // Server errors land on the field they concern.
  const form = page.getByRole('form', { name: 'Invite someone' });
  await form.getByLabel('Name').fill('Duplicate Person');
  await form.getByLabel('E-mail').fill('tech@alder-row.example');
  await form.getByRole('button', { name: 'Send invitation' }).click();
  await expect(page.getByText('Already a member')).toBeVisible();

  await form.getByLabel('Name').fill('Wren Halloway');
  await form.getByLabel('E-mail').fill('wren@alder-row.example');
  await form.getByLabel('Role').selectOption('technician');
  await form.getByRole('button', { name: 'Send invitation' }).click();
  await expect(page.getByText('Invitation sent to wren@alder-row.example')).toBeVisible();
  await expect(page.getByRole('cell', { name: 'wren@alder-row.example' })).toBeVisible();
  await snap(page, 'people');

  await page.getByRole('link', { name: 'Dev inbox' }).click();
  const mail = page.getByRole('button', { name: /You are invited to Alder Row Sheetworks/ });
  await expect(mail).toBeVisible({ timeout: 20_000 });
  await mail.click();
  const link = await page.getByRole('link', { name: /accept-invite\?token=/ }).getAttribute('href');
  expect(link).toBeTruthy();
  await snap(page, 'dev-inbox');

  const context = await browser.newContext();
  const invitee = await context.newPage();
  await invitee.goto(link!);
  await invitee.getByLabel('New password').fill('wren picks a long passphrase');
  await invitee.getByLabel('Repeat the password').fill('wren picks a long passphrase');
  await invitee.getByRole('button', { name: 'Set password and join' }).click();
  await expect(invitee.getByText('Password set')).toBeVisible();
  await invitee.getByRole('link', { name: 'Go to sign-in' }).click();
  await invitee.getByLabel('E-mail').fill('wren@alder-row.example');
  await invitee.getByLabel('Password').fill('wren picks a long passphrase');
  await invitee.getByRole('button', { name: 'Sign in' }).click();
  await expect(invitee.getByRole('heading', { name: /Hello, Wren/ })).toBeVisible();
  await context.close();
});

test('the operator home works on a tablet viewport', async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 800, height: 1280 }, hasTouch: true });
  const page = await context.newPage();
  await signIn(page, 'operator@alder-row.example');
  await expectAccessible(page, 'operator home (tablet)');
  await snap(page, 'home-operator-tablet');
  await context.close();
});

test('admin opens site settings; an unknown time zone is refused on its field', async ({ page }) => {
  await signIn(page, 'admin@alder-row.example');
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Shop admin', exact: true }).click();
  await page.getByRole('navigation', { name: 'Shop admin' }).getByRole('link', { name: 'Site settings' }).click();
  const form = page.getByRole('form', { name: 'Site settings' });
  await expect(form.getByLabel('Time zone')).toHaveValue('America/Chicago');
  await expectAccessible(page, 'site settings');
  await form.getByLabel('Time zone').fill('Mars/Olympus');
  await form.getByRole('button', { name: 'Save settings' }).click();
  await expect(form.getByText('Not a known time zone')).toBeVisible();
  await snap(page, 'site-settings');
});

test('the operator menu stays short', async ({ page }) => {
  await signIn(page, 'operator@alder-row.example');
  const nav = page.getByRole('navigation', { name: 'Main' });
  for (const hidden of ['Plans', 'Stock', 'Oil analysis', 'People', 'Site settings'])
    await expect(nav.getByRole('link', { name: hidden, exact: true })).toHaveCount(0);
  await expect(nav.getByRole('link', { name: 'PPE check' })).toBeVisible();
});
