import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { availableActions, type Stage } from '../../shared/claims/stages';
import type { ClaimWorkflowDto } from '../../shared/claims/workflow';
import { evaluateClaim } from '../../shared/engine';
import type { Evaluation, Verdict } from '../../shared/engine/schema';
import { Assignment, ReviewActions } from '../../src/features/review/components/claim-workflow';
import { makeInput } from '../shared/engine/factory';

// The reviewer's moves on the review screen: the buttons are the stage machine's (shared/claims/stages.ts, as the
// server computes them for GET /workflow), and approving or denying against the engine asks for a written reason
// before the request goes, and sends it with the move.

afterEach(cleanup);

const CLAIM_ID = '00000000-0000-4000-8000-000000000042';
const reviewer = {
  id: 'u1',
  roles: ['reviewer' as const],
  organization: { id: 'm1', kind: 'manufacturer' as const },
};
// These three have routes of their own (DEVELOPERS.md): the workflow answer never offers them.
const MOVES_ELSEWHERE = ['file', 'credit', 'void_credit'];

/** A real evaluation from the engine, with the verdict and credit each case needs. */
function evaluation(verdict: Verdict): Evaluation {
  const ev = evaluateClaim(makeInput());
  return { ...ev, verdict, computed: { ...ev.computed, credit: '96.00', currency: 'USD' } };
}

function workflow(stage: Stage, ev: Evaluation): ClaimWorkflowDto {
  const view = {
    stage,
    contractorId: 'c1',
    manufacturerId: 'm1',
    evaluation: { verdict: ev.verdict, computed: ev.computed },
  };
  return {
    claim: {
      id: CLAIM_ID,
      number: 'LP-2511-ABC-DEFG',
      stage,
      waitingOn: 'manufacturer',
      version: 3,
      stageChangedAt: '2026-11-02T09:00:00.000Z',
      assignee: null,
    },
    actions: availableActions(view, reviewer).filter((a) => !MOVES_ELSEWHERE.includes(a)),
    openRequest: null,
    messages: [],
    returns: [],
    benchTests: [],
    decision: null,
    documents: [],
    history: [],
  };
}

let sent: { url: string; init: RequestInit }[];
let reply: (url: string) => Response;
beforeEach(() => {
  sent = [];
  reply = () =>
    new Response(JSON.stringify({ claim: { id: CLAIM_ID, stage: 'approved', version: 4 } }), {
      status: 200,
      headers: { 'Content-Type': 'application/json' },
    });
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init: RequestInit) => {
      sent.push({ url, init });
      return reply(url);
    }),
  );
});
afterEach(() => vi.unstubAllGlobals());

function renderActions(stage: Stage, verdict: Verdict, benchResult?: string) {
  const ev = evaluation(verdict);
  const wf = workflow(stage, ev);
  if (benchResult) {
    wf.benchTests = [
      {
        id: 'b1',
        testedOn: '2026-11-03',
        result: benchResult,
        readings: { inputWatts: 23.5 },
        evaluation: ev,
        engineVersion: ev.engineVersion,
        note: null,
        testedBy: 'Rhea',
        testedAt: '2026-11-03T10:00:00.000Z',
      },
    ];
  }
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false }, mutations: { retry: false } },
  });
  return render(
    <QueryClientProvider client={client}>
      <ReviewActions wf={wf} evaluation={ev} units={1} />
    </QueryClientProvider>,
  );
}

const moveButtons = () =>
  within(screen.getByRole('group', { name: 'Moves' }))
    .queryAllByRole('button')
    .map((b) => b.textContent);
const reasonField = () => screen.queryByRole('textbox', { name: 'Reason for departing from the engine' });

describe('the review screen’s moves', () => {
  it('offers what the stage machine allows the reviewer at each stage, and nothing else', () => {
    const expected: [Stage, string[]][] = [
      ['filed', ['Take into review']],
      ['in_review', ['Ask the installer', 'Request the unit back', 'Approve', 'Deny']],
      ['needs_info', []],
      ['return_requested', ['Mark unit received']],
      ['unit_received', ['Record bench test', 'Approve', 'Deny']],
      ['approved', ['Reopen decision']],
      ['denied', ['Reopen decision', 'Close claim']],
      ['closed', []],
    ];
    for (const [stage, labels] of expected) {
      const { unmount } = renderActions(stage, 'review');
      expect({ stage, labels: moveButtons() }).toEqual({ stage, labels });
      if (labels.length === 0)
        expect(screen.getByText('Nothing for you to do at this stage.')).toBeInTheDocument();
      unmount();
    }
  });

  it('approving a claim the engine found likely excluded asks for a written reason and sends it with the move', async () => {
    const user = userEvent.setup();
    renderActions('in_review', 'excluded');
    await user.click(screen.getByRole('button', { name: 'Approve' }));
    const form = screen.getByRole('form', { name: 'Approve' });
    expect(within(form).getByRole('alert')).toHaveTextContent(
      'This decision needs a written reason: The engine found this claim likely excluded.',
    );
    expect(reasonField()).toBeInTheDocument();
    await user.type(reasonField()!, 'Date code on the nameplate puts the unit inside its term.');
    await user.click(within(form).getByRole('button', { name: 'Approve' }));
    expect(sent).toHaveLength(1);
    expect(sent[0].url).toBe(`/api/claims/${CLAIM_ID}/actions/approve`);
    expect(sent[0].init.method).toBe('POST');
    expect((sent[0].init.headers as Record<string, string>)['If-Match']).toBe('"3"');
    expect(JSON.parse(String(sent[0].init.body))).toEqual({
      resolution: 'replace',
      amount: '96.00',
      overrideReason: 'Date code on the nameplate puts the unit inside its term.',
    });
  });

  it('shows the server’s refusal when the reason is left out, in words', async () => {
    const user = userEvent.setup();
    reply = () =>
      new Response(
        JSON.stringify({
          error: {
            code: 'claim.invalid_payload',
            message: 'Some of the details need another look.',
            details: [{ path: 'overrideReason', message: 'Say why the decision departs from the engine.' }],
          },
        }),
        { status: 400, headers: { 'Content-Type': 'application/json' } },
      );
    renderActions('in_review', 'excluded');
    await user.click(screen.getByRole('button', { name: 'Approve' }));
    await user.click(
      within(screen.getByRole('form', { name: 'Approve' })).getByRole('button', { name: 'Approve' }),
    );
    const refusal = await screen.findByText('Say why the decision departs from the engine.');
    expect(refusal.closest('[role="alert"]')).toHaveTextContent('Some of the details need another look.');
    expect(JSON.parse(String(sent[0].init.body))).not.toHaveProperty('overrideReason');
  });

  it('records a bench test with any result the schema allows, here no fault found, with its readings', async () => {
    const user = userEvent.setup();
    renderActions('unit_received', 'covered');
    await user.click(screen.getByRole('button', { name: 'Record bench test' }));
    const form = screen.getByRole('form', { name: 'Record bench test' });
    const results = within(form)
      .getAllByRole('radio')
      .map((r) => (r as HTMLInputElement).value);
    expect(results).toEqual(['failure_confirmed', 'no_fault_found', 'damage_found', 'misapplication_found']);
    // Nothing read: the move's own schema refuses it before anything is sent.
    await user.click(within(form).getByRole('button', { name: 'Record bench test' }));
    expect(await within(form).findByText('Record at least one bench reading.')).toBeInTheDocument();
    expect(sent).toHaveLength(0);
    await user.click(within(form).getByRole('radio', { name: 'No fault found' }));
    await user.type(within(form).getByRole('textbox', { name: /Input power/ }), '23.5');
    await user.type(within(form).getByRole('textbox', { name: /Supply/ }), '121');
    await user.type(within(form).getByRole('textbox', { name: 'Bench notes (optional)' }), 'Runs 8 h clean.');
    await user.click(within(form).getByRole('button', { name: 'Record bench test' }));
    expect(sent).toHaveLength(1);
    expect(sent[0].url).toBe(`/api/claims/${CLAIM_ID}/actions/record_bench_test`);
    const body = JSON.parse(String(sent[0].init.body));
    expect(body).toMatchObject({
      result: 'no_fault_found',
      readings: { inputWatts: 23.5, supplyVolts: 121 },
      note: 'Runs 8 h clean.',
      next: 'decide',
    });
    expect(body.testedOn).toMatch(/^\d{4}-\d{2}-\d{2}$/);
  });

  it('marks a unit received damaged in transit', async () => {
    const user = userEvent.setup();
    renderActions('return_requested', 'covered');
    await user.click(screen.getByRole('button', { name: 'Mark unit received' }));
    const form = screen.getByRole('form', { name: 'Mark unit received' });
    expect(
      within(form)
        .getAllByRole('radio')
        .map((r) => (r as HTMLInputElement).value),
    ).toEqual(['as_described', 'damaged_in_transit', 'incomplete', 'other']);
    await user.click(within(form).getByRole('radio', { name: 'Damaged in transit' }));
    await user.click(within(form).getByRole('button', { name: 'Mark unit received' }));
    expect(sent).toHaveLength(1);
    expect(JSON.parse(String(sent[0].init.body))).toMatchObject({ condition: 'damaged_in_transit' });
  });

  it('after a no-fault-found bench test, approving needs a reason and denying offers that reason ticked', async () => {
    const user = userEvent.setup();
    renderActions('unit_received', 'covered', 'no_fault_found');
    await user.click(screen.getByRole('button', { name: 'Approve' }));
    expect(within(screen.getByRole('form', { name: 'Approve' })).getByRole('alert')).toHaveTextContent(
      'The bench test found: no fault found.',
    );
    await user.click(screen.getByRole('button', { name: 'Deny' }));
    expect(screen.getByRole('checkbox', { name: 'No fault found on the bench' })).toBeChecked();
  });

  it('approving a covered claim at the engine’s amount needs no reason; another amount does', async () => {
    const user = userEvent.setup();
    renderActions('in_review', 'covered');
    await user.click(screen.getByRole('button', { name: 'Approve' }));
    expect(reasonField()).not.toBeInTheDocument();
    const amount = screen.getByRole('textbox', { name: /Amount/ });
    await user.clear(amount);
    await user.type(amount, '120.00');
    expect(screen.getByRole('alert')).toHaveTextContent(
      "The amount differs from the engine's credit of 96.00 USD.",
    );
    expect(reasonField()).toBeInTheDocument();
    // Back to the engine's figure (written differently): no reason needed again.
    await user.clear(amount);
    await user.type(amount, '96');
    expect(reasonField()).not.toBeInTheDocument();
  });

  it('denying needs a reason when the engine found the claim likely covered, not when it found it excluded', async () => {
    const user = userEvent.setup();
    const { unmount } = renderActions('in_review', 'covered');
    await user.click(screen.getByRole('button', { name: 'Deny' }));
    expect(screen.getByRole('alert')).toHaveTextContent('The engine found this claim likely covered.');
    expect(reasonField()).toBeInTheDocument();
    unmount();
    renderActions('in_review', 'excluded');
    await user.click(screen.getByRole('button', { name: 'Deny' }));
    expect(reasonField()).not.toBeInTheDocument();
    expect(screen.getByRole('group', { name: 'Reasons from the policy' })).toBeInTheDocument();
  });

  it('offers the field-repair allowance only with the listing caution (PRODUCT.md, Safety)', async () => {
    const user = userEvent.setup();
    renderActions('in_review', 'covered');
    await user.click(screen.getByRole('button', { name: 'Approve' }));
    expect(screen.queryByRole('note')).not.toBeInTheDocument();
    await user.selectOptions(screen.getByRole('combobox', { name: 'Resolution' }), 'repair_allowance');
    expect(screen.getByRole('note')).toHaveTextContent('can void the fixture’s listing and its warranty');
  });
});

describe('taking a claim', () => {
  function renderAssignment(assignee: { id: string; name: string } | null) {
    const wf = workflow('in_review', evaluation('review'));
    wf.claim.assignee = assignee;
    const client = new QueryClient({
      defaultOptions: { queries: { retry: false }, mutations: { retry: false } },
    });
    return render(
      <QueryClientProvider client={client}>
        <Assignment wf={wf} meId="u1" />
      </QueryClientProvider>,
    );
  }
  const group = () => within(screen.getByRole('group', { name: 'Assignment' }));

  it('a claim nobody has can be taken; it sends the claim’s version', async () => {
    const user = userEvent.setup();
    renderAssignment(null);
    expect(group().getByText('Not assigned to anyone yet')).toBeInTheDocument();
    expect(group().queryByRole('button', { name: 'Give back to the queue' })).not.toBeInTheDocument();
    await user.click(group().getByRole('button', { name: 'Assign to me' }));
    expect(sent[0].url).toBe(`/api/claims/${CLAIM_ID}/assign`);
    expect(JSON.parse(String(sent[0].init.body))).toEqual({ assigneeId: 'u1' });
    expect((sent[0].init.headers as Record<string, string>)['If-Match']).toBe('"3"');
  });

  it('one’s own claim can be given back; a colleague’s can be taken over', async () => {
    const user = userEvent.setup();
    const { unmount } = renderAssignment({ id: 'u1', name: 'Rowan' });
    expect(group().getByText('Assigned to you')).toBeInTheDocument();
    expect(group().queryByRole('button', { name: 'Assign to me' })).not.toBeInTheDocument();
    await user.click(group().getByRole('button', { name: 'Give back to the queue' }));
    expect(JSON.parse(String(sent[0].init.body))).toEqual({ assigneeId: null });
    unmount();
    renderAssignment({ id: 'u9', name: 'Sasha' });
    expect(group().getByText('Assigned to Sasha')).toBeInTheDocument();
    expect(group().getByRole('button', { name: 'Assign to me' })).toBeInTheDocument();
  });

  const json = (body: unknown, status = 200) =>
    new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
  const TEAM = [
    { id: 'u1', name: 'Rowan' },
    { id: 'u7', name: 'Noor' },
    { id: 'u9', name: 'Sasha' },
  ];
  const posts = () => sent.filter((s) => s.init?.method === 'POST');

  it('hands the claim to a colleague chosen from the team’s active reviewers, with the claim’s version', async () => {
    const user = userEvent.setup();
    reply = (url) =>
      url === '/api/review/reviewers' ? json({ items: TEAM }) : json({ claim: { id: CLAIM_ID, version: 4 } });
    renderAssignment({ id: 'u9', name: 'Sasha' });
    // The list is asked for only when wanted.
    expect(sent).toHaveLength(0);
    await user.click(group().getByRole('button', { name: 'Hand to a colleague' }));
    const picker = await group().findByRole('combobox', { name: 'Colleague' });
    await group().findByRole('option', { name: 'Noor' });
    expect(sent[0].url).toBe('/api/review/reviewers');
    // Neither oneself (that is "Assign to me") nor whoever has it now.
    expect(
      within(picker)
        .getAllByRole('option')
        .map((o) => o.textContent),
    ).toEqual(['Choose a reviewer', 'Noor']);
    // Nothing chosen: said so, and nothing sent.
    await user.click(group().getByRole('button', { name: 'Hand over' }));
    expect(group().getByText('Choose a colleague to hand the claim to.')).toBeInTheDocument();
    expect(posts()).toHaveLength(0);
    await user.selectOptions(picker, 'Noor');
    await user.click(group().getByRole('button', { name: 'Hand over' }));
    expect(posts()).toHaveLength(1);
    expect(posts()[0].url).toBe(`/api/claims/${CLAIM_ID}/assign`);
    expect(JSON.parse(String(posts()[0].init.body))).toEqual({ assigneeId: 'u7' });
    expect((posts()[0].init.headers as Record<string, string>)['If-Match']).toBe('"3"');
    // Done: the form closes.
    expect(await group().findByRole('button', { name: 'Hand to a colleague' })).toBeInTheDocument();
  });

  it('says plainly when someone changed the claim first (409), and offers to reload it', async () => {
    const user = userEvent.setup();
    const message = 'Someone else moved this claim just now. Reload it to see what changed, then try again.';
    reply = (url) =>
      url === '/api/review/reviewers'
        ? json({ items: TEAM })
        : json({ error: { code: 'claim.changed', message } }, 409);
    renderAssignment(null);
    await user.click(group().getByRole('button', { name: 'Hand to a colleague' }));
    await user.selectOptions(
      await group().findByRole('combobox', { name: 'Colleague' }),
      await group().findByRole('option', { name: 'Sasha' }),
    );
    await user.click(group().getByRole('button', { name: 'Hand over' }));
    expect(await group().findByRole('alert')).toHaveTextContent(message);
    await user.click(group().getByRole('button', { name: 'Reload the claim' }));
    expect(group().queryByRole('alert')).not.toBeInTheDocument();
  });

  it('says when there is nobody else to hand it to, or the team could not be loaded', async () => {
    const user = userEvent.setup();
    reply = () => json({ items: [{ id: 'u1', name: 'Rowan' }] });
    const { unmount } = renderAssignment(null);
    await user.click(group().getByRole('button', { name: 'Hand to a colleague' }));
    expect(await group().findByText('No other active reviewer on your team.')).toBeInTheDocument();
    expect(group().getByRole('button', { name: 'Hand over' })).toBeDisabled();
    unmount();
    reply = () => json({ error: { code: 'internal', message: 'Something went wrong on our side.' } }, 500);
    renderAssignment(null);
    await user.click(group().getByRole('button', { name: 'Hand to a colleague' }));
    expect(
      await group().findByText('The list of reviewers could not be loaded. Try again in a moment.'),
    ).toBeInTheDocument();
  });
});
