import { expect, test } from '@playwright/test';
import sharp from 'sharp';
import { hasNoHorizontalScroll, PHONE, signInAs } from './support';

// Filing from the field on a phone: an installer starts a claim from a site, types readings, watches the live
// evaluation change as the supply reading goes out of range, adds two photos from the camera input, and files.
test.describe('filing a claim on a phone', () => {
  test.use({ viewport: PHONE, isMobile: true, hasTouch: true });

  test('an installer files a claim with two photos and finds it filed', async ({ page }) => {
    await signInAs(page, 'ines@harborview.test');
    // The home with its open claims fits the phone: a page wider than 360 px would widen the layout viewport.
    await expect(page.getByRole('list', { name: 'Open claims' })).toBeVisible();
    expect(await page.evaluate(() => window.innerWidth)).toBe(PHONE.width);
    type Inst = {
      id: string;
      siteName: string;
      serialCount: number;
      nominalSupplyVolts: number;
      installDate: string;
      policyVersion: unknown;
      location: string;
      enclosure: string;
    };
    // The demo holds years of history; look through the pages for a site with serials under a policy.
    let inst: Inst | undefined;
    for (let p = 1; p <= 10 && !inst; p++) {
      const list = await page.request.get(`/api/installations?pageSize=100&page=${p}&sort=-installDate`);
      inst = ((await list.json()).items as Inst[]).find(
        (i) =>
          i.policyVersion &&
          i.serialCount > 0 &&
          [120, 277].includes(i.nominalSupplyVolts) &&
          i.installDate >= '2022-06-01',
      );
    }
    if (!inst) throw new Error('no suitable demo installation');
    expect(inst).toBeTruthy();

    await page.goto(`/installations/${inst.id}`);
    await page.getByRole('button', { name: 'File a claim' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'New claim' })).toBeVisible();
    await expect(page.getByRole('note', { name: 'Safety before measuring' })).toContainText('NFPA 70E');

    await page
      .getByRole('group', { name: 'Serial numbers of the failed units' })
      .getByRole('checkbox')
      .first()
      .check();
    await page.getByLabel('Units failed').fill('1');
    await page
      .getByLabel('Failure date')
      .fill(new Date(Date.now() - 5 * 86_400_000).toISOString().slice(0, 10));
    await page.getByLabel('Cycles on and off').check();

    const panel = page.getByRole('complementary', { name: 'Live evaluation' });
    const nominal = inst.nominalSupplyVolts;
    // ANSI C84.1 Table 1: Range A is nominal ±5 %; Range B for 120 V is 110-127 V and for 277 V 254-293 V.
    await page.getByLabel('Supply voltage').fill(String(nominal).replace(/$/, ',0'));
    await expect(panel).toContainText('inside ANSI C84.1 Range A');
    await page.getByLabel('Supply voltage').fill(String(Math.round(nominal * 1.2)));
    await expect(panel).toContainText('outside ANSI C84.1 Range B');
    await page.getByLabel('Supply voltage').fill(String(nominal));
    await expect(panel).toContainText('inside ANSI C84.1 Range A');
    // The meter reads milliamps: choose mA beside the field, then type what it shows.
    await page
      .getByRole('group', { name: 'Unit for driver output current' })
      .getByRole('button', { name: 'mA' })
      .click();
    await page.getByRole('textbox', { name: 'Driver output current' }).fill('350');

    await page
      .getByLabel('What happened')
      .fill('Driver cycles every few seconds once warm; checked the splice and breaker.');

    const photo = (colour: string) =>
      sharp({ create: { width: 320, height: 240, channels: 3, background: colour } })
        .jpeg()
        .toBuffer();
    await page.getByLabel('What the next file shows').selectOption('nameplate');
    await page
      .getByLabel('Take a photo')
      .setInputFiles({ name: 'nameplate.jpg', mimeType: 'image/jpeg', buffer: await photo('#4a7d5c') });
    const files = page.getByRole('list', { name: 'Files on this claim' });
    await expect(files.getByRole('listitem')).toHaveCount(1);
    await page.getByLabel('What the next file shows').selectOption('failure');
    await page
      .getByLabel('Take a photo')
      .setInputFiles({ name: 'failure.jpg', mimeType: 'image/jpeg', buffer: await photo('#7d4a4a') });
    await expect(files.getByRole('link')).toHaveCount(2);
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    expect(await page.evaluate(() => window.innerWidth)).toBe(PHONE.width);

    await expect(page.getByRole('status').filter({ hasText: 'Saved' })).toBeVisible();
    await page.getByRole('button', { name: 'File claim' }).click();
    await expect(page.getByRole('heading', { level: 1, name: /^Claim LP-\d{4}-/ })).toBeVisible();
    await expect(page.getByText('Filed, awaiting review').first()).toBeVisible();
    const number = (await page.getByRole('heading', { level: 1 }).textContent())!.replace('Claim ', '');

    await page.getByRole('link', { name: 'Claims' }).last().click();
    await page.getByLabel('Claim number or serial').fill(number.toLowerCase());
    await page.getByRole('button', { name: 'Search' }).click();
    await expect(page.getByRole('list', { name: 'Claims' }).getByRole('listitem')).toHaveCount(1);
    await expect(page.getByRole('list', { name: 'Claims' })).toContainText(number);
    expect(await page.evaluate(() => window.innerWidth)).toBe(PHONE.width);
  });
});
