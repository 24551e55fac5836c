import type { Role } from '../../../shared/roles';
import type { PublicConfig } from './app-config';

export interface NavItem {
  path: string;
  label: string;
  /** Material Symbols ligature. */
  icon: string;
  section: 'work' | 'admin' | 'you';
}

interface NavEntry extends NavItem {
  /** Roles that may open the page; the matching route guard enforces the same list. */
  roles: readonly Role[];
  /** Shown only while the server runs its fake SMTP server. */
  needsMailFake?: boolean;
}

export const ALL_ROLES: readonly Role[] = ['admin', 'engineer', 'statistician', 'supervisor'];
export const ADMIN_ONLY: readonly Role[] = ['admin'];

const ENTRIES: readonly NavEntry[] = [
  { path: '/studies', label: 'Studies', icon: 'science', section: 'work', roles: ALL_ROLES },
  { path: '/calc/hill48', label: 'Hill calculator', icon: 'calculate', section: 'work', roles: ALL_ROLES },
  { path: '/admin/users', label: 'Users', icon: 'group', section: 'admin', roles: ADMIN_ONLY },
  { path: '/admin/invitations', label: 'Invitations', icon: 'person_add', section: 'admin', roles: ADMIN_ONLY },
  { path: '/admin/outbox', label: 'Mail outbox', icon: 'outbox', section: 'admin', roles: ADMIN_ONLY, needsMailFake: true },
  { path: '/account', label: 'Account', icon: 'manage_accounts', section: 'you', roles: ALL_ROLES },
  { path: '/tokens', label: 'API tokens', icon: 'key', section: 'you', roles: ALL_ROLES },
  { path: '/api-docs', label: 'API reference', icon: 'api', section: 'you', roles: ALL_ROLES },
];

export const SECTION_LABELS: Record<NavItem['section'], string> = {
  work: 'Work',
  admin: 'Administration',
  you: 'You',
};

/** The pages a role may open, in menu order; nothing for a signed-out visitor. */
export function navigationFor(role: Role | null, config: Pick<PublicConfig, 'mailFake'>): NavItem[] {
  if (role === null) return [];
  return ENTRIES.filter((e) => e.roles.includes(role) && (!e.needsMailFake || config.mailFake)).map(
    ({ path, label, icon, section }) => ({ path, label, icon, section }),
  );
}

/** Groups items by section, keeping menu order and dropping empty sections. */
export function groupBySection(items: readonly NavItem[]): { section: NavItem['section']; label: string; items: NavItem[] }[] {
  const order: NavItem['section'][] = ['work', 'admin', 'you'];
  return order
    .map((section) => ({ section, label: SECTION_LABELS[section], items: items.filter((i) => i.section === section) }))
    .filter((g) => g.items.length > 0);
}
