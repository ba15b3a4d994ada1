import {
  expect,
  request as playwrightRequest,
  test,
  type APIRequestContext,
  type Page,
} from '@playwright/test';
import { DEMO_PASSWORD, PHONE, signInAs } from './support';

// A lost connection loses nothing typed (issue 5, drafts): the claim form keeps unsent changes on the device
// and sends them when the browser is back online, or when the draft is opened again. The server is checked
// through a separate API session (the installer's "desk"), which the phone's offline emulation does not touch.
test.describe('a draft typed without a connection', () => {
  test.use({ viewport: PHONE, isMobile: true, hasTouch: true });

  let desk: APIRequestContext;
  test.beforeEach(async ({ baseURL }) => {
    desk = await playwrightRequest.newContext({ baseURL });
    const login = await desk.post('/api/auth/login', {
      data: { email: 'ines@harborview.test', password: DEMO_PASSWORD },
    });
    expect(login.status()).toBe(200);
  });
  test.afterEach(async () => {
    await desk.dispose();
  });

  /** A fresh draft on one of the installer's sites, started the way the client does (with an Idempotency-Key). */
  async function newDraft() {
    const list = await desk.get('/api/installations?pageSize=20&sort=-installDate');
    const inst = ((await list.json()).items as { id: string }[])[0];
    const r = await desk.post('/api/claims', {
      data: { installationId: inst.id },
      headers: { 'Idempotency-Key': `e2e-draft-${crypto.randomUUID()}` },
    });
    expect(r.status()).toBe(201);
    return (await r.json()).claim as { id: string; version: number };
  }
  const serverCopy = async (id: string) =>
    (await (await desk.get(`/api/claims/${id}`)).json()).claim as { version: number; narrative: string };
  const syncStatus = (page: Page) =>
    page.getByRole('status').filter({
      hasText: /^(Saved|Saving…|Offline — changes kept on this device|Changed elsewhere|Not saved)$/,
    });
  const kept = (page: Page, id: string) =>
    page.evaluate(
      (key) => JSON.parse(localStorage.getItem(key) ?? 'null') as { values: { narrative: string } } | null,
      `lumenproof.claim-draft.${id}`,
    );

  async function openDraft(page: Page, id: string) {
    await signInAs(page, 'ines@harborview.test');
    await page.goto(`/claims/${id}`);
    await expect(page.getByRole('heading', { level: 1, name: 'New claim' })).toBeVisible();
    await expect(syncStatus(page)).toHaveText('Saved');
  }

  test('offline: says so and keeps the change on the phone; back online, the change reaches the server', async ({
    page,
    context,
  }) => {
    const draft = await newDraft();
    await openDraft(page, draft.id);

    await context.setOffline(true);
    const text = 'Typed on the lift with no signal: east row dark, driver warm.';
    await page.getByLabel('What happened').fill(text);
    await expect(syncStatus(page)).toHaveText('Offline — changes kept on this device');
    expect((await kept(page, draft.id))?.values.narrative).toBe(text);
    // Nothing went out while offline.
    expect(await serverCopy(draft.id)).toMatchObject({ version: draft.version, narrative: '' });

    await context.setOffline(false);
    await expect(syncStatus(page)).toHaveText('Saved');
    await expect.poll(async () => (await serverCopy(draft.id)).narrative).toBe(text);
    expect((await serverCopy(draft.id)).version).toBe(draft.version + 1);
    expect(await kept(page, draft.id)).toBeNull();
  });

  test('changes whose requests were lost go out when the draft is opened again', async ({ page }) => {
    const draft = await newDraft();
    await openDraft(page, draft.id);

    // The browser believes it is online but every save is lost on the way (a dead zone in the car park).
    await page.route('**/api/claims/*', (route) =>
      route.request().method() === 'PATCH' ? route.abort('internetdisconnected') : route.continue(),
    );
    const text = 'Written in the car park; the saves never arrived.';
    await page.getByLabel('What happened').fill(text);
    await expect(syncStatus(page)).toHaveText('Offline — changes kept on this device');
    expect((await kept(page, draft.id))?.values.narrative).toBe(text);
    expect((await serverCopy(draft.id)).narrative).toBe('');

    await page.unroute('**/api/claims/*');
    await page.reload();
    await expect(page.getByLabel('What happened')).toHaveValue(text);
    await expect.poll(async () => (await serverCopy(draft.id)).narrative).toBe(text);
    await expect(syncStatus(page)).toHaveText('Saved');
  });

  test('changed at the desk meanwhile: a clear message, and the phone’s change kept only when the user says so', async ({
    page,
    context,
  }) => {
    const draft = await newDraft();
    await openDraft(page, draft.id);

    await context.setOffline(true);
    await page.getByLabel('What happened').fill('Typed on the phone while offline.');
    await expect(syncStatus(page)).toHaveText('Offline — changes kept on this device');
    const desktop = await desk.patch(`/api/claims/${draft.id}`, {
      data: { version: draft.version, narrative: 'Typed at the desk meanwhile.' },
    });
    expect(desktop.status()).toBe(200);

    await context.setOffline(false);
    await expect(syncStatus(page)).toHaveText('Changed elsewhere');
    await expect(page.getByRole('alert')).toContainText(
      'This draft was changed on another device or tab since these changes were made here.',
    );
    // Nothing overwritten until the user chooses.
    expect((await serverCopy(draft.id)).narrative).toBe('Typed at the desk meanwhile.');
    expect((await kept(page, draft.id))?.values.narrative).toBe('Typed on the phone while offline.');

    await page.getByRole('button', { name: "Keep this device's changes" }).click();
    await expect(syncStatus(page)).toHaveText('Saved');
    await expect
      .poll(async () => (await serverCopy(draft.id)).narrative)
      .toBe('Typed on the phone while offline.');
    expect((await serverCopy(draft.id)).version).toBe(draft.version + 2);
    await expect(page.getByRole('alert')).toHaveCount(0);
  });
});
