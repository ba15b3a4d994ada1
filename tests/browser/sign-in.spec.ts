import { expect, test } from '@playwright/test';
import { hasNoHorizontalScroll, PHONE, signInAs } from './support';

const HOMES = [
  { email: 'ines@harborview.test', heading: 'Field claims' },
  { email: 'hana@harborview.test', heading: 'Organisation settings' },
  { email: 'omar@copperline.test', heading: 'Field claims' },
  { email: 'rhea@aldercrest.test', heading: 'Review desk' },
  { email: 'ada@aldercrest.test', heading: 'Credits and warranty cost' },
  { email: 'max@aldercrest.test', heading: 'Organisation settings' },
  { email: 'theo@veltra.test', heading: 'Review desk' },
  { email: 'vera@veltra.test', heading: 'Credits and warranty cost' },
];

test.describe('signing in', () => {
  for (const { email, heading } of HOMES) {
    test(`${email} lands on their own home`, async ({ page }) => {
      await signInAs(page, email);
      await expect(page.getByRole('heading', { level: 1, name: heading })).toBeVisible();
      await page.getByRole('button', { name: 'Sign out' }).first().click();
      await expect(page).toHaveURL(/\/sign-in/);
    });
  }

  test('a wrong password is refused with a plain message', async ({ page }) => {
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill('ines@harborview.test');
    await page.getByLabel('Password').fill('not the password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect(page.getByRole('alert')).toContainText('do not match');
  });

  test('a signed-out visitor is sent to sign in and comes back where they were going', async ({ page }) => {
    await page.goto('/admin/users');
    await expect(page).toHaveURL(/\/sign-in\?next=%2Fadmin%2Fusers/);
    await page.getByLabel('E-mail').fill('hana@harborview.test');
    await page.getByLabel('Password').fill('lumenproof-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'People' })).toBeVisible();
  });

  test('an unknown address shows the not-found page', async ({ page }) => {
    await signInAs(page, 'ines@harborview.test');
    await page.goto('/no/such/page');
    await expect(page.getByRole('heading', { name: 'Page not found' })).toBeVisible();
  });
});

test.describe('on a phone', () => {
  test.use({ viewport: PHONE, isMobile: true, hasTouch: true });

  test('sign-in and home have no horizontal scroll at 360 px', async ({ page }) => {
    await page.goto('/sign-in');
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    await page.screenshot({ path: '.data/playwright-results/phone-sign-in.png', fullPage: true });
    await signInAs(page, 'hana@harborview.test');
    await expect(page.getByRole('heading', { level: 1, name: 'Organisation settings' })).toBeVisible();
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    // Past four places the phone bar keeps the rest behind "More".
    await page.getByRole('button', { name: 'More' }).click();
    await page.getByRole('link', { name: 'People' }).last().click();
    await expect(page.getByRole('heading', { level: 1, name: 'People' })).toBeVisible();
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    await page.screenshot({ path: '.data/playwright-results/phone-people.png', fullPage: true });
  });
});

test('an administrator invites a person, who joins through the e-mailed link', async ({ page, browser }) => {
  await signInAs(page, 'max@aldercrest.test');
  await page.getByRole('link', { name: 'People' }).first().click();
  await page.getByRole('button', { name: 'Invite a person' }).click();
  const dialog = page.getByRole('dialog', { name: 'Invite a person' });
  await dialog.getByLabel('Name').fill('Noor Halvorsen');
  await dialog.getByLabel('E-mail').fill('noor@aldercrest.test');
  await dialog.getByLabel('Reviewer').check();
  await page.getByRole('button', { name: 'Send invitation' }).click();
  await expect(page.getByText('Invitation sent to noor@aldercrest.test.')).toBeVisible();
  await expect(page.getByRole('cell', { name: /^Noor Halvorsen/ })).toBeVisible();

  // The outbox worker sends the e-mail to the fake SMTP server; the demo mailbox shows it.
  await page.getByRole('link', { name: 'Mailbox' }).first().click();
  const message = page.getByRole('button', { name: /invited you to Aldercrest Lighting/ });
  await expect(message).toBeVisible({ timeout: 20_000 });
  await message.click();
  const body = await page.locator('pre').innerText();
  const link = /https?:\/\/\S+\/invitations\/\S+/.exec(body)![0];

  const other = await browser.newContext();
  const invitee = await other.newPage();
  await invitee.goto(new URL(link).pathname);
  await invitee.getByLabel('New password').fill('a sentence for a password');
  await invitee.getByRole('button', { name: 'Set password' }).click();
  await invitee.getByRole('link', { name: 'Sign in' }).click();
  await invitee.getByLabel('E-mail').fill('noor@aldercrest.test');
  await invitee.getByLabel('Password').fill('a sentence for a password');
  await invitee.getByRole('button', { name: 'Sign in' }).click();
  await expect(invitee.getByRole('heading', { level: 1, name: 'Review desk' })).toBeVisible();
  await other.close();
});
