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
  /** Upload run traces (the upload page, POST /api/runs). */
  uploadRuns: boolean;
  /** Queue a new analysis of a run with other settings. */
  reanalyseRuns: boolean;
  /** Create and revoke chamber tokens. */
  manageChamberTokens: boolean;
};
export type Capability = keyof Capabilities;

/** The one map from role to what it may do. */
export const capabilities: Record<Role, Capabilities> = {
  operator: { viewRuns: true, manageUsers: false, viewAuditLog: false, viewMailSink: false, changeOwnPassword: true, uploadRuns: true, reanalyseRuns: false, manageChamberTokens: false },
  engineer: { viewRuns: true, manageUsers: false, viewAuditLog: false, viewMailSink: false, changeOwnPassword: true, uploadRuns: true, reanalyseRuns: true, manageChamberTokens: false },
  supervisor: { viewRuns: true, manageUsers: false, viewAuditLog: true, viewMailSink: false, changeOwnPassword: true, uploadRuns: true, reanalyseRuns: false, manageChamberTokens: false },
  admin: { viewRuns: true, manageUsers: true, viewAuditLog: true, viewMailSink: true, changeOwnPassword: true, uploadRuns: true, reanalyseRuns: true, manageChamberTokens: true },
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
