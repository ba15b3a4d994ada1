import { expect, test } from '@playwright/test';
import { signInAs } from './support';

// Issue 14, item 6: the reviewer records what the bench found. A returned unit not yet found sound is put on
// the bench, the reviewer records "no fault found" with a reading, and the decision options follow: approving
// now needs a written reason naming the bench, and the deny form offers "No fault found on the bench" ticked.

test('a reviewer records a no-fault-found bench test and the decision options change with it', async ({
  page,
}) => {
  await signInAs(page, 'rhea@aldercrest.test');
  const queue = await page.request.get('/api/review/queue?stage=unit_received&pageSize=100');
  expect(queue.status()).toBe(200);
  const items = (await queue.json()).items as { id: string; number: string }[];
  let claim: { id: string; number: string } | undefined;
  for (const item of items) {
    const wf = await (await page.request.get(`/api/claims/${item.id}/workflow`)).json();
    if (
      wf.actions.includes('record_bench_test') &&
      !wf.benchTests.some((b: { result: string }) => b.result === 'no_fault_found')
    ) {
      claim = item;
      break;
    }
  }
  expect(claim, `a returned unit not found to be sound yet, among ${items.length}`).toBeTruthy();

  await page.goto(`/review/${claim!.id}`);
  await expect(page.getByRole('heading', { level: 1, name: `Claim ${claim!.number}` })).toBeVisible();
  const moves = page.getByRole('group', { name: 'Moves' });

  // Before the bench: nothing about it in the decision.
  await moves.getByRole('button', { name: 'Approve' }).click();
  await expect(page.getByRole('form', { name: 'Approve' })).not.toContainText('The bench test found');
  await moves.getByRole('button', { name: 'Deny' }).click();
  await expect(page.getByRole('checkbox', { name: 'No fault found on the bench' })).not.toBeChecked();

  // The bench: no fault found, with the input power read on the bench.
  await moves.getByRole('button', { name: 'Record bench test' }).click();
  const bench = page.getByRole('form', { name: 'Record bench test' });
  for (const label of ['Failure confirmed', 'No fault found', 'Damage found']) {
    await expect(bench.getByRole('radio', { name: label })).toBeVisible();
  }
  await bench.getByRole('radio', { name: 'No fault found' }).check();
  await bench.getByRole('textbox', { name: /Input power/ }).fill('23.6');
  await bench.getByRole('textbox', { name: /Supply/ }).fill('120.5');
  await bench.getByLabel('Bench notes (optional)').fill('Ran 8 hours at rated input; every string lit.');
  await bench.getByRole('button', { name: 'Record bench test' }).click();
  await expect(page.getByTestId('latest-bench-result')).toContainText('No fault found');

  // After: approving needs a reason naming the bench; denying offers the bench's reason ticked.
  await moves.getByRole('button', { name: 'Approve' }).click();
  await expect(page.getByRole('form', { name: 'Approve' }).getByRole('alert')).toContainText(
    'The bench test found: no fault found.',
  );
  await moves.getByRole('button', { name: 'Deny' }).click();
  await expect(page.getByRole('checkbox', { name: 'No fault found on the bench' })).toBeChecked();

  // The server kept the bench test as recorded, and judged the claim again on the bench readings.
  const wf = await (await page.request.get(`/api/claims/${claim!.id}/workflow`)).json();
  expect(wf.benchTests.at(-1)).toMatchObject({
    result: 'no_fault_found',
    readings: { inputWatts: 23.6, supplyVolts: 120.5 },
  });
  // The engine ran on the bench's supply reading (the range depends on the site's nominal voltage).
  expect(wf.benchTests.at(-1).evaluation.computed.serviceVoltageRange).not.toBeNull();
});
