import { expect, test } from '@playwright/test';
import { hasNoHorizontalScroll, PHONE, seriousA11yViolations, signInAs } from './support';

// The catalogue end to end on a phone: a manufacturer administrator adds a model, then an installer registers
// an installation of it, sees the fit warning before saving, and saves anyway.
test.describe('catalogue on a phone', () => {
  test.use({ viewport: PHONE, isMobile: true, hasTouch: true });

  test('a manufacturer administrator adds a model and a contractor registers an installation of it', async ({
    page,
  }) => {
    const modelNumber = `AC-E2E-${Date.now().toString(36).toUpperCase()}`;

    await signInAs(page, 'max@aldercrest.test');
    await page.getByRole('link', { name: 'Catalogue' }).last().click();
    await expect(page.getByRole('heading', { level: 1, name: 'Catalogue' })).toBeVisible();
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    expect(await seriousA11yViolations(page)).toEqual([]);
    await page.getByRole('link', { name: 'Add a model' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'Add a product model' })).toBeVisible();

    await page.getByLabel('Model number').fill(modelNumber);
    await page.getByLabel('Name', { exact: true }).fill('Arden compact high-bay 100 W');
    await page.getByLabel('Family').selectOption('high_bay');
    await page.getByLabel('Rated input power').fill('100');
    await page.getByLabel('Input voltage, lowest').fill('120');
    await page.getByLabel('Input voltage, highest').fill('277');
    await page.getByLabel('Rated light output').fill('14000');
    await page.getByLabel('LED strings').fill('16');
    await page.getByLabel('LEDs per string').fill('16');
    await page.getByLabel('Nominal forward voltage per LED').fill('3');
    await page.getByLabel('Driver output current').fill('1.8');
    await page.getByLabel('Location rating').selectOption('damp');
    await page.getByLabel('Dimming').selectOption('0-10v');
    await page.getByLabel('Rated ambient maximum').fill('50');
    await page.getByLabel('Rated life').fill('100000');
    // A bad value is explained before anything is sent.
    await page.getByLabel('Driver open-circuit limit').fill('30');
    await page.getByRole('button', { name: 'Add the model' }).click();
    await expect(page.getByText('The open-circuit limit must be at least the string voltage')).toBeVisible();
    await page.getByLabel('Driver open-circuit limit').fill('60');
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    await page.getByRole('button', { name: 'Add the model' }).click();
    await expect(page.getByRole('heading', { level: 1, name: modelNumber })).toBeVisible();
    await expect(page.getByText('100 W', { exact: true })).toBeVisible();
    await expect(page.getByText('Added to the catalogue')).toBeVisible();
    await page.getByRole('button', { name: 'Sign out' }).first().click();

    await signInAs(page, 'ines@harborview.test');
    await page.getByRole('link', { name: 'Sites' }).last().click();
    await expect(page.getByRole('heading', { level: 1, name: 'Installations' })).toBeVisible();
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    // The list sorts from its column headers as from the select, and says which column sorts which way.
    const installed = page.getByRole('columnheader', { name: 'Installed' });
    await expect(installed).toHaveAttribute('aria-sort', 'descending');
    await page.getByRole('button', { name: 'Units' }).click();
    await expect(page.getByRole('columnheader', { name: 'Units' })).toHaveAttribute(
      'aria-sort',
      'descending',
    );
    await expect(page.getByLabel('Sort by')).toHaveValue('-quantity');
    await expect(installed).not.toHaveAttribute('aria-sort');
    await page.getByRole('link', { name: 'Register an installation' }).click();
    await page.getByLabel('Find a model').fill(modelNumber);
    await page
      .getByLabel('Product model')
      .selectOption({ label: `${modelNumber} · Arden compact high-bay 100 W (Aldercrest Lighting)` });
    await page.getByLabel('Quantity').fill('2');
    await page.getByLabel('Serial numbers or date codes').fill(`${modelNumber}-0001 ${modelNumber}-0002`);
    await page.getByLabel('Lot (optional)').fill('ACE2405');
    await page.getByLabel('Site name').fill('Tidewater fish processing, wash-down hall');
    await page.getByLabel('Street address').fill('14 Cannery Row');
    await page.getByLabel('City').fill('Tidewater');
    await page.getByLabel('State or province').fill('WA');
    await page.getByLabel('Postal code').fill('98520');
    // Not yet installed: the form refuses a date after today.
    await page.getByLabel('Install date').fill('2099-05-06');
    await page.getByRole('button', { name: 'Register the installation' }).click();
    await expect(page.getByText('The install date is in the future.')).toBeVisible();
    await page.getByLabel('Install date').fill('2024-05-06');
    await page.getByLabel('Hours of use a day').fill('20');
    await page.getByLabel('Ambient temperature').fill('8');
    await expect(page.getByText("These conditions fit the product's ratings.")).toBeVisible();
    // A wash-down hall is a wet location; the model is damp-rated: the form says so before saving.
    await page.getByLabel('Location', { exact: true }).selectOption('wet');
    await expect(page.getByText('but this fixture is rated for damp locations only')).toBeVisible();
    await expect(page.getByText('Source: NFPA 70 (NEC) Article 100 and 410.10(A)')).toBeVisible();
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    await page.screenshot({
      path: '.data/playwright-results/phone-register-installation.png',
      fullPage: true,
    });
    expect(await seriousA11yViolations(page)).toEqual([]);
    await page.getByRole('button', { name: 'Register the installation' }).click();

    await expect(
      page.getByRole('heading', { level: 1, name: 'Tidewater fish processing, wash-down hall' }),
    ).toBeVisible();
    await expect(page.getByText('but this fixture is rated for damp locations only')).toBeVisible();
    await expect(page.getByText(`${modelNumber}-0001`)).toBeVisible();
    await expect(page.getByText('ACE2405', { exact: true })).toBeVisible();
    await expect(page.getByText('Installation registered')).toBeVisible();
    expect(await hasNoHorizontalScroll(page)).toBe(true);
    expect(await seriousA11yViolations(page)).toEqual([]);
  });
});
