import { expect, test } from '@playwright/test';
import { seriousA11yViolations, signInAs } from './support';

// axe (WCAG 2.1 A and AA rules) on every main screen: no serious or critical violations.
test.describe('accessibility', () => {
  test('sign-in', async ({ page }) => {
    await page.goto('/sign-in');
    await expect(page.getByRole('heading', { name: 'Sign in' })).toBeVisible();
    expect(await seriousA11yViolations(page)).toEqual([]);
  });

  for (const [email, path, heading] of [
    ['ines@harborview.test', '/', 'Field claims'],
    ['rhea@aldercrest.test', '/', 'Review desk'],
    ['ada@aldercrest.test', '/', 'Credits and warranty cost'],
    ['hana@harborview.test', '/', 'Organisation settings'],
    ['hana@harborview.test', '/admin/users', 'People'],
    ['hana@harborview.test', '/admin/mailbox', 'Demo mailbox'],
  ] as const) {
    test(`${path} as ${email}`, async ({ page }) => {
      await signInAs(page, email);
      await page.goto(path);
      await expect(page.getByRole('heading', { level: 1, name: heading })).toBeVisible();
      expect(await seriousA11yViolations(page)).toEqual([]);
    });
  }
});
