import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';

// One interface for the whole database. Rows are snake_case except the Auth.js tables, whose
// names and camelCase columns the adapter fixes.

export type Role = 'reader' | 'contributor' | 'curator' | 'admin';

export interface UserTable {
  id: Generated<string>;
  name: string | null;
  email: string;
  emailVerified: Date | null;
  image: string | null;
  role: Generated<Role>;
  affiliation: string | null;
  orcid: string | null;
  session_version: Generated<number>;
  disabled_at: Date | null;
  created_at: Generated<Date>;
}

export interface AccountTable {
  id: Generated<string>;
  userId: string;
  type: string;
  provider: string;
  providerAccountId: string;
  refresh_token: string | null;
  access_token: string | null;
  expires_at: ColumnType<string | null, number | null, number | null>;
  token_type: string | null;
  scope: string | null;
  id_token: string | null;
  session_state: string | null;
}

export interface SessionTable {
  id: Generated<string>;
  userId: string;
  sessionToken: string;
  expires: Date;
}

export interface VerificationTokenTable {
  identifier: string;
  token: string;
  expires: Date;
}

export interface AuditEventTable {
  id: Generated<string>;
  at: Generated<Date>;
  actor_id: string | null;
  action: string;
  subject_type: string;
  subject_id: string;
  details: ColumnType<Record<string, unknown>, string | undefined, never>;
}

export interface LabTable {
  id: Generated<string>;
  slug: string;
  name: string;
  created_at: Generated<Date>;
}

export type LabRole = 'member' | 'manager';

export interface LabMembershipTable {
  lab_id: string;
  user_id: string;
  role: Generated<LabRole>;
  created_at: Generated<Date>;
}

export interface AppendOnlyTablesTable {
  table_name: string;
}

export interface Database {
  User: UserTable;
  Account: AccountTable;
  Session: SessionTable;
  VerificationToken: VerificationTokenTable;
  audit_events: AuditEventTable;
  append_only_tables: AppendOnlyTablesTable;
  labs: LabTable;
  lab_memberships: LabMembershipTable;
}

export type UserRow = Selectable<UserTable>;
export type NewUser = Insertable<UserTable>;
export type UserUpdate = Updateable<UserTable>;
export type AuditEventRow = Selectable<AuditEventTable>;
export type NewAuditEvent = Insertable<AuditEventTable>;
export type LabRow = Selectable<LabTable>;
export type LabMembershipRow = Selectable<LabMembershipTable>;
