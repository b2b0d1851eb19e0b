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

export interface PasswordCredentialTable {
  user_id: string;
  hash: string;
  updated_at: Generated<Date>;
}

export type AccountTokenPurpose = 'confirm_email' | 'reset_password';

export interface AccountTokenTable {
  token_hash: string;
  user_id: string;
  purpose: AccountTokenPurpose;
  expires_at: Date;
  used_at: Date | null;
  created_at: Generated<Date>;
}

export interface SignInFailureTable {
  id: Generated<string>;
  key: string;
  at: Generated<Date>;
}

/** A creating request's `Idempotency-Key`, what the request was, and the answer it got. */
export interface IdempotencyKeyTable {
  user_id: string;
  key: string;
  fingerprint: string;
  created_at: Generated<Date>;
  lease_until: Date;
  committed: Generated<boolean>;
  status: number | null;
  headers: ColumnType<Record<string, string> | null, string | null, string | null>;
  body: Buffer | null;
}

/** Mail-sending requests per client address and messages per recipient, for the mail limits. */
export interface MailRequestTable {
  id: Generated<string>;
  key: string;
  at: Generated<Date>;
}

export interface ApiTokenTable {
  id: Generated<string>;
  user_id: string;
  name: string;
  token_hash: string;
  prefix: string;
  scopes: ColumnType<string[], string[], string[]>;
  created_at: Generated<Date>;
  expires_at: Date;
  last_used_at: Date | null;
  revoked_at: Date | null;
}

// ---- window records (issue 5) ----

type Json<T = unknown> = ColumnType<T, string, string>;

export type VocabularyKind =
  | 'solvent'
  | 'salt'
  | 'additive'
  | 'electrode-material'
  | 'reference-electrode'
  | 'separator';

export interface VocabularyTermTable {
  id: string;
  kind: VocabularyKind;
  name: string;
  abbreviations: ColumnType<string[], string[] | undefined, string[]>;
  synonyms: ColumnType<string[], string[] | undefined, string[]>;
  lookup_keys: ColumnType<string[], string[] | undefined, string[]>;
  formula: string | null;
  smiles: string | null;
  inchikey: string | null;
  scale: string | null;
  // numeric: text out, numbers in
  potential_vs_she_v: ColumnType<string | null, number | null | undefined, number | null>;
  temp_coefficient_mv_per_k: ColumnType<string | null, number | null | undefined, number | null>;
  potential_source: string | null;
  merged_into: string | null;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
}

export interface RecordTable {
  id: Generated<string>;
  handle: Generated<string>;
  status: Generated<string>;
  owner_id: string;
  lab_id: string | null;
  current_version: number;
  created_at: Generated<Date>;
  updated_at: Generated<Date>;
  published_at: Date | null;
  /** The version readers see: the one a curator last published (null until then). */
  published_version: number | null;
  /** The embargo date the background job lifted (with a mail to the lab), if any. */
  embargo_lifted_for: ColumnType<string | null, string | null, string | null>;
}

/**
 * One row per record (kept by triggers): its head and the filter and sort columns of its public
 * face, the published version once there is one (with the status a reader sees), else the
 * current version.
 */
export interface RecordSearchTable {
  record_id: string;
  handle: string;
  status: string;
  owner_id: string;
  lab_id: string | null;
  updated_at: Date;
  version: number;
  visibility: string;
  embargo_until: string | null;
  embargo_lifted: Generated<boolean>;
  component_ids: string[];
  solvent_ids: string[];
  salt_ids: string[];
  additive_ids: string[];
  salt_concentration: number | null;
  salt_basis: string | null;
  we_material_id: string;
  method: string;
  criterion_kind: string | null;
  scan_rate_mv_s: number | null;
  temperature_c: number | null;
  cell_type: string;
  evidence_level: string;
  raw_backed: boolean;
  search: unknown;
  anodic_key: number | null;
  cathodic_key: number | null;
  width_key: number | null;
}

/** Moves on every committed change to record_search or labs (bigint: text out). */
export interface SearchGenerationTable {
  id: Generated<boolean>;
  n: ColumnType<string, number, number>;
  xact: ColumnType<string, number, number>;
}

export interface RecordVersionTable {
  id: Generated<string>;
  record_id: string;
  version: number;
  content: Json<Record<string, unknown>>;
  change_note: string | null;
  author_id: string;
  created_at: Generated<Date>;
  raw_file_ids: ColumnType<string[], string[] | undefined, never>;
  analysis_ids: ColumnType<string[], string[] | undefined, never>;
  title: string | null;
  component_ids: ColumnType<string[], string[] | undefined, never>;
  solvent_ids: ColumnType<string[], string[] | undefined, never>;
  salt_ids: ColumnType<string[], string[] | undefined, never>;
  additive_ids: ColumnType<string[], string[] | undefined, never>;
  salt_concentration: number | null;
  salt_basis: string | null;
  water_content_ppm: number | null;
  ph: number | null;
  temperature_c: number | null;
  we_material_id: string;
  we_form: string | null;
  area_cm2: number | null;
  mass_mg: number | null;
  counter_material_id: string | null;
  reference_id: string | null;
  cell_type: string;
  method: string;
  scan_rate_mv_s: number | null;
  step_mv: number | null;
  hold_time_s: number | null;
  criterion_kind: string | null;
  criterion_threshold: number | null;
  criterion_per: string | null;
  reported_cathodic_v: number | null;
  reported_cathodic_ref: string | null;
  reported_anodic_v: number | null;
  reported_anodic_ref: string | null;
  cathodic_she_v: number | null;
  cathodic_offset_v: number | null;
  anodic_she_v: number | null;
  anodic_offset_v: number | null;
  she_approximate: Generated<boolean>;
  computed_cathodic_v: number | null;
  computed_anodic_v: number | null;
  computed_cathodic_she_v: number | null;
  computed_anodic_she_v: number | null;
  /** Bounds on the known error terms of each conversion to SHE (V); NULL where none was made. */
  cathodic_she_uncertainty_v: number | null;
  anodic_she_uncertainty_v: number | null;
  computed_she_uncertainty_v: number | null;
  /** Flags of the conversions used (engine ConversionFlag); NULL on versions written before they were judged. */
  she_flags: string[] | null;
  evidence_level: string;
  source_kind: string | null;
  source_doi: string | null;
  source_year: number | null;
  licence: string;
  visibility: string;
  embargo_until: ColumnType<Date | null, string | null, never>;
  search: ColumnType<string, unknown, never>;
}

export interface RawFileTable {
  id: Generated<string>;
  record_id: string;
  object_key: string;
  original_name: string;
  safe_name: string;
  bytes: ColumnType<string, number, never>;
  sha256: string;
  media_type: string;
  mapping: Json<Record<string, unknown>>;
  parse_summary: Json<Record<string, unknown>>;
  uploaded_by: string;
  created_at: Generated<Date>;
}

export interface RawFileCurveTable {
  raw_file_id: string;
  samples: number;
  potential: Buffer;
  current: Buffer;
  created_at: Generated<Date>;
  /** From every sample of the file; all null on a copy kept before they were (filled when next served). */
  potential_min_v: number | null;
  potential_max_v: number | null;
  capacitive_current_a: number | null;
  capacitive_refusal: string | null;
}

export interface AnalysisTable {
  id: Generated<string>;
  raw_file_id: string;
  engine_version: string;
  parameters: Json<Record<string, unknown>>;
  result: Json<Record<string, unknown>>;
  direction: 'anodic' | 'cathodic';
  limit_v: number | null;
  limit_status: string;
  created_at: Generated<Date>;
}

export type UploadStatus = 'pending' | 'complete' | 'failed' | 'expired';

export interface UploadTable {
  id: string;
  record_id: string;
  owner_id: string;
  object_key: string;
  declared_name: string;
  declared_size: ColumnType<string, number, never>;
  declared_sha256: string;
  media_type: string;
  mapping: Json<Record<string, unknown>>;
  status: Generated<UploadStatus>;
  raw_file_id: string | null;
  error: Json<Record<string, unknown> | null> | null;
  created_at: Generated<Date>;
  expires_at: Date;
  completed_at: Date | null;
}

export interface ReviewTable {
  id: Generated<string>;
  record_id: string;
  version: number;
  reviewer_id: string;
  decision: string;
  reason: string | null;
  created_at: Generated<Date>;
}

export interface FlagTable {
  id: Generated<string>;
  record_id: string;
  version: number;
  reporter_id: string;
  reason: string;
  status: Generated<'open' | 'resolved'>;
  resolved_by: string | null;
  resolved_at: Date | null;
  created_at: Generated<Date>;
}

export interface MailOutboxTable {
  id: Generated<string>;
  kind: string;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string | null;
  /** A signed stop link, sent as the List-Unsubscribe header (one-click, RFC 8058). */
  unsubscribe_url: string | null;
  status: Generated<'queued' | 'sending' | 'sent' | 'failed'>;
  attempts: Generated<number>;
  last_error: string | null;
  next_attempt_at: Generated<Date>;
  created_at: Generated<Date>;
  sent_at: Date | null;
}

// ---- curation (issue 9) ----

export interface ReviewClaimTable {
  record_id: string;
  curator_id: string;
  claimed_at: Generated<Date>;
  expires_at: Date;
}

export interface ReviewCommentTable {
  id: Generated<string>;
  review_id: string;
  position: number;
  path: string;
  message: string;
  created_at: Generated<Date>;
}

export type ProposalStatus = 'proposed' | 'accepted' | 'rejected';

export interface VocabularyProposalTable {
  id: Generated<string>;
  kind: VocabularyKind;
  name: string;
  abbreviations: ColumnType<string[], string[] | undefined, string[]>;
  synonyms: ColumnType<string[], string[] | undefined, string[]>;
  formula: string | null;
  note: string | null;
  proposer_id: string;
  status: Generated<ProposalStatus>;
  term_id: string | null;
  decided_by: string | null;
  decided_at: Date | null;
  decision_reason: string | null;
  created_at: Generated<Date>;
}

export interface ReferenceValueTable {
  id: Generated<string>;
  term_id: string;
  // numeric: text out, numbers in
  potential_vs_she_v: ColumnType<string, number, never>;
  temp_coefficient_mv_per_k: ColumnType<string | null, number | null, never>;
  source: string;
  note: string | null;
  changed_by: string | null;
  valid_from: ColumnType<Date, Date | undefined, never>;
}

export interface SelectionTable {
  id: Generated<string>;
  handle: Generated<string>;
  title: string;
  description: string | null;
  creator_id: string;
  creator_name: string;
  query: ColumnType<unknown, string, never>;
  criterion: string | null;
  scale: string;
  created_at: Generated<Date>;
}

export interface SelectionItemTable {
  selection_id: string;
  position: number;
  record_id: string;
  version: number;
  snapshot: ColumnType<unknown, string, never>;
}

export interface RecordEventTable {
  id: Generated<string>;
  record_id: string;
  handle: string;
  version: number;
  kind: 'published' | 'new-version' | 'flagged' | 'withdrawn';
  at: Generated<Date>;
}

export interface WatchTable {
  id: Generated<string>;
  user_id: string;
  name: string;
  query: string;
  created_at: Generated<Date>;
  mailed_through: ColumnType<string, string | undefined, string>;
  seen_through: ColumnType<string, string | undefined, string>;
  last_mailed_at: Date | null;
  unsubscribed_at: Date | null;
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
  password_credentials: PasswordCredentialTable;
  account_tokens: AccountTokenTable;
  sign_in_failures: SignInFailureTable;
  mail_requests: MailRequestTable;
  idempotency_keys: IdempotencyKeyTable;
  api_tokens: ApiTokenTable;
  vocabulary_terms: VocabularyTermTable;
  records: RecordTable;
  record_versions: RecordVersionTable;
  record_search: RecordSearchTable;
  search_generation: SearchGenerationTable;
  raw_files: RawFileTable;
  raw_file_curves: RawFileCurveTable;
  analyses: AnalysisTable;
  uploads: UploadTable;
  reviews: ReviewTable;
  flags: FlagTable;
  mail_outbox: MailOutboxTable;
  selections: SelectionTable;
  selection_items: SelectionItemTable;
  record_events: RecordEventTable;
  watches: WatchTable;
  review_claims: ReviewClaimTable;
  review_comments: ReviewCommentTable;
  vocabulary_proposals: VocabularyProposalTable;
  reference_values: ReferenceValueTable;
}

export type UserRow = Selectable<UserTable>;
export type NewUser = Insertable<UserTable>;
export type UserUpdate = Updateable<UserTable>;
export type AuditEventRow = Selectable<AuditEventTable>;
export type NewAuditEvent = Insertable<AuditEventTable>;
export type LabRow = Selectable<LabTable>;
export type LabMembershipRow = Selectable<LabMembershipTable>;
