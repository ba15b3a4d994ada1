import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Attachment } from '../../server/db/entities/attachment.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { Installation } from '../../server/db/entities/installation.entity';
import { InstallationUnit } from '../../server/db/entities/installation-unit.entity';
import { User } from '../../server/db/entities/user.entity';
import { readRows } from '../../server/db/read';
import { recordAudit } from '../../server/lib/audit';
import { historyEventOf, loadHistory } from '../../server/lib/history';
import { listAttachments } from '../../server/modules/attachments/attachments.service';
import { createClaimsService } from '../../server/modules/claims/claims.service';
import { createInstallationsService } from '../../server/modules/installations/installations.service';
import { createOrganization, createUser } from '../support/factories';
import { createClaimAt, createReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// A claim read with written-out SQL and TypeORM's metadata (server/db/hydrate.ts) is the very object TypeORM's
// query builder makes of the same joins: every column converted alike (dates, JSON, simple arrays, decimals).

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

/** A contractor and a manufacturer of their own, with a product, an installation and a policy. */
const newWorld = async () =>
  createReviewWorld(
    t.ds,
    await createOrganization(t.ds, 'contractor'),
    await createOrganization(t.ds, 'manufacturer'),
  );

const byQueryBuilder = async (id: string) => {
  const c = await t.ds
    .createQueryBuilder(Claim, 'c')
    .leftJoinAndSelect('c.contractor', 'co')
    .leftJoinAndSelect('c.manufacturer', 'mo')
    .leftJoinAndSelect('c.productModel', 'p')
    .leftJoinAndSelect('c.installation', 'i')
    .leftJoinAndSelect('i.units', 'u')
    .leftJoinAndSelect('c.policyVersion', 'v')
    .leftJoinAndSelect('v.policy', 'pol')
    .where('c.id = :id', { id })
    .orderBy('u.id')
    .getOne();
  return c;
};

/** The loaded claim less what only this read adds (its creator), to compare with the query builder's. */
const withoutCreator = (c: Awaited<ReturnType<ReturnType<typeof createClaimsService>['findById']>>) => {
  if (!c) return c;
  const { creator: _creator, ...rest } = c;
  return Object.assign(Object.create(Claim.prototype) as Claim, rest);
};

describe('reading a claim for its page', () => {
  it('gives what the query builder gives, at every kind of stage, with and without units and a policy', async () => {
    const w = await newWorld();
    const service = createClaimsService(t.ds, { publicUrl: (p) => p });
    const claims = [];
    const installer = await createUser(t.ds, w.contractor, ['installer']);
    for (const stage of ['draft', 'in_review', 'approved'] as const)
      claims.push(
        await createClaimAt(t.ds, w, stage, stage === 'in_review' ? { filedById: installer.id } : {}),
      );
    expect(claims[1].createdById).toBe(installer.id);
    // No units on the installation yet: the units list is empty, not missing.
    const lonely = await service.findById(claims[0].id);
    expect(lonely!.installation.units).toEqual([]);
    expect(withoutCreator(lonely)).toEqual(await byQueryBuilder(claims[0].id));

    const units = t.ds.getRepository(InstallationUnit);
    for (const serial of ['SN-A1', 'SN-A2', 'SN-A3'])
      await units.save(
        units.create({
          installationId: w.installation.id,
          productModelId: w.product.id,
          manufacturerId: w.manufacturer.id,
          serial: `${serial}-${w.installation.id.slice(0, 6)}`,
        }),
      );
    // And a claim without a policy version.
    await t.ds.getRepository(Claim).update({ id: claims[2].id }, { policyVersionId: null });
    for (const c of claims) {
      const fast = await service.findById(c.id);
      expect(fast).toBeInstanceOf(Claim);
      expect(fast!.installation.units).toHaveLength(3);
      expect(withoutCreator(fast)).toEqual(await byQueryBuilder(c.id));
      // Who started it comes with it: the user's name and organisation, or null when nobody is recorded.
      const creator = c.createdById
        ? await t.ds.getRepository(User).findOneByOrFail({ id: c.createdById })
        : null;
      expect(fast!.creator).toEqual(
        creator ? { id: creator.id, name: creator.name, organizationId: creator.organizationId } : null,
      );
      // Inside a transaction, on the transaction's connection, the same.
      expect(await t.ds.transaction((m) => service.findById(c.id, m))).toEqual(fast);
    }
    expect((await service.findById(claims[2].id))!.policyVersion).toBeNull();
    expect(await service.findById('00000000-0000-4000-8000-000000000000')).toBeNull();
  });

  it('gives its page the same history and files as reading them one by one', async () => {
    const w = await newWorld();
    const installer = await createUser(t.ds, w.contractor, ['installer']);
    const reviewer = await createUser(t.ds, w.manufacturer, ['reviewer']);
    const service = createClaimsService(t.ds, { publicUrl: (p) => p });
    const c = await createClaimAt(t.ds, w, 'in_review', { filedById: installer.id });
    // Events by both sides (one by nobody), with before and after states; files with and without a capture time,
    // a removed one (never shown) and one of another claim.
    await t.ds.transaction(async (m) => {
      await recordAudit(
        m,
        { userId: installer.id, organizationId: w.contractor.id },
        {
          action: 'claim.updated',
          entityType: 'Claim',
          entityId: c.id,
          before: { narrative: 'Dark.' },
          after: { narrative: 'Dark since Monday; "strings" 3 & 4 out.', units: 2 },
        },
      );
      await recordAudit(
        m,
        { userId: reviewer.id, organizationId: w.manufacturer.id },
        {
          action: 'claim.review_started',
          entityType: 'Claim',
          entityId: c.id,
        },
      );
      await recordAudit(
        m,
        { userId: null, organizationId: null },
        {
          action: 'claim.reminder_sent',
          entityType: 'Claim',
          entityId: c.id,
        },
      );
    });
    const files = t.ds.getRepository(Attachment);
    const file = (over: Partial<Attachment>) =>
      files.save(
        files.create({
          ownerType: 'claim',
          ownerId: c.id,
          organizationId: w.contractor.id,
          uploadedById: installer.id,
          kind: 'photo',
          purpose: 'nameplate',
          contentType: 'image/webp',
          byteSize: 123_456,
          sha256: 'a'.repeat(64),
          storageKey: `test/${crypto.randomUUID()}`,
          thumbnailKey: null,
          originalName: 'nameplate.jpg',
          width: 1600,
          height: 1200,
          capturedAt: new Date('2026-11-30T08:15:42.123Z'),
          ...over,
        } as Partial<Attachment>),
      );
    await file({});
    await file({
      kind: 'document',
      purpose: 'proof_of_purchase',
      contentType: 'application/pdf',
      width: null,
      height: null,
      capturedAt: null,
      originalName: 'invoice.pdf',
    });
    await file({ deletedAt: new Date() });
    await file({ ownerId: crypto.randomUUID() });

    const page = await service.findForPage(c.id);
    expect(withoutCreator(page!.claim)).toEqual(withoutCreator(await service.findById(c.id)));
    for (const viewer of [w.contractor.id, w.manufacturer.id]) {
      const one = page!.history.map((h) => historyEventOf(h.event, h, viewer));
      expect(one).toEqual(await loadHistory(t.ds, 'Claim', c.id, viewer));
    }
    expect(page!.history.length).toBeGreaterThanOrEqual(3);
    const listed = await listAttachments({ ds: t.ds } as never, { type: 'claim', id: c.id });
    expect(listed).toHaveLength(2);
    expect(page!.attachments).toEqual(listed);
    expect(page!.attachments[0].capturedAt).toEqual(new Date('2026-11-30T08:15:42.123Z'));
    expect(await service.findForPage(crypto.randomUUID())).toBeNull();
  });
});

describe('reading an installation for its page', () => {
  const byQueryBuilder = (id: string) =>
    t.ds
      .createQueryBuilder(Installation, 'i')
      .leftJoinAndSelect('i.productModel', 'p')
      .leftJoinAndSelect('p.manufacturer', 'pm')
      .leftJoinAndSelect('i.contractor', 'c')
      .leftJoinAndSelect('i.manufacturer', 'm')
      .leftJoinAndSelect('i.policyVersion', 'v')
      .leftJoinAndSelect('v.policy', 'pol')
      .leftJoinAndSelect('i.units', 'u')
      .where('i.id = :id', { id })
      .orderBy('u.id')
      .getOne();

  it('gives what the query builder gives, with and without units and a policy', async () => {
    const w = await newWorld();
    const service = createInstallationsService(t.ds);
    const id = w.installation.id;
    const bare = await service.findById(id);
    expect(bare).toBeInstanceOf(Installation);
    expect(bare!.units).toEqual([]);
    expect(bare).toEqual(await byQueryBuilder(id));
    const units = t.ds.getRepository(InstallationUnit);
    for (const serial of ['SN-B2', 'SN-B1', 'SN-B3'])
      await units.save(
        units.create({
          installationId: id,
          productModelId: w.product.id,
          manufacturerId: w.manufacturer.id,
          serial: `${serial}-${id.slice(0, 6)}`,
        }),
      );
    const full = await service.findById(id);
    expect(full!.units).toHaveLength(3);
    expect(full!.policyVersion?.policy.name).toBeTruthy();
    expect(full).toEqual(await byQueryBuilder(id));
    await t.ds.getRepository(Installation).update({ id }, { policyVersionId: null });
    const unpolicied = await service.findById(id);
    expect(unpolicied!.policyVersion).toBeNull();
    expect(unpolicied).toEqual(await byQueryBuilder(id));
    expect(await service.findById('00000000-0000-4000-8000-000000000000')).toBeNull();
  });
});

describe("mysql2's row parsers and protocols", () => {
  // Lists read with the parser mysql2 compiles for their columns, a record's page with the interpreted one as a
  // prepared statement, and everything TypeORM reads with the interpreted one (server/db/data-source.ts): each
  // column type must come out the same every way (dates, decimals, big numbers as strings, JSON, booleans, NULLs).
  it('read every kind of column alike', async () => {
    const w = await newWorld();
    const claim = await createClaimAt(t.ds, w, 'approved');
    await recordAudit(
      t.ds.manager,
      { userId: null, organizationId: w.manufacturer.id },
      {
        action: 'claim.approved',
        entityType: 'Claim',
        entityId: claim.id,
        after: { amount: '12.50', nested: { list: [1, 2.5, null, 'x'] } },
      },
    );
    const statements: [string, unknown[]][] = [
      ...[
        'claims',
        'installations',
        'installation_units',
        'product_models',
        'organizations',
        'users',
        'warranty_policies',
        'warranty_policy_versions',
        'audit_events',
      ].map((table): [string, unknown[]] => [`SELECT * FROM ${table} ORDER BY 1 DESC LIMIT 20`, []]),
      [
        `SELECT c.id, c.expected_credit, COUNT(*) AS n, MAX(e.occurred_at) AS last_at, NULL AS nothing,
                JSON_ARRAYAGG(JSON_OBJECT('at', e.occurred_at, 'after', e.after_state)) AS events
           FROM claims c JOIN audit_events e ON e.entity_type = 'Claim' AND e.entity_id = c.id
          WHERE c.id = ?
          GROUP BY c.id, c.expected_credit`,
        [claim.id],
      ],
    ];
    for (const [sql, params] of statements) {
      const compiled = await readRows<Record<string, unknown>>(t.ds, sql, params, { parser: 'compiled' });
      const interpreted = await readRows<Record<string, unknown>>(t.ds, sql, params, {
        parser: 'interpreted',
      });
      expect(compiled.length, sql).toBeGreaterThan(0);
      expect(interpreted, sql).toEqual(compiled);
      // And as a prepared statement (MariaDB's binary protocol, which a record read uses), with either parser.
      for (const parser of ['compiled', 'interpreted'] as const)
        expect(await readRows(t.ds, sql, params, { parser, prepared: true }), sql).toEqual(compiled);
      expect(await readRows(t.ds, sql, params, { dateStrings: true, parser: 'interpreted' }), sql).toEqual(
        await readRows(t.ds, sql, params, { dateStrings: true, parser: 'compiled' }),
      );
    }
    // The binary protocol writes a DATETIME(3) with no fraction as `10:00:00`, the text protocol `10:00:00.000`,
    // which isoOfDateTime counts on: a prepared read cannot ask for dates as strings.
    await expect(
      readRows(t.ds, 'SELECT NOW(3) AS at', [], { dateStrings: true, prepared: true }),
    ).rejects.toThrow(/dateStrings/);
  });
});
