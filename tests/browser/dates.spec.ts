import { expect, test } from '@playwright/test';
import { seriousA11yViolations, signInAs } from './support';

// One way to show dates (issue 18): the organisation's administrator sets its time zone, and a claim's page
// shows calendar dates and times through the one formatter, the exact time on hover.
test.describe('dates and times', () => {
  test.use({ locale: 'en-US' });

  test('an administrator sets the time zone; the screen follows it; axe finds nothing serious', async ({
    page,
  }) => {
    await signInAs(page, 'hana@harborview.test');
    const zone = page.getByLabel('Time zone');
    await expect(zone).toHaveValue('America/Los_Angeles');
    await zone.selectOption('Asia/Tokyo');
    await page.getByRole('button', { name: 'Save' }).click();
    await expect(page.getByText('Time zone and language saved.')).toBeVisible();
    await page.reload();
    await expect(page.getByLabel('Time zone')).toHaveValue('Asia/Tokyo');
    await expect(page.getByRole('heading', { name: 'Dates and times' })).toBeVisible();
    expect(await seriousA11yViolations(page)).toEqual([]);
    // Put the demo back for the other specs.
    await page.getByLabel('Time zone').selectOption('America/Los_Angeles');
    await page.getByRole('button', { name: 'Save' }).click();
    await expect(page.getByLabel('Time zone')).toHaveValue('America/Los_Angeles');
    await expect(page.getByRole('button', { name: 'Save' })).toBeDisabled(); // saved: nothing left to change
    await page.reload();
    await expect(page.getByLabel('Time zone')).toHaveValue('America/Los_Angeles');
  });

  test("a claim's page shows its dates one way, in the organisation's zone, exact on hover", async ({
    page,
  }) => {
    await signInAs(page, 'ines@harborview.test');
    const list = await page.request.get('/api/claims?pageSize=20&stage=filed');
    const claim = ((await list.json()).items as { id: string; failedOn: string | null }[]).find(
      (c) => c.failedOn,
    );
    if (!claim) throw new Error('no filed demo claim with a failure date');
    await page.goto(`/claims/${claim.id}`);
    const row = page
      .locator('dd', { has: page.locator('time') })
      .filter({ hasText: '·' })
      .first();
    // The page loads the claim after the route: wait for both dates before reading them.
    await expect(row.locator('time').nth(1)).toBeVisible();
    const [failed, filed] = await row.locator('time').all();
    // The failure date is a calendar date: the very day stored, in the browser's locale (en-US, CLDR "MMM d, y").
    await expect(failed).toHaveAttribute('datetime', claim.failedOn!);
    const [y, m, d] = claim.failedOn!.split('-').map(Number);
    const MONTHS = 'Jan Feb Mar Apr May Jun Jul Aug Sep Oct Nov Dec'.split(' ');
    await expect(failed).toHaveText(`${MONTHS[m - 1]} ${d}, ${y}`);
    // The filing time: to the minute, no seconds, no ISO; the hover says the zone (Pacific: PST or PDT).
    const text = (await filed.textContent())!.replace(/[\u202f\u00a0]/g, ' ');
    expect(text).toMatch(/^[A-Z][a-z]{2} \d{1,2}, \d{4}, \d{1,2}:\d{2} [AP]M$/);
    expect(await filed.getAttribute('title')).toMatch(/:\d{2}:\d{2}\s[AP]M P[SD]T$/);
    await expect(page.locator('main')).not.toContainText(/\d{4}-\d{2}-\d{2}T|\d{1,2}\/\d{1,2}\/\d{4}/);
  });
});
