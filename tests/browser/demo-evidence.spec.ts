import { expect, test } from '@playwright/test';
import { PHONE, signInAs } from './support';

// The demo's filed claims carry their photos and invoice (server/db/seed/demo-evidence.ts): on the installer's
// claim page each is listed with what it shows, and the photos' thumbnails really load.
test.describe('demo claims with their evidence', () => {
  test.use({ viewport: PHONE, isMobile: true, hasTouch: true });

  test('an installer sees the nameplate, failure and site photos of a filed demo claim, thumbnails loaded', async ({
    page,
  }) => {
    await signInAs(page, 'ines@harborview.test');
    const list = await page.request.get('/api/claims?stage=in_review&pageSize=50&sort=-filedAt');
    const claims = (await list.json()).items as { id: string; number: string }[];
    let target: { id: string; number: string } | undefined;
    for (const c of claims) {
      const detail = (await (await page.request.get(`/api/claims/${c.id}`)).json()).claim as {
        attachments: { purpose: string }[];
      };
      const purposes = new Set(detail.attachments.map((a) => a.purpose));
      if (purposes.has('site') && purposes.has('proof_of_purchase')) {
        target = c;
        break;
      }
    }
    if (!target) throw new Error('no demo claim in review with site photos and an invoice');

    await page.goto(`/claims/${target.id}`);
    await expect(page.getByRole('heading', { level: 1, name: `Claim ${target.number}` })).toBeVisible();
    const files = page.getByRole('list', { name: 'Files on this claim' });
    for (const label of ['Nameplate or label', 'The failure', 'The site', 'Proof of purchase']) {
      await expect(files.getByRole('listitem').filter({ hasText: label }).first()).toBeVisible();
    }
    await expect(files.getByRole('link', { name: /^invoice-.*\.pdf$/ })).toBeVisible();
    const thumbs = files.locator('img');
    expect(await thumbs.count()).toBeGreaterThanOrEqual(3);
    await expect
      .poll(() =>
        thumbs.evaluateAll((imgs) =>
          imgs.every((i) => (i as HTMLImageElement).complete && (i as HTMLImageElement).naturalWidth > 0),
        ),
      )
      .toBe(true);
    // 800 x 600 photos, thumbnails at most 320 px wide (server/lib/uploads/inspect.ts).
    expect(await thumbs.first().evaluate((i) => (i as HTMLImageElement).naturalWidth)).toBe(320);
  });
});
