import fs from 'node:fs';
import { expect, test } from '@playwright/test';
import { hasNoHorizontalScroll, PHONE, seriousA11yViolations, signInAs } from './support';

test.describe('credits', () => {
  test('an accountant issues three credits in one go and downloads a memo', async ({ page }) => {
    await signInAs(page, 'ada@aldercrest.test');
    await expect(page.getByRole('heading', { level: 1, name: 'Credits and warranty cost' })).toBeVisible();
    const boxes = page.getByRole('checkbox', { name: /^Select claim / });
    await expect(boxes.first()).toBeVisible();
    expect(await boxes.count()).toBeGreaterThanOrEqual(5);
    for (let i = 0; i < 3; i++) await boxes.nth(i).check();
    await page.getByRole('button', { name: 'Issue 3 credits' }).click();

    const progress = page.getByRole('progressbar', { name: 'Credits issued' });
    await expect(progress).toHaveAttribute('aria-valuenow', '3');
    await expect(progress).toHaveAttribute('aria-valuemax', '3');
    const results = page.getByRole('list', { name: 'Results' }).getByRole('listitem');
    await expect(results).toHaveCount(3);
    await expect(results.filter({ hasText: /Memo CM-ALD-\d{4}-\d{6} issued/ })).toHaveCount(3);
    await expect(page.getByText('Finished 3 of 3')).toBeVisible();

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      results.first().getByRole('link', { name: 'Download PDF' }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^CM-ALD-\d{4}-\d{6}\.pdf$/);
    const file = await download.path();
    expect(fs.readFileSync(file).subarray(0, 5).toString()).toBe('%PDF-');

    await page.getByRole('link', { name: 'All credit memos' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'Credit memos' })).toBeVisible();
    await expect(page.getByRole('table', { name: 'Credit memos and reversals' })).toBeVisible();
    await expect(page.getByText(/Voided by CM-ALD-/)).toBeVisible();
    expect(await seriousA11yViolations(page)).toEqual([]);
  });

  test('a contractor sees its credits and balance per manufacturer, on a phone', async ({ page }) => {
    await page.setViewportSize(PHONE);
    await signInAs(page, 'hana@harborview.test');
    await page.goto('/credits');
    await expect(page.getByRole('heading', { level: 1, name: 'Credits' })).toBeVisible();
    await expect(page.getByRole('heading', { name: 'Your balance with each manufacturer' })).toBeVisible();
    await expect(page.getByText('Aldercrest Lighting').first()).toBeVisible();
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    await expect(page.getByRole('button', { name: /^Void / })).toHaveCount(0);
  });
});

test.describe('journal for the books', () => {
  test('an accountant sees the journal balance, changes the accounts and downloads CSV and SIE', async ({
    page,
  }) => {
    await signInAs(page, 'ada@aldercrest.test');
    await page.goto('/credits');
    await expect(page.getByRole('heading', { level: 1, name: 'Credit memos' })).toBeVisible();
    const exportCard = page.getByRole('region', { name: 'Export for accounting' });
    await exportCard.getByLabel('From').fill('2025-01-01');
    const summary = page.getByText(/entries in USD: debits [\d,]+\.\d\d, credits [\d,]+\.\d\d/);
    await expect(summary).toBeVisible();
    const [, debits, credits] = (await summary.textContent())!.match(/debits ([\d,.]+), credits ([\d,.]+)/)!;
    expect(debits).toBe(credits);

    const form = page.getByRole('form', { name: 'Accounts for the journal' });
    await expect(form.getByLabel('Debit account code')).toHaveValue('5410');
    await form.getByLabel('Credit account code').fill('5410');
    await form.getByRole('button', { name: 'Save accounts' }).click();
    await expect(form.getByText('Debit and credit must be two different accounts.')).toBeVisible();
    await form.getByLabel('Credit account code').fill('2441');
    await form.getByRole('button', { name: 'Save accounts' }).click();
    await expect(page.getByText('Accounts saved. Journals now book memos to them.')).toBeVisible();

    const [csv] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'Journal CSV' }).click(),
    ]);
    expect(csv.suggestedFilename()).toMatch(/^lumenproof-journal-2025-01-01-to-\d{4}-\d\d-\d\d\.csv$/);
    const text = fs.readFileSync(await csv.path(), 'utf8');
    expect(text.split('\r\n')[0]).toBe(
      'journal,entry,date,account,account_name,debit,credit,currency,memo_number,kind,claim_number,contractor,contractor_id,description',
    );
    expect(text).toContain(',2441,');

    const [sie] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'SIE 4 file' }).click(),
    ]);
    expect(sie.suggestedFilename()).toMatch(/\.se$/);
    expect(fs.readFileSync(await sie.path(), 'latin1').startsWith('#FLAGGA 0\r\n')).toBe(true);
    expect(await seriousA11yViolations(page)).toEqual([]);
  });
});
