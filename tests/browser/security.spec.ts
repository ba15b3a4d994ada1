import { expect, test, type Page } from '@playwright/test';
import { generate } from 'otplib';
import { DEMO_PASSWORD, seriousA11yViolations, signInAs } from './support';

// Issue 13: setting up a second factor (QR code, secret, a code, recovery codes), signing in with a code and with
// a recovery code, the sessions page with "sign out everywhere else", and the administrators' security events.
// axe on every new screen. Sunniva (a reviewer, for whom it is optional) enrols and removes it again at the end.

const EMAIL = 'sunniva@aldercrest.test';

/**
 * The code an authenticator app would show, computed with otplib. The enrolment spent the current 30-second step,
 * so sign-in uses the next one, which the server accepts as one step of clock drift (RFC 6238 section 5.2).
 */
const nextCode = (secret: string) => generate({ secret, epoch: Math.floor(Date.now() / 1000) + 30 });
const currentCode = (secret: string) => generate({ secret });

async function passwordStep(page: Page) {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(EMAIL);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByLabel('Authentication code')).toBeVisible();
}

test.setTimeout(120_000);

test('enrol an authenticator app, sign in with a code and a recovery code, end the other sessions', async ({
  page,
  browser,
}) => {
  await signInAs(page, EMAIL);
  await page.getByRole('link', { name: 'Security' }).first().click();
  await expect(page.getByRole('heading', { level: 1, name: 'Security' })).toBeVisible();
  await expect(page.getByText('This device')).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);
  // Earlier specs may have left Sunniva signed in elsewhere: start from this one session.
  const othersOut = page.getByRole('button', { name: 'Sign out everywhere else' });
  if ((await othersOut.count()) > 0 && (await othersOut.isEnabled())) {
    await othersOut.click();
    await expect(page.getByText(/^Signed out \d+ other sessions?\.$/)).toBeVisible();
  }

  await page.getByRole('button', { name: 'Set up an authenticator app' }).click();
  await expect(page.getByRole('img', { name: 'QR code for your authenticator app' })).toBeVisible();
  const secret = (await page.getByTestId('totp-secret').textContent())!.trim();
  expect(secret).toMatch(/^[A-Z2-7]{32}$/);
  expect(await seriousA11yViolations(page)).toEqual([]);
  await page.getByLabel('Code from the app').fill('000000');
  await page.getByRole('button', { name: 'Confirm' }).click();
  await expect(page.getByText('That code is not right')).toBeVisible();
  await page.getByLabel('Code from the app').fill(await currentCode(secret));
  await page.getByRole('button', { name: 'Confirm' }).click();

  const codes = page.getByRole('list', { name: 'Recovery codes' }).getByRole('listitem');
  await expect(codes).toHaveCount(10);
  const recovery = (await codes.allTextContents()).map((c) => c.trim());
  expect(await seriousA11yViolations(page)).toEqual([]);
  await page.getByRole('button', { name: 'I have saved them' }).click();
  await expect(page.getByText('10 of 10 recovery codes left')).toBeVisible();

  // Signing in again: the password, then a code.
  await page.getByRole('button', { name: 'Sign out' }).first().click();
  await expect(page).toHaveURL(/\/sign-in/);
  await passwordStep(page);
  expect(await seriousA11yViolations(page)).toEqual([]);
  await page.getByLabel('Authentication code').fill('123456');
  await page.getByRole('button', { name: 'Verify' }).click();
  await expect(page.getByText('That code is not right')).toBeVisible();
  await page.getByLabel('Authentication code').fill(await nextCode(secret));
  await page.getByRole('button', { name: 'Verify' }).click();
  await expect(page).toHaveURL(/\/$/);

  // A second browser signs in with a recovery code.
  const other = await browser.newContext();
  const phone = await other.newPage();
  await passwordStep(phone);
  await phone.getByLabel('Authentication code').fill(recovery[0]);
  await phone.getByRole('button', { name: 'Verify' }).click();
  await expect(phone).toHaveURL(/\/$/);

  await page.goto('/security');
  const sessions = page.getByRole('list', { name: 'Sessions' }).getByRole('listitem');
  await expect(sessions).toHaveCount(2);
  await expect(page.getByText('9 of 10 recovery codes left')).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);
  await page.getByRole('button', { name: 'Sign out everywhere else' }).click();
  await expect(page.getByText('Signed out 1 other session.')).toBeVisible();
  await expect(sessions).toHaveCount(1);
  await phone.goto('/security');
  await expect(phone).toHaveURL(/\/sign-in/);
  await other.close();

  // Back to the demo as it was: the factor removed with the password.
  await page.getByRole('button', { name: 'Remove second factor' }).click();
  await page.getByLabel('Your password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Remove', exact: true }).click();
  await expect(page.getByText('Your second factor is off.')).toBeVisible();
});

test('an administrator reads the security events of their organisation', async ({ page }) => {
  await signInAs(page, 'max@aldercrest.test');
  await page.getByRole('link', { name: 'Security events' }).first().click();
  await expect(page.getByRole('heading', { level: 1, name: 'Security events' })).toBeVisible();
  await expect(page.getByRole('table', { name: 'Security events' })).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);
  await page.getByLabel('Kind of event').selectOption({ label: 'Second factor added' });
  await expect(page.getByRole('cell', { name: /Sunniva/ }).first()).toBeVisible();
  await page.getByLabel('Person').selectOption({ label: 'Sunniva Pell' });
  await expect(page.getByRole('cell', { name: /Second factor added/ }).first()).toBeVisible();

  await page.goto('/security');
  await expect(page.getByRole('button', { name: 'Require it for everyone' })).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);
});
