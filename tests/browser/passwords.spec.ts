import { expect, test } from '@playwright/test';
import { DEMO_PASSWORD, seriousA11yViolations, signInAs } from './support';

// Issue 13: a person who forgot their password gets a link by e-mail, chooses a new one and signs in with it;
// then changes it back on their account page. Sunniva is in no other browser test. axe on each new page.
const EMAIL = 'sunniva@aldercrest.test';
const NEW_PASSWORD = 'amber lamps over the loading dock';

test('forgot password: e-mailed link, new password, sign in; then change it on the account page', async ({
  page,
  browser,
}) => {
  await page.goto('/sign-in');
  await page.getByRole('link', { name: 'Forgot password?' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Forgot your password?' })).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);
  await page.getByLabel('E-mail').fill(EMAIL);
  await page.getByRole('button', { name: 'Send the link' }).click();
  await expect(page.getByRole('status')).toContainText('If this address belongs to an active account');

  // The outbox worker sends the e-mail to the fake SMTP server; the organisation's demo mailbox shows it.
  const adminContext = await browser.newContext();
  const admin = await adminContext.newPage();
  await signInAs(admin, 'max@aldercrest.test');
  await admin.getByRole('link', { name: 'Mailbox' }).first().click();
  const message = admin.getByRole('button', { name: /Choose a new Lumenproof password/ }).first();
  await expect(message).toBeVisible({ timeout: 20_000 });
  await message.click();
  const body = await admin.locator('pre').innerText();
  const link = /https?:\/\/\S+\/reset-password\/[A-Za-z0-9_-]+/.exec(body)![0];
  await adminContext.close();

  await page.goto(new URL(link).pathname);
  await expect(page.getByRole('heading', { level: 1, name: 'Choose a new password' })).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);
  // A commonly used password is refused on the field, by the server.
  await page.getByLabel('New password', { exact: true }).fill('qwerty123456');
  await page.getByLabel('New password again').fill('qwerty123456');
  await page.getByRole('button', { name: 'Set the new password' }).click();
  await expect(page.getByText(/on a list of commonly used passwords/)).toBeVisible();
  await page.getByLabel('New password', { exact: true }).fill(NEW_PASSWORD);
  await page.getByLabel('New password again').fill(NEW_PASSWORD);
  await page.getByRole('button', { name: 'Set the new password' }).click();
  await expect(page.getByRole('status')).toContainText(`Sign in with ${EMAIL}`);
  await page.getByRole('link', { name: 'Sign in' }).click();

  await page.getByLabel('E-mail').fill(EMAIL);
  await page.getByLabel('Password').fill(NEW_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page).toHaveURL(/\/$/);

  // The link works once.
  await page.goto(new URL(link).pathname);
  await page.getByLabel('New password', { exact: true }).fill('another sentence for a password');
  await page.getByLabel('New password again').fill('another sentence for a password');
  await page.getByRole('button', { name: 'Set the new password' }).click();
  await expect(page.getByRole('alert')).toContainText('not valid any more');

  // Back to the demo password from the account page (current password required).
  await page.goto('/');
  await page.getByRole('link', { name: 'Your account' }).first().click();
  await expect(page.getByRole('heading', { level: 1, name: 'Your account' })).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);
  await page.getByLabel('Current password').fill('not my password at all');
  await page.getByLabel('New password', { exact: true }).fill(DEMO_PASSWORD);
  await page.getByLabel('New password again').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Change password' }).click();
  await expect(page.getByText('This is not your current password.')).toBeVisible();
  await page.getByLabel('Current password').fill(NEW_PASSWORD);
  await page.getByRole('button', { name: 'Change password' }).click();
  await expect(page.getByRole('status')).toContainText('Your password is changed');
  expect(await seriousA11yViolations(page)).toEqual([]);
});
