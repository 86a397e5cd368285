import { beforeAll, describe, expect, it } from 'vitest';
import { api, signUp, type Session } from '../helpers/api';
import { vanRig } from '../helpers/fixtures';

let owner: Session;

beforeAll(async () => {
  owner = await signUp({ name: 'Cutoff Tester' });
});

describe('POST /api/rigs low-voltage cutoff', () => {
  it('answers 400 naming bank.cutoffVolts for a 48 V cutoff on a 12.8 V bank', async () => {
    const res = await api('/api/rigs', { method: 'POST', session: owner, json: { ...vanRig, bank: { ...vanRig.bank, nominalVolts: 12.8, cutoffVolts: 48 } } });
    expect(res.status).toBe(400);
    const body = await res.json();
    const issue = body.issues.find((i: { path: string }) => i.path === 'bank.cutoffVolts');
    expect(issue?.message).toMatch(/low-voltage cutoff/i);
  });
});
