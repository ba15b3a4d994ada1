import crypto from 'node:crypto';
import type { DeepPartial } from 'typeorm';
import { newClaimNumber } from '../../shared/claims/claim-number';
import type { AppDataSource } from '../../server/db/data-source';
import { Claim } from '../../server/db/entities/claim.entity';

// Test claims go straight into the database with a number. Numbers are random within their month, as in the
// product (29^5, about 20.5 million a month), and the factories file most claims in the same month, so on a
// large test database the number drawn can already be taken. Like filing (server/modules/claims/claims.service.ts),
// a taken number (the unique index refuses it) is drawn again; nothing else is retried.

const isTaken = (err: unknown) => {
  const e = err as { code?: string; driverError?: { code?: string }; message?: string };
  return (
    (e.code === 'ER_DUP_ENTRY' || e.driverError?.code === 'ER_DUP_ENTRY') &&
    String(e.message).includes('uq_claims_number')
  );
};

export async function saveNumberedClaim(
  ds: AppDataSource,
  filedAt: Date,
  fields: Omit<DeepPartial<Claim>, 'number'>,
  random: (n: number) => number = (n) => crypto.randomInt(n),
): Promise<Claim> {
  const repo = ds.getRepository(Claim);
  for (let attempt = 1; ; attempt++) {
    try {
      // A fresh entity each time: a failed save may already have given the last one an id.
      return await repo.save(
        repo.create({ ...fields, number: newClaimNumber(filedAt, random) } as DeepPartial<Claim>),
      );
    } catch (err) {
      if (attempt < 8 && isTaken(err)) continue;
      throw err;
    }
  }
}
