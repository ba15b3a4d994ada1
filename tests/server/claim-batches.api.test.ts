import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Claim } from '../../server/db/entities/claim.entity';
import { ClaimBatch } from '../../server/db/entities/claim-batch.entity';
import { claimWorld, daysAgo } from '../support/claim-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

const HEADER =
  'serial,units,failed_on,symptoms,supply_volts,input_watts,power_factor,driver_output_volts,driver_output_amps,water_ingress,narrative';

describe('bulk filing from a spreadsheet', () => {
  it('previews a CSV mixing good and bad rows (row, column, reason), makes drafts of the good ones, and files them together', async () => {
    const w = await claimWorld(t);
    const [s1, s2] = w.installation.serials;
    const csv = [
      HEADER,
      `${s1},1,${daysAgo(9)},partly_dark; flicker,"276,4",23.4,0.95,48.1,440 mA,no,Two strings dark on the east row.`,
      `${s2},1,${daysAgo(8)},cycling,277,23.9,0.96,48.3,0.44,no,Driver cycles every few seconds once warm.`,
      `NOPE-1,1,${daysAgo(8)},dark,277,,,,,no,Completely dark since Monday.`,
      `${s1},1,${daysAgo(7)},dark,277,,,,,no,Listed twice in this file.`,
      `${s2},1,2025-02-30,glowing,2x7,,1.4,,350 mV,maybe,short`,
    ].join('\n');
    const preview = await w.installer.agent
      .post('/api/claims/batches?dryRun=true')
      .send({ csv, filename: 'failures.csv' });
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({
      dryRun: true,
      total: 5,
      valid: 2,
      invalid: 3,
      created: 0,
      batchId: null,
    });
    const errs = preview.body.errors as { row: number; column: string; message: string }[];
    expect(errs).toEqual(
      expect.arrayContaining([
        { row: 4, column: 'serial', message: 'No installation of yours has the serial NOPE-1.' },
        { row: 5, column: 'serial', message: `Also on row 2: ${s1}.` },
        { row: 6, column: 'failed_on', message: 'The failure date is not a calendar date.' },
        { row: 6, column: 'symptoms', message: 'Pick a listed symptom.' },
        {
          row: 6,
          column: 'supply_volts',
          message: '"2x7" is not a number. Type the digits the meter shows, like 118.4 or 118,4.',
        },
        {
          row: 6,
          column: 'power_factor',
          message: 'The power factor is at most 1 (a reading like 93 % is 0.93).',
        },
        { row: 6, column: 'driver_output_amps', message: '"mV" is not a unit for this reading (amps).' },
        { row: 6, column: 'water_ingress', message: '"maybe" is not yes or no.' },
        { row: 6, column: 'serial', message: `Also on row 3: ${s2}.` },
      ]),
    );
    expect(preview.body.rows.map((r: { row: number; verdict: string | null }) => r.row)).toEqual([2, 3]);
    // A preview writes nothing.
    expect(await t.ds.getRepository(Claim).countBy({ installationId: w.installation.id })).toBe(0);
    expect(await t.ds.getRepository(ClaimBatch).countBy({ contractorId: w.conX.id })).toBe(0);

    const made = await w.installer.agent.post('/api/claims/batches').send({ csv, filename: 'failures.csv' });
    expect(made.status).toBe(201);
    expect(made.body).toMatchObject({ created: 2, valid: 2, invalid: 3 });
    const drafts = await t.ds.getRepository(Claim).findBy({ batchId: made.body.batchId });
    expect(drafts.map((d) => d.stage)).toEqual(['draft', 'draft']);
    // Meter readings came in as written: a decimal comma and milliamps.
    const first = drafts.find((d) => d.serials[0] === s1)!;
    expect(first.measurements).toMatchObject({ supplyVolts: 276.4, driverOutputAmps: 0.44 });

    // Another contractor cannot see or file the batch.
    expect((await w.otherInstaller.agent.get(`/api/claims/batches/${made.body.batchId}`)).status).toBe(404);
    expect(
      (await w.otherInstaller.agent.post(`/api/claims/batches/${made.body.batchId}/file`).send({})).status,
    ).toBe(404);

    const filed = await w.installer.agent.post(`/api/claims/batches/${made.body.batchId}/file`).send({});
    expect(filed.status).toBe(200);
    expect(filed.body.results.map((r: { ok: boolean; stage: string }) => [r.ok, r.stage])).toEqual([
      [true, 'filed'],
      [true, 'filed'],
    ]);
    // Filing the batch again changes nothing: each claim answers as replayed.
    const again = await w.installer.agent.post(`/api/claims/batches/${made.body.batchId}/file`).send({});
    expect(again.body.results.every((r: { replayed: boolean }) => r.replayed)).toBe(true);
    const view = await w.installer.agent.get(`/api/claims/batches/${made.body.batchId}`);
    expect(view.body.claims).toHaveLength(2);
  });

  it('refuses a file with unknown or missing columns and makes nothing', async () => {
    const w = await claimWorld(t);
    const r = await w.installer.agent.post('/api/claims/batches').send({ csv: 'serial,colour\nA,red\n' });
    expect(r.status).toBe(200);
    expect(r.body.created).toBe(0);
    expect(
      r.body.errors.filter((e: { row: number }) => e.row === 1).map((e: { message: string }) => e.message),
    ).toEqual(
      expect.arrayContaining([
        'Unknown column: colour. Download the template for the column names.',
        'Missing columns: failed_on, symptoms, narrative.',
      ]),
    );
    expect(await t.ds.getRepository(ClaimBatch).countBy({ contractorId: w.conX.id })).toBe(0);
    expect(
      (await w.reviewer.agent.post('/api/claims/batches?dryRun=true').send({ csv: 'serial\n' })).status,
    ).toBe(403);
  });
});
