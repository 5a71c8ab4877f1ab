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
  /** Read designs, their revisions, spectra and cut plans, and the materials. */
  viewDesigns: boolean;
  /** Save design revisions, import designs, create and change shop materials. */
  editDesigns: boolean;
};
export type Capability = keyof Capabilities;

/** The one map from role to what it may do. */
export const capabilities: Record<Role, Capabilities> = {
  operator: { viewRuns: true, manageUsers: false, viewAuditLog: false, viewMailSink: false, changeOwnPassword: true, viewDesigns: true, editDesigns: false },
  engineer: { viewRuns: true, manageUsers: false, viewAuditLog: false, viewMailSink: false, changeOwnPassword: true, viewDesigns: true, editDesigns: true },
  supervisor: { viewRuns: true, manageUsers: false, viewAuditLog: true, viewMailSink: false, changeOwnPassword: true, viewDesigns: true, editDesigns: false },
  admin: { viewRuns: true, manageUsers: true, viewAuditLog: true, viewMailSink: true, changeOwnPassword: true, viewDesigns: true, editDesigns: true },
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
