import { expect, test } from '@playwright/test';
import { PHONE, seriousA11yViolations, signInAs } from './support';

// "What waits on me" (issue 18): the bell counts what needs the person; its page lists each with the place to
// act; reading is kept per person.
test.use({ viewport: PHONE, hasTouch: true });

test('an accountant follows the bell to what waits on her, opens one, and marks the rest read', async ({
  page,
}) => {
  await signInAs(page, 'ada@aldercrest.test');
  const bell = page.getByRole('link', { name: /^Waiting on you: \d+ unread$/ });
  await expect(bell).toBeVisible();
  const before = Number((await bell.getAttribute('aria-label'))!.match(/(\d+)/)![1]);
  expect(before).toBeGreaterThan(0);
  await bell.click();
  await expect(page.getByRole('heading', { level: 1, name: 'Waiting on you' })).toBeVisible();
  const items = page.getByRole('list', { name: 'Waiting on you' }).getByRole('link');
  await expect(items.first()).toContainText('An approved claim waits for its credit memo');
  expect(await seriousA11yViolations(page)).toEqual([]);

  // Opening one goes to where the memo is issued and counts it read.
  await items.first().click();
  await expect(page).toHaveURL(/\/credits$/);
  await expect(page.getByRole('link', { name: `Waiting on you: ${before - 1} unread` })).toBeVisible();

  await page.goto('/waiting');
  await page.getByRole('button', { name: 'Mark all read' }).click();
  await expect(page.getByRole('link', { name: 'Waiting on you: nothing unread' })).toBeVisible();
  await expect(page.getByText('Unread', { exact: true })).toHaveCount(0);

  // Her choice of e-mail, kept on the server.
  const mail = page.getByLabel('E-mail me about these');
  await expect(mail).toHaveValue('daily');
  await mail.selectOption('immediate');
  await expect(page.getByText('E-mail: at once, for each new item.')).toBeVisible();
  await page.reload();
  await expect(page.getByLabel('E-mail me about these')).toHaveValue('immediate');
  expect(await seriousA11yViolations(page)).toEqual([]);
  await page.getByLabel('E-mail me about these').selectOption('daily');
  await expect(page.getByText('E-mail: a daily summary.')).toBeVisible();
});
