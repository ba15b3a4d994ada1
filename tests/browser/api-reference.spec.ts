import { expect, test } from '@playwright/test';
import { signInAs } from './support';

// The API reference: reached from Integrations, rendered by the bundled renderer from /api/openapi.json under the
// app's own CSP (nothing from another origin, no inline script or style refused on the way).
test('an administrator opens the API reference and reads an operation', async ({ page }) => {
  const refused: string[] = [];
  const foreign: string[] = [];
  page.on('console', (m) => {
    if (/Content Security Policy|Refused to/i.test(m.text())) refused.push(m.text());
  });
  page.on('request', (r) => {
    if (
      !r.url().startsWith('http://127.0.0.1') &&
      !r.url().startsWith('data:') &&
      !r.url().startsWith('blob:')
    )
      foreign.push(r.url());
  });

  await signInAs(page, 'hana@harborview.test');
  await page.getByRole('link', { name: 'Integrations' }).first().click();
  await page.getByRole('link', { name: 'API reference' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'API reference' })).toBeVisible();

  // An operation from the document, with its path.
  await expect(page.getByText('The claims you may see').first()).toBeVisible({ timeout: 30_000 });
  await expect(page.getByText('/api/claims', { exact: true }).first()).toBeVisible();

  // Nothing of the renderer's hosted services is offered.
  await expect(page.getByRole('button', { name: 'Ask AI' })).toHaveCount(0);
  await page.screenshot({ path: '.data/playwright-results/api-reference.png' });
  expect(foreign).toEqual([]);
  // No script is ever refused. The renderer (and its toast helper) also inject <style> elements, which the CSP
  // refuses by design; the same theme ships as a bundled stylesheet (api-reference.tsx), so nothing is lost.
  expect(refused.filter((m) => !m.startsWith('Applying inline style'))).toEqual([]);
});
