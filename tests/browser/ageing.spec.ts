import { expect, test } from '@playwright/test';
import { seriousA11yViolations, signInAs } from './support';

// Ageing for a manufacturer's administrator (issue 18): the view by stage and reviewer, a target that flags the
// claims past it, the CSV of the view, and axe.
test('an administrator sets a target, sees the claims past it, and downloads the view', async ({ page }) => {
  await signInAs(page, 'max@aldercrest.test');
  await page.getByRole('link', { name: 'Ageing' }).first().click();
  await expect(page.getByRole('heading', { level: 1, name: 'Claim ageing' })).toBeVisible();
  await expect(page.getByRole('table', { name: 'Open claims by stage and days waited' })).toBeVisible();
  await expect(page.getByRole('table', { name: 'Open claims by reviewer and days waited' })).toBeVisible();

  // A one-day target in review flags the demo's older claims there.
  const targets = page.locator('form', { has: page.getByRole('button', { name: 'Save targets' }) });
  await targets.getByLabel('In review').fill('1');
  await page.getByRole('button', { name: 'Save targets' }).click();
  await expect(page.getByText('Targets saved.')).toBeVisible();
  const past = page.getByRole('list', { name: 'Claims past target' }).getByRole('link');
  await expect(past.first()).toBeVisible();
  await expect(past.first()).toContainText('days');
  expect(await seriousA11yViolations(page)).toEqual([]);

  const download = page.waitForEvent('download');
  await page.getByRole('link', { name: 'Download CSV' }).click();
  const file = await download;
  const fs = await import('node:fs/promises');
  const text = await fs.readFile((await file.path())!, 'utf8');
  expect(text.split('\r\n')[0]).toBe(
    'section,name,target_days,days_0-7,days_8-14,days_15-30,days_>30,total,over_target',
  );
  expect(text).toMatch(/^stage,in_review,1,/m);

  // Leave the demo without targets.
  await targets.getByLabel('In review').fill('');
  await page.getByRole('button', { name: 'Save targets' }).click();
  await expect(page.getByText('Targets saved.').first()).toBeVisible();
});
