import { can, type Capability, type Role } from './capabilities';

type Entry = { href: string; label: string; needs?: Capability };

// Later areas (designs, materials, comparison) are added here when they exist.
const entries: Entry[] = [
  { href: '/', label: 'Overview' },
  { href: '/runs', label: 'Runs', needs: 'viewRuns' },
  { href: '/runs/upload', label: 'Upload', needs: 'uploadRuns' },
  { href: '/designs', label: 'Designs', needs: 'viewDesigns' },
  { href: '/materials', label: 'Materials', needs: 'viewDesigns' },
  { href: '/compare', label: 'Compare', needs: 'compareRuns' },
  { href: '/audit', label: 'Audit log', needs: 'viewAuditLog' },
  { href: '/admin/users', label: 'Users', needs: 'manageUsers' },
  { href: '/admin/mail', label: 'Mail', needs: 'viewMailSink' },
  { href: '/admin/chamber-tokens', label: 'Chamber tokens', needs: 'manageChamberTokens' },
  { href: '/account', label: 'Account', needs: 'changeOwnPassword' },
];

export function navigationFor(role: Role): { href: string; label: string }[] {
  return entries.filter((e) => !e.needs || can(role, e.needs)).map(({ href, label }) => ({ href, label }));
}
