import { expect, test, type Page } from '@playwright/test';
import { PHONE, signInAs } from './support';

// Every route of every role at 360 px (issue 18): no screen may scroll sideways. A wide table scrolls inside its
// own box, a chart fits its container; only the page itself is measured. Not isMobile: a phone browser would
// widen its layout viewport to fit an over-wide page and hide the very overflow this looks for.
test.use({ viewport: PHONE, hasTouch: true });

const ACCOUNTS = {
  installer: 'ines@harborview.test',
  contractorAdmin: 'hana@harborview.test',
  reviewer: 'rhea@aldercrest.test',
  accountant: 'ada@aldercrest.test',
  manufacturerAdmin: 'max@aldercrest.test',
} as const;

/** The routes of router.tsx each role reaches, with a detail page found through the API. */
const ROUTES: Record<keyof typeof ACCOUNTS, string[]> = {
  installer: [
    '/',
    '/claims',
    '/claims/new',
    '/claims/batch',
    '/claims/:claim',
    '/claims/:claim/workflow',
    '/catalogue',
    '/catalogue/:product',
    '/policies',
    '/policies/:policy',
    '/installations',
    '/installations/new',
    '/installations/:installation',
    '/waiting',
    '/no-such-page',
  ],
  contractorAdmin: [
    '/',
    '/admin/users',
    '/admin/mailbox',
    '/claims',
    '/credits',
    '/installations',
    '/api-reference',
  ],
  reviewer: [
    '/',
    '/review',
    '/review/:claim',
    '/claims',
    '/claims/:claim',
    '/analytics',
    '/catalogue',
    '/waiting',
  ],
  accountant: ['/', '/credits', '/reserve', '/claims', '/claims/:claim', '/waiting'],
  manufacturerAdmin: [
    '/',
    '/admin/users',
    '/catalogue',
    '/catalogue/new',
    '/catalogue/:product',
    '/policies',
    '/policies/:policy',
    '/analytics',
    '/reserve',
    '/installations',
    '/ageing',
  ],
};

async function firstId(page: Page, path: string) {
  const r = await page.request.get(path);
  const body = await r.json();
  const id = body.items?.[0]?.id as string | undefined;
  if (!id) throw new Error(`no record at ${path}`);
  return id;
}

/**
 * How far the page reaches past the viewport's right edge, and where: the chain from <body> down to the deepest
 * element that sticks out (a node inside a scrolling box never sticks out of the page, so the chain stops there).
 */
async function overflow(page: Page) {
  return page.evaluate(() => {
    const width = window.innerWidth;
    const over = document.documentElement.scrollWidth - width;
    if (over <= 0) return null;
    const name = (el: Element) =>
      `${el.tagName.toLowerCase()}${typeof el.className === 'string' && el.className ? `.${el.className.trim().split(/\s+/).slice(0, 4).join('.')}` : ''}`;
    const sticksOut = (el: Element) => {
      const r = el.getBoundingClientRect();
      return r.width > 0 && r.right > width + 1;
    };
    // The elements that break out: past the right edge while their parent is not, and not inside a box that
    // scrolls or clips them (those do not widen the page).
    const chains: string[] = [];
    for (const el of Array.from(document.body.querySelectorAll('*'))) {
      if (!sticksOut(el) || (el.parentElement && sticksOut(el.parentElement))) continue;
      let a = el.parentElement;
      // An absolutely placed element escapes a scrolling box that is not positioned: never count it clipped.
      let clipped = false;
      const placed = ['absolute', 'fixed'].includes(getComputedStyle(el).position);
      while (a && a !== document.body) {
        if (['auto', 'scroll', 'hidden', 'clip'].includes(getComputedStyle(a).overflowX)) clipped = true;
        a = a.parentElement;
      }
      if (clipped && !placed) continue;
      const p = el.parentElement!;
      chains.push(`${name(p)} > ${name(el)} (${Math.round(el.getBoundingClientRect().right)} px)`);
      if (chains.length >= 4) break;
    }
    return { over, culprits: chains };
  });
}

for (const [role, email] of Object.entries(ACCOUNTS) as [keyof typeof ACCOUNTS, string][]) {
  test(`every route of the ${role} fits 360 px`, async ({ page }) => {
    test.setTimeout(180_000);
    await signInAs(page, email);
    const ids: Record<string, () => Promise<string>> = {
      claim: () =>
        firstId(page, '/api/claims?pageSize=1&stage=filed,in_review,needs_info,return_requested,approved'),
      product: () => firstId(page, '/api/products?pageSize=1'),
      policy: () => firstId(page, '/api/policies?pageSize=1'),
      installation: () => firstId(page, '/api/installations?pageSize=1'),
    };
    const failures: string[] = [];
    for (const route of ROUTES[role]) {
      let path = route;
      for (const m of route.matchAll(/:(\w+)/g)) path = path.replace(m[0], await ids[m[1]]());
      await page.goto(path);
      await expect(page.locator('main').getByRole('heading').first(), route).toBeVisible();
      // Charts and lazy panels settle after the heading.
      await page.waitForLoadState('networkidle');
      const o = await overflow(page);
      if (o) failures.push(`${route}: ${o.over} px too wide: ${o.culprits.join(', ')}`);
    }
    expect(failures).toEqual([]);
  });
}

test('the pages before signing in fit 360 px', async ({ page }) => {
  const failures: string[] = [];
  for (const route of ['/sign-in', '/invitations/not-a-real-token']) {
    await page.goto(route);
    await expect(page.getByRole('heading').first(), route).toBeVisible();
    await page.waitForLoadState('networkidle');
    const o = await overflow(page);
    if (o) failures.push(`${route}: ${o.over} px too wide: ${o.culprits.join(', ')}`);
  }
  expect(failures).toEqual([]);
});

test('the phone header keeps "Sign out" on one line beside the organisation name', async ({ page }) => {
  await signInAs(page, 'hana@harborview.test');
  const signOut = page.getByRole('button', { name: 'Sign out' });
  await expect(signOut).toBeVisible();
  const lines = await signOut.evaluate((el) => {
    const range = document.createRange();
    range.selectNodeContents(el.querySelector('span') ?? el);
    const tops = new Set(Array.from(range.getClientRects()).map((r) => Math.round(r.top)));
    return tops.size;
  });
  expect(lines).toBe(1);
  const box = await signOut.boundingBox();
  expect(box!.height).toBeGreaterThanOrEqual(44); // a 44 px touch target (DEVELOPERS.md, WCAG 2.5.5)
});
