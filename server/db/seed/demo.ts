import { In, Not } from 'typeorm';
import type { ClaimStage } from '../../../shared/schemas/claims';
import type { AppDataSource } from '../data-source';
import { clock } from '../../lib/clock';
import { Claim } from '../entities/claim.entity';
import { hashPassword } from '../../auth/passwords';
import { Organization } from '../entities/organization.entity';
import { User } from '../entities/user.entity';
import { recordAudit } from '../../lib/audit';
import { DEMO_ACCOUNTS, DEMO_ORGANIZATIONS, DEMO_PASSWORD } from './demo-accounts';
import { seedDemoCatalogue } from './demo-catalogue';
import { seedDemoCredits } from './demo-credits';
import type { AppConfig } from '../../config/env';
import type { Storage } from '../../lib/storage';
import { seedDemoClaims } from './demo-claims';
import { seedDemoReliability } from './demo-reliability';
import { seedDemoWorkflow } from './demo-workflow';
import { seedDemoEvidence } from './demo-evidence';

const RELIABILITY_WITH_EVIDENCE: ClaimStage[] = ['filed', 'in_review', 'needs_info'];

/**
 * Loads the fictional demo scenario into an empty database. Returns false when there was data already.
 * With `credits` (the storage for the PDFs and the config), the workflow's rows and files are loaded too: the
 * decided claims' decisions and determination letters, questions, returns with packing slips, bench tests, and
 * the credits scenario (the oldest approved claims credited through the real service, a reversal), and the
 * claims' photos and invoices (demo-evidence; `photos: false` leaves them out, for the seed benchmark's baseline).
 */
export async function seedDemo(
  ds: AppDataSource,
  opts: { onlyIfEmpty?: boolean; credits?: { storage: Storage; config: AppConfig }; photos?: boolean } = {},
): Promise<boolean> {
  const orgs = ds.getRepository(Organization);
  if (opts.onlyIfEmpty !== false && (await orgs.count()) > 0) return false;
  if (await orgs.exists({ where: { name: DEMO_ORGANIZATIONS[0].name } })) return false;
  const hashes = await Promise.all(DEMO_ACCOUNTS.map(() => hashPassword(DEMO_PASSWORD)));
  await ds.transaction(async (m) => {
    const orgs = new Map<string, Organization>();
    for (const o of DEMO_ORGANIZATIONS) {
      const org = m.create(Organization, {
        name: o.name,
        kind: o.kind,
        timeZone: o.timeZone,
        locale: o.locale,
      });
      await m.save(org);
      orgs.set(o.key, org);
    }
    const users = new Map<string, User>();
    for (const [i, a] of DEMO_ACCOUNTS.entries()) {
      const org = orgs.get(a.org)!;
      const user = m.create(User, {
        organizationId: org.id,
        email: a.email,
        name: a.name,
        roles: a.roles,
        status: 'active',
        passwordHash: hashes[i],
      });
      await m.save(user);
      users.set(a.email, user);
      await recordAudit(
        m,
        { userId: null, organizationId: org.id },
        {
          action: 'user.created',
          entityType: 'User',
          entityId: user.id,
          after: { email: a.email, roles: a.roles, source: 'demo' },
        },
      );
    }
    const catalogue = await seedDemoCatalogue(m, orgs, users);
    const { claims, evidence } = await seedDemoClaims(m, orgs, users, catalogue);
    if (opts.credits) await seedDemoWorkflow(m, opts.credits.storage, claims, users);
    await seedDemoReliability(m, orgs, users, [...catalogue.products.values()]);
    if (opts.credits && opts.photos !== false) {
      // The reliability history's claims still in the reviewers' hands were judged with two photos and the
      // invoice (demo-reliability): they carry them too.
      const open = await m.find(Claim, {
        select: { id: true },
        where: { stage: In(RELIABILITY_WITH_EVIDENCE), id: Not(In(claims.map((c) => c.id))) },
      });
      for (const c of open) evidence.set(c.id, { photos: 2, proofOfPurchase: true });
      await seedDemoEvidence(m, opts.credits.storage, evidence, clock.now());
    }
  });
  if (opts.credits) await seedDemoCredits(ds, opts.credits.storage, opts.credits.config);
  // Rows written today for a story of three years: each claim was started a little before it was filed and last
  // changed at its last stage move, so lists ordered by "newest change first" read like the story, not like the
  // order the seed wrote them in.
  // Only the demo's contractors' claims: tests seed the demo into a database other tests share.
  const contractors = await orgs.findBy({
    name: In(DEMO_ORGANIZATIONS.filter((o) => o.kind === 'contractor').map((o) => o.name)),
  });
  await ds.query(
    `UPDATE claims SET
       created_at = IF(filed_at IS NOT NULL AND filed_at < created_at, filed_at - INTERVAL 25 MINUTE, created_at),
       updated_at = GREATEST(stage_changed_at, COALESCE(filed_at, stage_changed_at))
     WHERE contractor_id IN (?)`,
    [contractors.map((o) => o.id)],
  );
  return true;
}
