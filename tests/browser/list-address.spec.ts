import { expect, test } from '@playwright/test';
import { signInAs } from './support';

// Issue 16 item 5: a list keeps its filters, sort and page in the address, so Back from a claim and a reload
// show the same list, not the first page of everything.
test('the review desk: Back from a claim and a reload restore its filters and page', async ({ page }) => {
  await signInAs(page, 'rhea@aldercrest.test');
  await page.goto('/review');
  const claims = page.getByRole('list', { name: 'Claims' });
  await expect(claims.getByRole('link').first()).toBeVisible();

  await page.getByRole('button', { name: 'Filters' }).click();
  await page.getByLabel('Stage').selectOption({ label: 'Every stage' });
  await page.getByLabel('Sort').selectOption({ label: 'Claim number' });
  await page.getByLabel('Search').fill('LP-');
  await expect(page).toHaveURL(/[?&]q=LP-/); // once typing paused
  const pages = page.getByRole('navigation', { name: 'Pages' });
  await expect(pages).toContainText(/^1–25 of \d+/);
  await pages.getByRole('button', { name: 'Next' }).click();
  await expect(pages).toContainText(/26–50 of \d+/);
  await expect(page).toHaveURL(/[?&]page=2/);
  const firstOnPage2 = (await claims.getByRole('link').first().textContent())!;

  const restored = async () => {
    await expect(pages).toContainText(/26–50 of \d+/);
    await expect(claims.getByRole('link').first()).toHaveText(firstOnPage2);
    await expect(page.getByLabel('Search')).toHaveValue('LP-');
    await expect(page.getByRole('button', { name: '1 filter' })).toBeVisible(); // "Every stage"
  };

  await claims.getByRole('link').first().click();
  await expect(page).toHaveURL(/\/review\/[0-9a-f-]{36}$/);
  await page.goBack();
  await restored();
  await page.reload();
  await restored();
  await page.getByRole('button', { name: '1 filter' }).click();
  await expect(page.getByLabel('Stage')).toHaveValue('');
  await expect(page.getByLabel('Sort')).toHaveValue('number');

  // Back from page 2 is page 1 of the same filters.
  await page.goBack();
  await expect(pages).toContainText(/^1–25 of \d+/);
  await expect(page.getByLabel('Search')).toHaveValue('LP-');
});

test('the catalogue: a search and a sort by column survive a reload', async ({ page }) => {
  await signInAs(page, 'max@aldercrest.test');
  await page.goto('/catalogue');
  const table = page.getByRole('table');
  await expect(table).toBeVisible();
  await table.getByRole('button', { name: 'Model' }).click();
  await expect(table.getByRole('columnheader', { name: 'Model' })).toHaveAttribute('aria-sort', 'descending');
  await page.getByLabel('Search').fill('AC-');
  await expect(page).toHaveURL(/[?&]q=AC-/);
  await page.reload();
  await expect(page.getByLabel('Search')).toHaveValue('AC-');
  await expect(table.getByRole('columnheader', { name: 'Model' })).toHaveAttribute('aria-sort', 'descending');
});
