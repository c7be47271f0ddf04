// Row types for every table, registered with Knex so queries are typed.
import type { Role } from "@/lib/permissions/roles";

export interface DbLabRow {
  id: number;
  slug: string;
  name: string;
  created_at: string;
}

export interface DbUserRow {
  id: number;
  email: string;
  display_name: string;
  password_hash: string;
  failed_sign_ins: number;
  locked_until: string | null;
  disabled: boolean | number;
  created_at: string;
  /** Bumped by sign-out, deactivation and role changes: tokens issued under an older version no longer count. */
  session_version: number;
}

export interface DbMembershipRow {
  id: number;
  user_id: number;
  lab_id: number;
  role: Role;
  created_at: string;
}

export interface DbAuditEventRow {
  id: number;
  lab_id: number | null;
  actor_user_id: number | null;
  actor_label: string | null;
  at: string;
  action: string;
  object_type: string | null;
  object_id: string | null;
  object_version: number | null;
  old_values: string | null;
  new_values: string | null;
  reason: string | null;
  prev_hash: string | null;
  hash: string;
  /** HMAC-SHA-256 of `hash` under the server's audit key (null on rows written before the key was introduced). */
  mac: string | null;
}

export interface DbAuditHeadRow {
  id: number;
  row_count: number;
  head_id: number | null;
  head_hash: string | null;
  mac: string | null;
  updated_at: string;
}

export interface DbRawFileRow {
  id: number;
  lab_id: number;
  sha256: string;
  name: string;
  size: number;
  /** Empty when the bytes are held in the object store (stored_in "object-store"). */
  bytes: Buffer;
  stored_in: "database" | "object-store";
  uploaded_by: number | null;
  uploaded_at: string;
}

export interface DbRunRow {
  id: number;
  lab_id: number;
  raw_file_id: number;
  name: string;
  parser: string;
  study: string | null;
  wavelength_nm: number | null;
  path_length_cm: number | null;
  temperature_c: number | null;
  cell: string | null;
  operator: string | null;
  sample: string | null;
  method: string | null;
  dilution_factor: number | null;
  method_record_id: number | null;
  metadata: string;
  warnings: string;
  created_by: number | null;
  created_at: string;
}

export interface DbSeriesRow {
  id: number;
  run_id: number;
  lab_id: number;
  position: number;
  name: string;
  source_column: string;
  quantity: string;
  unit: string;
  point_count: number;
  t_f64: Buffer;
  y_f64: Buffer;
  skipped_lines: string;
  processing: string;
  t_min: number | null;
  t_max: number | null;
}

export interface DbFitRow {
  id: number;
  lab_id: number;
  run_id: number;
  series_id: number;
  record_id: number | null;
  version: number;
  previous_id: number | null;
  title: string;
  primary_model: string;
  k_value: number | null;
  k_se: number | null;
  criteria_failed: number | null;
  options: string;
  results: string;
  engine_version: string;
  data_sha256: string;
  content_hash: string;
  reason: string | null;
  author_id: number | null;
  created_at: string;
}

export interface DbStudyRow {
  id: number;
  lab_id: number;
  record_id: number | null;
  version: number;
  previous_id: number | null;
  name: string;
  kind: string;
  members: string;
  options: string;
  results: string;
  engine_version: string;
  content_hash: string;
  reason: string | null;
  author_id: number | null;
  created_at: string;
}

export interface DbSignatureRow {
  id: number;
  lab_id: number;
  object_type: string;
  object_id: number;
  user_id: number;
  printed_name: string;
  meaning: "authored" | "reviewed" | "approved";
  content_hash: string;
  signed_at: string;
}

export interface DbReviewEventRow {
  id: number;
  lab_id: number;
  object_type: string;
  object_id: number;
  state: "submitted" | "approved" | "rejected" | "withdrawn";
  actor_id: number;
  signature_id: number | null;
  reason: string | null;
  at: string;
}

export interface DbCommentRow {
  id: number;
  lab_id: number;
  object_type: string;
  object_id: number;
  parent_id: number | null;
  author_id: number;
  body: string;
  created_at: string;
}

export interface DbShareLinkRow {
  id: number;
  lab_id: number;
  token_sha256: string;
  object_type: string;
  object_id: number;
  recipient: string | null;
  expires_at: string;
  revoked_at: string | null;
  revoked_by: number | null;
  created_by: number;
  created_at: string;
}

export interface DbShareViewRow {
  id: number;
  share_link_id: number;
  viewer_id: number;
  viewed_at: string;
}

export interface DbValidationRunRow {
  id: number;
  lab_id: number;
  report: string;
  all_passed: boolean | number;
  passed: number;
  failed: number;
  engine_version: string;
  content_hash: string;
  run_by: number;
  run_at: string;
}

export interface DbCalibrationRow {
  id: number;
  lab_id: number;
  name: string;
  analyte: string;
  concentration_unit: string;
  wavelength_nm: number | null;
  standards: string;
  options: string;
  results: string;
  slope: number;
  lod: number;
  loq: number;
  engine_version: string;
  content_hash: string;
  author_id: number;
  created_at: string;
}

export interface DbMethodRow {
  id: number;
  lab_id: number;
  record_id: number | null;
  version: number;
  previous_id: number | null;
  name: string;
  analyte: string;
  definition: string;
  calibration_id: number | null;
  content_hash: string;
  reason: string | null;
  author_id: number;
  created_at: string;
}

export interface DbLabSettingsRow {
  lab_id: number;
  outside_links: boolean | number;
  default_link_days: number;
  upload_limit_mb: number;
  password_min_length: number;
  updated_at: string;
}

export interface DbInvitationRow {
  id: number;
  lab_id: number;
  email: string;
  display_name: string;
  role: Role;
  token_hash: string;
  expires_at: string;
  accepted_at: string | null;
  revoked_at: string | null;
  user_id: number | null;
  invited_by: number;
  created_at: string;
}

export interface DbSetupTokenRow {
  id: number;
  token_sha256: string;
  created_at: string;
  expires_at: string;
  used_at: string | null;
}

export interface DbApiKeyRow {
  id: number;
  lab_id: number;
  name: string;
  prefix: string;
  key_hash: string;
  created_by: number;
  created_at: string;
  last_used_at: string | null;
  revoked_at: string | null;
}

export interface DbJobRow {
  id: number;
  lab_id: number;
  kind: string;
  state: "queued" | "running" | "done" | "failed";
  progress_done: number;
  progress_total: number;
  progress_note: string | null;
  result: string | null;
  error: string | null;
  created_by: number | null;
  created_at: string;
  started_at: string | null;
  finished_at: string | null;
}

declare module "knex/types/tables" {
  interface Tables {
    labs: DbLabRow;
    users: DbUserRow;
    memberships: DbMembershipRow;
    audit_events: DbAuditEventRow;
    raw_files: DbRawFileRow;
    runs: DbRunRow;
    series: DbSeriesRow;
    fits: DbFitRow;
    studies: DbStudyRow;
    signatures: DbSignatureRow;
    review_events: DbReviewEventRow;
    comments: DbCommentRow;
    share_links: DbShareLinkRow;
    share_views: DbShareViewRow;
    validation_runs: DbValidationRunRow;
    calibrations: DbCalibrationRow;
    methods: DbMethodRow;
    lab_settings: DbLabSettingsRow;
    invitations: DbInvitationRow;
    api_keys: DbApiKeyRow;
    setup_tokens: DbSetupTokenRow;
    jobs: DbJobRow;
  }
}
