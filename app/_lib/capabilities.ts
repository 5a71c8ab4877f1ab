import type { Role } from '@/db/schema';

export type { Role };

export type Capabilities = {
  /** Read runs, their traces' facts and their analyses. */
  viewRuns: boolean;
  /** Invite users, change roles, deactivate and reactivate. */
  manageUsers: boolean;
  /** Read the audit log. */
  viewAuditLog: boolean;
  /** Read the messages the local mail sink caught. */
  viewMailSink: boolean;
  /** Change one's own password. */
  changeOwnPassword: boolean;
  /** Read the database's version, latency and migrations from /api/health. */
  viewSystemHealth: boolean;
  /** Compare runs across shifts and chambers: layer statistics, group tests, control charts, CSV export. */
  compareRuns: boolean;
  /** Receive e-mail when an analysis finds a layer out of tolerance or a control-chart rule fires (opt-in on the account page). */
  receiveToleranceAlerts: boolean;
  /** Pin annotations to a run and write in its comment thread (and edit or delete one's own). */
  writeRunNotes: boolean;
  /** Decide a run's disposition, with a reason. */
  setRunDisposition: boolean;
  /** Read designs, their revisions, spectra and cut plans, and the materials. */
  viewDesigns: boolean;
  /** Save design revisions, import designs, create and change shop materials. */
  editDesigns: boolean;
  /** Upload run traces (the upload page, POST /api/runs). */
  uploadRuns: boolean;
  /** Queue a new analysis of a run with other settings. */
  reanalyseRuns: boolean;
  /** Create and revoke chamber tokens. */
  manageChamberTokens: boolean;
};
export type Capability = keyof Capabilities;

const everyone = ['operator', 'engineer', 'supervisor', 'admin'] as const satisfies readonly Role[];

/** Who holds each capability: one line each, so a new capability is one added line. */
const holders: Record<Capability, readonly Role[]> = {
  viewRuns: everyone,
  manageUsers: ['admin'],
  viewAuditLog: ['supervisor', 'admin'],
  viewMailSink: ['admin'],
  changeOwnPassword: everyone,
  viewSystemHealth: ['admin'],
  compareRuns: everyone,
  receiveToleranceAlerts: ['engineer', 'supervisor'],
  writeRunNotes: ['operator', 'engineer', 'supervisor'],
  setRunDisposition: ['engineer', 'supervisor'],
  viewDesigns: everyone,
  editDesigns: ['engineer', 'admin'],
  uploadRuns: everyone,
  reanalyseRuns: ['engineer', 'admin'],
  manageChamberTokens: ['admin'],
};

function grantsOf(role: Role): Capabilities {
  return Object.fromEntries(Object.entries(holders).map(([c, roles]) => [c, roles.includes(role)])) as Capabilities;
}

/** The one map from role to what it may do. */
export const capabilities: Record<Role, Capabilities> = {
  operator: grantsOf('operator'),
  engineer: grantsOf('engineer'),
  supervisor: grantsOf('supervisor'),
  admin: grantsOf('admin'),
};

export function can(role: Role, capability: Capability): boolean {
  return capabilities[role][capability];
}

export const roleLabels: Record<Role, string> = {
  operator: 'Chamber operator',
  engineer: 'Process engineer',
  supervisor: 'Supervisor',
  admin: 'Administrator',
};
