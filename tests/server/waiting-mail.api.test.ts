import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { In } from 'typeorm';
import { Claim } from '../../server/db/entities/claim.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { WaitingMailSetting } from '../../server/db/entities/waiting-mail-setting.entity';
import { clock } from '../../server/lib/clock';
import {
  sendWaitingMail,
  unsubscribeToken,
  verifyUnsubscribeToken,
} from '../../server/modules/waiting/waiting-mail';
import { createOrganization, createUser, signIn } from '../support/factories';
import { createClaimAt, createReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterEach(() => clock.reset());
afterAll(() => closeTestApp(t));

const modeOf = async (userId: string) =>
  (await t.ds.getRepository(WaitingMailSetting).findOneBy({ userId }))?.mode ?? 'daily';
const mailsTo = (email: string) =>
  t.ds.getRepository(OutboxMessage).find({ where: { to: In([email]), template: 'waiting' } });

async function world() {
  const contractor = await createOrganization(t.ds, 'contractor');
  const manufacturer = await createOrganization(t.ds, 'manufacturer');
  const w = await createReviewWorld(t.ds, contractor, manufacturer);
  const installer = await createUser(t.ds, contractor, ['installer']);
  const reviewer = await createUser(t.ds, manufacturer, ['reviewer']);
  let claim: Claim | undefined;
  for (let i = 0; !claim; i++) {
    try {
      claim = await createClaimAt(t.ds, w, 'needs_info', { reviewerId: reviewer.id });
    } catch (err) {
      if (i > 4 || !String((err as Error).message).includes('uq_claims_number')) throw err;
    }
  }
  return { installer, reviewer, claim };
}
const pass = (userIds: string[]) =>
  sendWaitingMail(t.ds, { secret: t.config.sessionSecret, publicUrl: (p) => `http://lp.test${p}`, userIds });

describe('"waits on me" by e-mail', () => {
  it('lets each person choose at once, a daily summary or none; a daily summary by default', async () => {
    const { installer } = await world();
    const agent = await signIn(t.request(), installer.email);
    expect((await agent.get('/api/waiting/email')).body).toEqual({ mode: 'daily' });
    expect((await agent.put('/api/waiting/email').send({ mode: 'immediate' })).status).toBe(200);
    expect(await modeOf(installer.id)).toBe('immediate');
    const bad = await agent.put('/api/waiting/email').send({ mode: 'hourly' });
    expect(bad.status).toBe(400);
    expect(await modeOf(installer.id)).toBe('immediate');
  });

  it('sends at once only what is new, a summary at most once a day, nothing to those who chose none', async () => {
    const { installer, reviewer, claim } = await world();
    await t.ds
      .getRepository(WaitingMailSetting)
      .save({ userId: installer.id, mode: 'immediate', lastSentAt: null });
    expect(await pass([installer.id])).toBe(1);
    const [first] = await mailsTo(installer.email);
    expect(first.text).toContain(claim.number!);
    expect(first.text).toContain('The manufacturer asks you for more information');
    expect(first.text).toContain(`http://lp.test/claims/${claim.id}/workflow`);
    expect(first.text).toContain(
      `http://lp.test/api/waiting/unsubscribe/${unsubscribeToken(t.config.sessionSecret, installer.id)}`,
    );
    expect(await pass([installer.id])).toBe(0); // nothing new since
    // A new event on the claim (asked again a minute later) is new: it goes at once.
    clock.advance(120_000);
    await t.ds.getRepository(Claim).update({ id: claim.id }, { stageChangedAt: clock.now() });
    clock.advance(60_000);
    expect(await pass([installer.id])).toBe(1);

    // The reviewer has nothing waiting: no message, whatever the mode. The installer on "none": nothing.
    expect(await pass([reviewer.id])).toBe(0);
    await t.ds.getRepository(WaitingMailSetting).update({ userId: installer.id }, { mode: 'none' });
    clock.advance(60_000);
    await t.ds.getRepository(Claim).update({ id: claim.id }, { stageChangedAt: clock.now() });
    clock.advance(60_000);
    expect(await pass([installer.id])).toBe(0);

    // A daily summary: once, then not again until a day has passed.
    await t.ds.getRepository(WaitingMailSetting).update({ userId: installer.id }, { mode: 'daily' });
    const before = (await mailsTo(installer.email)).length;
    expect(await pass([installer.id])).toBe(0); // the last message went minutes ago
    clock.advance(24 * 60 * 60 * 1000 + 1000);
    expect(await pass([installer.id])).toBe(1);
    expect(await pass([installer.id])).toBe(0);
    const all = await mailsTo(installer.email);
    expect(all).toHaveLength(before + 1);
    expect(all.at(-1)!.subject).toContain('daily summary');
  });

  it('unsubscribes from the link without signing in; a forged or altered token changes nothing', async () => {
    const { installer, reviewer } = await world();
    const token = unsubscribeToken(t.config.sessionSecret, installer.id);
    const forged = `${reviewer.id}.${token.split('.')[1]}`; // someone else's id with this signature
    const altered = `${token.slice(0, -1)}${token.endsWith('A') ? 'B' : 'A'}`;
    for (const bad of [forged, altered, 'nonsense']) {
      expect(verifyUnsubscribeToken(t.config.sessionSecret, bad)).toBeNull();
      const r = await t.request().get(`/api/waiting/unsubscribe/${encodeURIComponent(bad)}`);
      expect(r.status, bad).toBe(404);
    }
    expect(await modeOf(reviewer.id)).toBe('daily');
    const r = await t.request().get(`/api/waiting/unsubscribe/${token}`);
    expect(r.status).toBe(200);
    expect(r.text).toContain('No more e-mail about what waits on you');
    expect(await modeOf(installer.id)).toBe('none');
    expect(await modeOf(reviewer.id)).toBe('daily');
  });
});
