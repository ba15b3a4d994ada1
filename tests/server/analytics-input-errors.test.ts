import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';

import { kaplanMeier } from '../../shared/analytics/kaplan-meier';
import { forecastReserve } from '../../shared/analytics/reserve';
import { errorHandler } from '../../server/middleware/error-handler';

// A term or life datum the analytics refuse reaches the client as a 400 naming the field, through the app's own
// error handler (the one createApp mounts last), not as a 500 or a "NaN.NaN" amount.
function appCalling(compute: () => unknown) {
  const app = express();
  app.get('/x', (_req, res) => {
    res.json(compute());
  });
  app.use(errorHandler);
  return app;
}

const cohort = {
  key: 'k',
  survivors: 10,
  ageMonths: 3,
  life: { shape: 1.5, scale: 40 },
  termMonths: 60,
  fullCoverageMonths: 24,
  unitCredit: '85.00',
  currency: 'USD',
};

describe('analytics input errors over HTTP', () => {
  it('a NaN warranty term is a 400 naming cohorts.0.termMonths', async () => {
    const r = await request(appCalling(() => forecastReserve([{ ...cohort, termMonths: NaN }]))).get('/x');
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('analytics.invalid_input');
    expect(r.body.error.details).toEqual([{ path: 'cohorts.0.termMonths', message: expect.any(String) }]);
  });

  it('Kaplan-Meier on a null entry is a 400 naming data.failures.1', async () => {
    const r = await request(appCalling(() => kaplanMeier({ failures: [1, null as unknown as number] }))).get(
      '/x',
    );
    expect(r.status).toBe(400);
    expect(r.body.error.details[0].path).toBe('data.failures.1');
  });
});
