/** Where an invitation stands, derived from its timestamps (the server stores no status column). */
export type InvitationStatus = 'accepted' | 'revoked' | 'expired' | 'pending';

export const INVITATION_STATUS_LABELS: Record<InvitationStatus, string> = {
  accepted: 'Accepted',
  revoked: 'Revoked',
  expired: 'Expired',
  pending: 'Waiting',
};

export function invitationStatus(
  inv: { acceptedAt: string | null; revokedAt: string | null; expiresAt: string },
  now: number,
): InvitationStatus {
  if (inv.acceptedAt) return 'accepted';
  if (inv.revokedAt) return 'revoked';
  if (Date.parse(inv.expiresAt) <= now) return 'expired';
  return 'pending';
}
