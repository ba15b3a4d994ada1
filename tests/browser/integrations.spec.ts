import { expect, test } from '@playwright/test';
import { hasNoHorizontalScroll, PHONE, seriousA11yViolations, signInAs } from './support';

// An administrator connects the organisation's own systems: an API token, shown once, and a webhook endpoint
// with its delivery log. axe on the page and on each dialog.
test('an administrator makes an API token and registers a webhook endpoint', async ({ page }) => {
  await signInAs(page, 'hana@harborview.test');
  await page.getByRole('link', { name: 'Integrations' }).first().click();
  await expect(page.getByRole('heading', { level: 1, name: 'Integrations' })).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);

  await page.getByRole('button', { name: 'New token' }).click();
  const tokenDialog = page.getByRole('dialog', { name: 'New API token' });
  await tokenDialog.getByLabel('Name').fill('Field service sync');
  await expect(tokenDialog.getByRole('checkbox', { name: 'Installer' })).toBeChecked();
  await tokenDialog.getByLabel('Expires after').selectOption('30');
  expect(await seriousA11yViolations(page)).toEqual([]);
  await tokenDialog.getByRole('button', { name: 'Make token' }).click();
  const shown = page.getByRole('dialog', { name: 'Your new API token' });
  await expect(shown.getByLabel('API token')).toHaveValue(/^lpt_[0-9a-f]{32}_/);
  expect(await seriousA11yViolations(page)).toEqual([]);
  await shown.getByRole('button', { name: 'Done' }).click();
  const row = page.getByRole('row', { name: /Field service sync/ });
  await expect(row).toContainText('Installer');
  await expect(row).toContainText('Active');

  await page.getByRole('button', { name: 'Register endpoint' }).click();
  const hookDialog = page.getByRole('dialog', { name: 'Register an endpoint' });
  await hookDialog.getByLabel('Endpoint address').fill('http://127.0.0.1:9/lumenproof');
  await hookDialog.getByRole('checkbox', { name: 'Claim decided' }).check();
  expect(await seriousA11yViolations(page)).toEqual([]);
  await hookDialog.getByRole('button', { name: 'Register' }).click();
  const secret = page.getByRole('dialog', { name: 'Endpoint registered' });
  await expect(secret.getByLabel('Signing secret')).toHaveValue(/^lpwhsec_/);
  await secret.getByRole('button', { name: 'Done' }).click();
  await expect(page.getByText('http://127.0.0.1:9/lumenproof')).toBeVisible();

  await page.getByRole('button', { name: 'Send test event' }).click();
  await page.getByRole('button', { name: 'Deliveries' }).click();
  const log = page.getByRole('table', { name: /Deliveries to/ });
  await expect(log.getByRole('row', { name: /Test event/ })).toBeVisible();
  await log
    .getByRole('button', { name: /^Send again: Test event/ })
    .first()
    .click();
  await expect(log.getByRole('row', { name: /Test event/ })).toHaveCount(2);
  expect(await seriousA11yViolations(page)).toEqual([]);

  await page.setViewportSize(PHONE);
  expect(await hasNoHorizontalScroll(page)).toBe(true);

  // Revoked: still listed, no longer usable.
  await page.getByRole('button', { name: 'Revoke Field service sync' }).click();
  await expect(row).toContainText('Revoked');
});
