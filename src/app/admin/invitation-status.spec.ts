import { describe, expect, it } from 'vitest';
import { invitationStatus } from './invitation-status';

// Invitation life cycle from issue 2: single-use (accepted), revocable, expiring tokens.
describe('invitationStatus', () => {
  const now = Date.parse('2026-03-10T12:00:00Z');
  const base = { acceptedAt: null, revokedAt: null, expiresAt: '2026-03-11T12:00:00Z' };

  it('is waiting before expiry', () => expect(invitationStatus(base, now)).toBe('pending'));
  it('is expired at and after the expiry instant', () => {
    expect(invitationStatus({ ...base, expiresAt: '2026-03-10T12:00:00Z' }, now)).toBe('expired');
  });
  it('stays accepted after expiry', () => {
    expect(invitationStatus({ ...base, acceptedAt: '2026-03-09T08:00:00Z', expiresAt: '2026-03-01T00:00:00Z' }, now)).toBe('accepted');
  });
  it('is revoked when revoked before acceptance', () => {
    expect(invitationStatus({ ...base, revokedAt: '2026-03-09T08:00:00Z' }, now)).toBe('revoked');
  });
});
