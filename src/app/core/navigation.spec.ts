import { describe, expect, it } from 'vitest';
import { groupBySection, navigationFor } from './navigation';

// Expected menus come from the foundation issue (issue 2) and the client brief: studies and account for
// every signed-in role (with the API tokens and API reference pages of issue 6); users, invitations and the mail outbox (only while the fake SMTP runs) for admin only.
describe('navigationFor', () => {
  const paths = (role: Parameters<typeof navigationFor>[0], mailFake = true) => navigationFor(role, { mailFake }).map((i) => i.path);

  it('gives an administrator studies, the admin pages and the account', () => {
    expect(paths('admin')).toEqual(['/studies', '/calc/hill48', '/admin/users', '/admin/invitations', '/admin/outbox', '/account', '/tokens', '/api-docs']);
  });

  it.each(['engineer', 'statistician', 'supervisor'] as const)('gives %s no admin pages', (role) => {
    expect(paths(role)).toEqual(['/studies', '/calc/hill48', '/account', '/tokens', '/api-docs']);
  });

  it('hides the mail outbox when mail goes to a real SMTP server', () => {
    expect(paths('admin', false)).toEqual(['/studies', '/calc/hill48', '/admin/users', '/admin/invitations', '/account', '/tokens', '/api-docs']);
  });

  it('shows nothing to a signed-out visitor', () => {
    expect(paths(null)).toEqual([]);
  });

  it('groups items by section in menu order and drops empty sections', () => {
    const engineer = groupBySection(navigationFor('engineer', { mailFake: true }));
    expect(engineer.map((g) => g.label)).toEqual(['Work', 'You']);
    const admin = groupBySection(navigationFor('admin', { mailFake: true }));
    expect(admin.map((g) => [g.label, g.items.length])).toEqual([
      ['Work', 2],
      ['Administration', 3],
      ['You', 3],
    ]);
  });
});
