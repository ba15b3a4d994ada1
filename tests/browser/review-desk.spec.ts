import { expect, test } from '@playwright/test';
import { seriousA11yViolations, signInAs } from './support';

// The review desk's pickers on the demo scenario: the queue filtered by one of the manufacturer's product models
// and by a contractor that files with it, then a claim handed to a colleague from the review screen.

test('a reviewer narrows the queue by product and by contractor, then hands a claim to a colleague', async ({
  page,
}) => {
  await signInAs(page, 'rhea@aldercrest.test');
  await page.goto('/review');
  const rows = page.getByRole('list', { name: 'Claims' }).getByRole('link');
  await expect(rows.first()).toBeVisible();

  // The filters fold behind one button; open them.
  await page.getByRole('button', { name: 'Filters' }).click();
  // The product of the first claim on the desk: its model number leads its option's label.
  const firstText = (await rows.first().textContent()) ?? '';
  const product = page.getByLabel('Product');
  const options = product.locator('option');
  await expect(options.nth(1)).toBeAttached();
  const labels = await options.allTextContents();
  const label = labels.find((l) => l !== 'Any product' && firstText.includes(` · ${l.split(' · ')[0]} · `));
  expect(label, `a product option for "${firstText}"`).toBeTruthy();
  const model = label!.split(' · ')[0];
  await product.selectOption({ label: label! });
  await expect(rows.first()).toBeVisible();
  await expect
    .poll(async () => (await rows.allTextContents()).every((t) => t.includes(` · ${model} · `)))
    .toBe(true);

  const contractor = page.getByLabel('Contractor');
  await expect(contractor.locator('option', { hasText: 'Harborview Electric' })).toBeAttached();
  await product.selectOption({ label: 'Any product' });
  await contractor.selectOption({ label: 'Harborview Electric' });
  await expect(rows.first()).toBeVisible();
  await expect
    .poll(async () =>
      (await rows.allTextContents()).every(
        (t) => t.startsWith('LP-') && t.includes('Harborview Electric · '),
      ),
    )
    .toBe(true);
  expect(await seriousA11yViolations(page)).toEqual([]);

  await rows.first().click();
  const assignment = page.getByRole('group', { name: 'Assignment' });
  await assignment.getByRole('button', { name: 'Hand to a colleague' }).click();
  const colleague = assignment.getByRole('combobox', { name: 'Colleague' });
  await expect(colleague).toBeVisible();
  // Sunniva is Rhea's colleague on the desk: choosing nobody is refused with a message; choosing her hands it over.
  await expect(assignment.getByText('Active reviewers of your team.', { exact: false })).toBeVisible();
  await assignment.getByRole('button', { name: 'Hand over' }).click();
  await expect(assignment.getByText('Choose a colleague to hand the claim to.')).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);
  await colleague.selectOption({ label: 'Sunniva Pell' });
  await assignment.getByRole('button', { name: 'Hand over' }).click();
  await expect(assignment.getByText('Assigned to Sunniva Pell')).toBeVisible();
  await expect(colleague).toBeHidden();
});
