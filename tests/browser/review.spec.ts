import crypto from 'node:crypto';
import fs from 'node:fs';
import { expect, test, type Download, type Page } from '@playwright/test';
import sharp from 'sharp';
import { PHONE, seriousA11yViolations, signInAs } from './support';

// The review desk end to end, on the demo scenario: the reviewer asks the installer for information, the installer
// answers from a phone with a photo, the claim comes back to review, the reviewer approves although the engine
// found the claim likely excluded (refused until a written reason is given), and both sides download the same
// determination letter, byte for byte.

type FiledClaim = { id: string; number: string; stage: string; evaluation: { verdict: string } };

const sha256 = async (d: Download) =>
  crypto
    .createHash('sha256')
    .update(fs.readFileSync(await d.path()))
    .digest('hex');

async function download(page: Page, name: string | RegExp) {
  const [d] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name }).click()]);
  return d;
}

test('a reviewer asks, the installer answers with a photo, the reviewer approves against the engine with a reason, and both download the same letter', async ({
  browser,
}) => {
  const reviewerCtx = await browser.newContext();
  const installerCtx = await browser.newContext({ viewport: PHONE, isMobile: true, hasTouch: true });
  const reviewer = await reviewerCtx.newPage();
  const installer = await installerCtx.newPage();
  await signInAs(installer, 'ines@harborview.test');

  // A claim the engine finds likely excluded, made through the API: the installer files on one of the demo's
  // deliberately misapplied sites (the installation's fit check names the misapplication).
  type Inst = {
    id: string;
    manufacturer: { name: string };
    serialCount: number;
    installDate: string;
    policyVersion: unknown;
  };
  let site: { id: string; serials: string[]; fit: unknown[]; manufacturer: { name: string } } | undefined;
  let seen = 0;
  for (let p = 1; p <= 10 && !site; p++) {
    const list = await installer.request.get(`/api/installations?pageSize=100&page=${p}&sort=-installDate`);
    const candidates = ((await list.json()).items as Inst[]).filter(
      (i) => i.policyVersion && i.serialCount > 0 && i.installDate >= '2021-06-01',
    );
    for (const c of candidates) {
      const detail = (await (await installer.request.get(`/api/installations/${c.id}`)).json()).installation;
      seen++;
      if (detail.fit.length > 0) {
        site = detail;
        break;
      }
    }
  }
  if (!site) throw new Error(`no misapplied installation among ${seen} in the demo scenario`);
  const reviewerEmail =
    site.manufacturer.name === 'Veltra Luminaires' ? 'theo@veltra.test' : 'rhea@aldercrest.test';
  const draft = await installer.request.post('/api/claims', {
    data: {
      installationId: site.id,
      serials: [site.serials[0]],
      units: 1,
      failedOn: new Date(Date.now() - 10 * 86_400_000).toISOString().slice(0, 10),
      symptoms: ['partly_dark'],
      observations: {
        debrisIngress: false,
        waterIngress: false,
        physicalDamage: false,
        fanStopped: false,
        burnMarks: false,
      },
      narrative: 'Two strings dark on the loading-dock fixture since the cold snap.',
    },
  });
  expect(draft.status()).toBe(201);
  const draftId = (await draft.json()).claim.id as string;
  for (const [purpose, colour] of [
    ['nameplate', '#4a7d5c'],
    ['failure', '#7d4a4a'],
    ['site', '#4a4a7d'],
  ]) {
    const buffer = await sharp({ create: { width: 200, height: 150, channels: 3, background: colour } })
      .jpeg()
      .toBuffer();
    const up = await installer.request.post(`/api/claims/${draftId}/attachments`, {
      multipart: { purpose, file: { name: `${purpose}.jpg`, mimeType: 'image/jpeg', buffer } },
    });
    expect(up.status()).toBe(201);
  }
  const filed = await installer.request.post(`/api/claims/${draftId}/file`, { data: {} });
  expect(filed.status()).toBe(200);
  const claim = (await filed.json()).claim as FiledClaim;
  expect(claim.evaluation.verdict).toBe('excluded');
  await signInAs(reviewer, reviewerEmail);

  await reviewer.goto(`/review/${claim.id}`);
  await expect(reviewer.getByRole('heading', { level: 1, name: `Claim ${claim.number}` })).toBeVisible();
  const moves = reviewer.getByRole('group', { name: 'Moves' });
  if (claim.stage === 'filed') {
    await moves.getByRole('button', { name: 'Take into review' }).click();
    await reviewer
      .getByRole('form', { name: 'Take into review' })
      .getByRole('button', { name: 'Take into review' })
      .click();
    await expect(moves.getByRole('button', { name: 'Ask the installer' })).toBeVisible();
  }
  // Taking it into review made it this reviewer's.
  await expect(reviewer.getByRole('group', { name: 'Assignment' })).toContainText('Assigned to you');

  // 1. The reviewer asks.
  await moves.getByRole('button', { name: 'Ask the installer' }).click();
  const ask = reviewer.getByRole('form', { name: 'Ask the installer' });
  await ask
    .getByLabel('What you need from the installer')
    .fill('Please send a photo of the nameplate showing the date code.');
  await ask.getByRole('button', { name: 'Ask the installer' }).click();
  await expect(reviewer.getByText(/Waiting on installer/).first()).toBeVisible();
  await expect(moves.getByRole('button', { name: 'Ask the installer' })).toHaveCount(0);

  // 2. The installer answers on a phone, with text and a photo (a multipart upload).
  await installer.goto(`/claims/${claim.id}/workflow`);
  await expect(
    installer.getByText('Please send a photo of the nameplate showing the date code.').first(),
  ).toBeVisible();
  await installer.getByLabel('Your answer').fill('Nameplate photo attached; the date code reads 2319.');
  const photo = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#6a8caf' } })
    .jpeg()
    .toBuffer();
  await installer
    .getByLabel('Photos or documents')
    .setInputFiles({ name: 'nameplate.jpg', mimeType: 'image/jpeg', buffer: photo });
  await installer.getByRole('button', { name: 'Send answer' }).click();
  await expect(installer.getByText('Nameplate photo attached; the date code reads 2319.')).toBeVisible();
  await expect(
    installer.getByRole('img', { name: 'Photo sent with the answer: nameplate.jpg' }),
  ).toBeVisible();
  await expect(installer.getByRole('button', { name: 'Send answer' })).toHaveCount(0);
  expect(await installer.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(
    true,
  );

  // 3. Back in review: the reviewer sees the answer and its photo.
  await reviewer.reload();
  await expect(reviewer.getByText('Nameplate photo attached; the date code reads 2319.')).toBeVisible();
  const sent = reviewer.getByRole('img', { name: 'Photo sent with the answer: nameplate.jpg' });
  await expect(sent).toBeVisible();
  // The thumbnail really loads (the reviewer may read the installer's file).
  await expect
    .poll(() => sent.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0))
    .toBe(true);
  expect(await seriousA11yViolations(reviewer)).toEqual([]);

  // 4. Approve against the engine: shown as needing a reason, refused without one, accepted with one.
  await moves.getByRole('button', { name: 'Approve' }).click();
  const approve = reviewer.getByRole('form', { name: 'Approve' });
  await expect(approve.getByRole('alert')).toContainText('This decision needs a written reason');
  await expect(approve.getByRole('alert')).toContainText('likely excluded');
  // The engine credits nothing on an excluded claim: the reviewer sets the amount (another departure to explain).
  await approve.getByRole('textbox', { name: /Amount/ }).fill('96.00');
  await expect(approve.getByRole('alert')).toContainText('The amount differs from the engine');
  await approve.getByRole('button', { name: 'Approve' }).click();
  await expect(moves.locator('xpath=following-sibling::*[@role="alert"][1]')).toContainText(/reason/i);
  const stillOpen = await reviewer.request.get(`/api/claims/${claim.id}/workflow`);
  expect((await stillOpen.json()).claim.stage).toBe('in_review');
  expect((await stillOpen.json()).decision).toBe(null);
  await approve
    .getByLabel('Reason for departing from the engine')
    .fill('The nameplate date code shows the unit inside its term; the exclusion rested on a missing photo.');
  await approve.getByRole('button', { name: 'Approve' }).click();
  await expect(
    reviewer.getByText('Why it departs from the screening: The nameplate date code'),
  ).toBeVisible();
  expect(await seriousA11yViolations(reviewer)).toEqual([]);

  // 5. Both parties download the letter: the same bytes.
  const fromReviewer = await download(reviewer, /Download the determination letter/);
  await installer.reload();
  const fromInstaller = await download(installer, /Download the determination letter/);
  expect(fromReviewer.suggestedFilename()).toMatch(/\.pdf$/);
  const [a, b] = [await sha256(fromReviewer), await sha256(fromInstaller)];
  expect(a).toMatch(/^[0-9a-f]{64}$/);
  expect(b).toBe(a);
  expect(
    fs
      .readFileSync(await fromInstaller.path())
      .subarray(0, 5)
      .toString('latin1'),
  ).toBe('%PDF-');

  await reviewerCtx.close();
  await installerCtx.close();
});

test.describe('the review desk on a phone', () => {
  test.use({ viewport: PHONE, isMobile: true, hasTouch: true });

  test('the queue fits 360 px, passes axe, filters by verdict, and opens a claim from the keyboard', async ({
    page,
  }) => {
    await signInAs(page, 'rhea@aldercrest.test');
    await page.goto('/review');
    await expect(page.getByRole('heading', { level: 1, name: 'Review desk' })).toBeVisible();
    const list = page.getByRole('list', { name: 'Claims' });
    await expect(list.getByRole('link').first()).toBeVisible();
    expect(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true);
    expect(await seriousA11yViolations(page)).toEqual([]);

    // On a phone the filters fold behind one button.
    await page.getByRole('button', { name: 'Filters' }).click();
    await page.getByLabel('Engine verdict').selectOption('review');
    await expect(list.getByRole('link').first()).toContainText('Needs a person');
    await expect(list.getByText(/Likely (covered|excluded)/)).toHaveCount(0);
    const second = list.getByRole('link').nth(1);
    const target = await second.getAttribute('href');
    await list.getByRole('link').first().focus();
    await page.keyboard.press('j');
    await expect(second).toBeFocused();
    await page.keyboard.press('Enter');
    await expect(page).toHaveURL(new RegExp(`${target}$`));
    await expect(page.getByRole('heading', { level: 1, name: /^Claim LP-/ })).toBeVisible();
  });
});
