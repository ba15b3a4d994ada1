import { expect, test } from '@playwright/test';
import { seriousA11yViolations, signInAs } from './support';

// The two reliability screens on the demo data: the headline numbers are the API's numbers, the Numbers toggle
// opens the table behind a chart, and axe finds nothing serious.
const months = (v: number) =>
  v >= 24
    ? `${(v / 12).toLocaleString('en-US', { maximumFractionDigits: 1 })} years`
    : `${v.toLocaleString('en-US', { maximumFractionDigits: 1 })} months`;

test('a reviewer reads the failure analysis of a demo model', async ({ page }) => {
  await signInAs(page, 'rhea@aldercrest.test');
  await page.getByRole('link', { name: 'Failure analysis' }).first().click();
  await expect(page.getByRole('heading', { level: 1, name: 'Failure analysis' })).toBeVisible();
  await page.getByLabel('Product model').selectOption({ label: 'AC-HB150-D — Arden round high-bay 150 W' });
  const model = await page.getByLabel('Product model').inputValue();
  const api = await (
    await page.request.get(`/api/analytics/life?productModelId=${model}&ageUnit=months&method=mle`)
  ).json();
  await expect(page.getByTestId('fit-B10 life')).toHaveText(months(api.fit.b10));
  await expect(page.getByTestId('fit-Units')).toHaveText(api.lifeData.units.toLocaleString('en-US'));
  await expect(page.getByText(`10 % of units fail by ${months(api.fit.b10)}.`)).toBeVisible();

  // The numbers behind the probability plot, one click away.
  const plot = page
    .getByRole('heading', { name: 'Probability plot' })
    .locator('xpath=ancestor::div[contains(@class,"rounded-card")]');
  await plot.getByRole('button', { name: 'Numbers' }).click();
  await expect(plot.getByRole('table', { name: 'Probability plot points' })).toBeVisible();
  await expect(plot.getByRole('table', { name: 'Probability plot points' }).locator('tbody tr')).toHaveCount(
    api.probabilityPlot.points.length,
  );
  await expect(plot.getByRole('link', { name: /Download CSV/ })).toHaveAttribute('href', /format=csv/);

  // The weak lot leads the lots.
  await expect(page.getByText(/Lot ACH2502 has the most claims/)).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);

  // Operating hours instead of months.
  await page.getByLabel('Ages in').selectOption('hours');
  await expect(page.getByTestId('fit-B10 life')).toHaveText(/ h$/);
});

test('an accountant reads the warranty reserve', async ({ page }) => {
  await signInAs(page, 'vera@veltra.test');
  await page.getByRole('link', { name: 'Reserve' }).first().click();
  await expect(page.getByRole('heading', { level: 1, name: 'Warranty reserve' })).toBeVisible();
  const api = await (await page.request.get('/api/reserve?months=12')).json();
  const usd = api.totals.find((t: { currency: string }) => t.currency === 'USD');
  await expect(page.getByTestId('reserve-total-USD')).toHaveText(
    Number(usd.amount).toLocaleString('en-US', {
      style: 'currency',
      currency: 'USD',
      maximumFractionDigits: 0,
    }),
  );
  // The page says how age is counted and how amounts are rounded (issue 14).
  const rules = page.getByRole('region', { name: 'How the reserve is counted' });
  await expect(rules).toContainText('middle of the month');
  await expect(rules).toContainText('rounded once');
  const chart = page
    .getByRole('heading', { name: 'Expected credits by month' })
    .locator('xpath=ancestor::div[contains(@class,"rounded-card")]');
  await chart.getByRole('button', { name: 'Numbers' }).click();
  await expect(chart.getByRole('table', { name: 'Reserve by month' }).locator('tbody tr')).toHaveCount(12);
  expect(await seriousA11yViolations(page)).toEqual([]);
  // A reviewer's nav has no reserve, an accountant's no failure analysis.
  await expect(page.getByRole('link', { name: 'Failure analysis' })).toHaveCount(0);
});
