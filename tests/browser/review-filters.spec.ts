import { expect, test } from '@playwright/test';
import { PHONE, seriousA11yViolations, signInAs } from './support';

// The review desk on a phone (issue 18): one row of search, a filter count and saved views, then the list; a
// reviewer saves "My open, oldest first" and gets it back after signing in again.
test.use({ viewport: PHONE, hasTouch: true });

test('on a phone the first claim shows above the fold; filters fold with a count; a saved view comes back', async ({
  page,
}) => {
  await signInAs(page, 'rhea@aldercrest.test');
  await page.goto('/review');
  const first = page.getByRole('list', { name: 'Claims' }).getByRole('link').first();
  await expect(first).toBeVisible();
  const box = (await first.boundingBox())!;
  expect(box.y + box.height).toBeLessThanOrEqual(PHONE.height); // the whole first row, without scrolling
  expect(await seriousA11yViolations(page)).toEqual([]);

  const toggle = page.getByRole('button', { name: 'Filters' });
  await expect(toggle).toHaveAttribute('aria-expanded', 'false');
  await toggle.click();
  await page.getByLabel('Assigned').selectOption('me');
  await page.getByLabel('Engine verdict').selectOption('review');
  await expect(page.getByRole('button', { name: '2 filters' })).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);

  const name = `My open, oldest first ${Date.now() % 100000}`;
  await page.getByLabel('Save these filters as a view').fill(name);
  await page.getByRole('button', { name: 'Save view' }).click();
  await expect(page.getByText(`View "${name}" saved.`)).toBeVisible();

  // Another visit starts from every open claim; the saved view is one pick away and brings its filters back.
  await page.reload();
  await expect(page.getByRole('button', { name: 'Filters' })).toBeVisible();
  await page.getByLabel('Saved view').selectOption({ label: name });
  await expect(page.getByRole('button', { name: '2 filters' })).toBeVisible();
  await page.getByRole('button', { name: '2 filters' }).click();
  await expect(page.getByLabel('Assigned')).toHaveValue('me');
  await expect(page.getByLabel('Engine verdict')).toHaveValue('review');

  // Leave the demo as it was.
  await page.getByRole('button', { name: `Delete “${name}”` }).click();
  await expect(page.getByText('View deleted.')).toBeVisible();
});
