import type { DecisionMethod, EvidenceKind, LineAnswer, LineKind, RequestStatus, SafetyCategory } from "@/lib/approvals";
import type { PartStatus, SpecKind } from "@/lib/bench";
import type { ContactPreference } from "@/lib/customers";
import type { Frequency, SubscriberRole } from "@/lib/following";
import type { InvoiceStatus, PaymentKind, PaymentMethod } from "@/lib/invoices";
import type { JobStatus } from "@/lib/job-status";
import type { ClipStatus, EntryVisibility } from "@/lib/journal";
import type { MachineKind } from "@/lib/machine";
import type { StaffRole } from "@/lib/permissions";
import type { ConsentDecision, StoryItemKind, StoryStatus } from "@/lib/portfolio";
import type { ReadingVerdict } from "@/lib/readings";
import type { ConsentHow, NotifyChannels, OptOutHow, TextDelivery, TextFiled } from "@/lib/texts";
import type { TorqueUnit } from "@/lib/torque";

// Every table's row, once, as db/migrations defines it and as mysql2 hands it back with the
// settings of db/config.ts. Registered with Knex below (its documented way), so `k("jobs")` knows
// its columns: reads are typed and a write with a wrong column name or type doesn't compile.
// Joined queries ("jobs as j") are typed by picking from these rows (see db/queries/*.ts).
//
// How columns come back: INT and BIGINT → number (supportBigNumbers: an id past 2^53 would be a
// string; none is); DECIMAL → number (decimalNumbers; exact text needs CAST … AS CHAR); DATE →
// "YYYY-MM-DD" string (typeCast); TIMESTAMP → Date; BOOLEAN (TINYINT(1)) → 0 or 1, written as
// true/false; JSON (LONGTEXT in MariaDB) → the JSON text, written as JSON.stringify(…).

/** TINYINT(1): reads back 0 or 1; written as a boolean. */
export type Flag = 0 | 1 | boolean;
/** A JSON column's text (MariaDB stores JSON as LONGTEXT). */
export type JsonText = string;
/** DATE, as "YYYY-MM-DD". */
export type DateText = string;
/** A left-joined table's columns: all null when no row matched. */
export type Nullable<T> = { [K in keyof T]: T[K] | null };

// ---- shops, people, jobs (migrations 01–03, 11, 13) ------------------------------------------

export type ShopsTable = {
  id: number;
  slug: string;
  name: string;
  email: string | null;
  phone: string | null;
  timezone: string;
  currency: string;
  next_job_number: number;
  next_invoice_number: number;
  digest_window_minutes: number;
  clip_max_seconds: number;
  clip_max_bytes: number;
  owner_wait_days: number;
  /** 16: postal address and opening hours (JSON text, lib/shop-settings.ts OpeningHours). */
  address: string | null;
  opening_hours: JsonText | null;
  /** 34: the shop's own text sender (E.164; null: SMS_DEFAULT_FROM) and quiet hours in minutes after midnight, shop time. */
  sms_from: string | null;
  sms_quiet_start: number;
  sms_quiet_end: number;
  /** 37: the languages the shop texts in (SET text, "en" or "en,es,fr"; English always; lib/texts.ts shopLanguages). */
  sms_languages: string;
  created_at: Date;
};

export type UsersTable = { id: number; email: string; name: string; password_hash: string | null; created_at: Date; last_sign_in_at: Date | null };

/** `deactivated_at` set: taken off the staff, history kept (13). */
export type MembershipsTable = { id: number; shop_id: number; user_id: number; role: StaffRole; created_at: Date; deactivated_at: Date | null };

export type CustomersTable = {
  id: number;
  shop_id: number;
  user_id: number | null;
  name: string;
  email: string | null;
  phone: string | null;
  /** How they like to be reached (migration 18); null until someone asks. */
  contact_preference: ContactPreference | null;
  /** 34: the owner's choice for notices, and their text consent as it stands (lib/texts.ts). */
  notify_channels: NotifyChannels;
  text_consent_phone: string | null;
  text_consent_at: Date | null;
  text_consent_how: ConsentHow | null;
  text_opt_out_at: Date | null;
  text_opt_out_how: OptOutHow | null;
  created_at: Date;
};

/** A duplicate folded into the record kept (migration 18): the removed row's content and what moved. */
export type CustomerMergesTable = {
  id: number;
  shop_id: number;
  kept_customer_id: number;
  removed_customer_id: number;
  removed: JsonText;
  moved: JsonText;
  merged_by_user_id: number | null;
  merged_at: Date;
};

export type MachinesTable = {
  id: number;
  shop_id: number;
  customer_id: number;
  kind: MachineKind;
  year: number | null;
  make: string;
  model: string;
  engine_cc: number | null;
  serial: string | null;
  hours: number | null;
  odometer: number | null;
  odometer_unit: "km" | "mi" | null;
  created_at: Date;
};

export type JobsTable = {
  id: number;
  shop_id: number;
  number: number;
  public_id: string;
  customer_id: number;
  machine_id: number;
  status: JobStatus;
  concern: string;
  intake_notes: string | null;
  promised_on: DateText | null;
  technician_user_id: number | null;
  created_by_user_id: number | null;
  created_at: Date;
  updated_at: Date;
  /** The owner's name, copied by triggers from customers for the board's sort and search (21); never written by the app. */
  customer_name?: string;
  /** Copies of the machine's make, model and serial ('' when it has none), kept by triggers (39) for the board's search; never written. */
  machine_make?: string;
  machine_model?: string;
  machine_serial?: string;
  /** STORED generated (21): 1 when promised_on is null, for the board's "undated last" order; never written. */
  promised_undated?: Flag;
};

/** How many of a shop's jobs are in each status; kept by triggers on jobs (migration 29), never written by the app. */
export type JobStatusCountsTable = { shop_id: number; status: JobStatus; n: number };

/** How many of a shop's jobs each technician has in each status; kept by triggers on jobs (migration 40), never written by the app. */
export type JobTechnicianCountsTable = { shop_id: number; technician_user_id: number; status: JobStatus; n: number };

export type JobStatusChangesTable = {
  id: number;
  shop_id: number;
  job_id: number;
  from_status: JobStatus | null;
  to_status: JobStatus;
  changed_by_user_id: number | null;
  note: string | null;
  /** The event that moved the job (lib/job-workflow.ts), or "manual". */
  cause: string;
  changed_at: Date;
};

/** `next_path` (34): where the link leads once used (a text's short link to an approval request). */
export type SignInLinksTable = { id: number; email: string; token_hash: string; expires_at: Date; used_at: Date | null; created_at: Date; next_path: string | null };

export type AuthAttemptsTable = {
  id: number;
  /** reset_request, token_use, password_change: migration 17; signup_request, signup_use, booking_request: 20. */
  kind: "password" | "link_request" | "link_use" | "reset_request" | "token_use" | "password_change" | "signup_request" | "signup_use" | "booking_request";
  subject: string;
  succeeded: Flag;
  created_at: Date;
};

/** An e-mailed invitation to a shop's staff; only the token's hash is kept (17). */
export type StaffInvitesTable = {
  id: number;
  shop_id: number;
  email: string;
  name: string;
  role: StaffRole;
  token_hash: string;
  invited_by_user_id: number | null;
  expires_at: Date;
  used_at: Date | null;
  revoked_at: Date | null;
  created_at: Date;
};

/** A shop waiting for its owner to confirm the e-mail address (20); only the token's hash is kept. */
export type ShopSignupsTable = {
  id: number;
  token_hash: string;
  email: string;
  owner_name: string;
  password_hash: string;
  shop_name: string;
  slug: string;
  timezone: string;
  currency: string;
  expires_at: Date;
  used_at: Date | null;
  shop_id: number | null;
  created_at: Date;
};

/** A forgotten-password link (17). */
export type PasswordResetsTable = { id: number; user_id: number; token_hash: string; expires_at: Date; used_at: Date | null; created_at: Date };

export type UserSessionsTable = { id: string; user_id: number; method: "password" | "link"; created_at: Date; expires_at: Date; ended_at: Date | null; ended_reason: string | null };

// ---- the journal (04) and bench tools (05) ---------------------------------------------------

export type JournalEntriesTable = {
  id: number;
  shop_id: number;
  job_id: number;
  kind: string;
  visibility: EntryVisibility;
  author_user_id: number | null;
  body: JsonText | null;
  caption: string | null;
  version: number;
  created_at: Date;
  edited_at: Date | null;
  shared_at: Date | null;
  deleted_at: Date | null;
};

export type JournalEntryRevisionsTable = {
  id: number;
  shop_id: number;
  entry_id: number;
  version: number;
  change: "edit" | "share" | "unshare" | "delete";
  visibility: EntryVisibility;
  body: JsonText | null;
  caption: string | null;
  changed_by_user_id: number | null;
  changed_at: Date;
};

export type PhotosTable = {
  id: number;
  public_id: string;
  shop_id: number;
  job_id: number;
  entry_id: number | null;
  position: number;
  uploaded_by_user_id: number | null;
  original_name: string | null;
  display_key: string;
  thumb_key: string;
  width: number;
  height: number;
  bytes: number;
  created_at: Date;
};

/** The shop's parts markup rule (lib/parts-pricing.ts MarkupRule, as JSON). */
export type ShopPartsMarkupTable = { shop_id: number; rule: JsonText; updated_at: Date };

export type ShopBenchSettingsTable = { shop_id: number; torque_unit: TorqueUnit; pass_percents: JsonText; chain_limit_pct: number; wrench_class: string; updated_at: Date };

export type TorqueRecordsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  entry_id: number | null;
  fastener: string;
  spec_value: number;
  unit: TorqueUnit;
  applied_value: number | null;
  tool: string | null;
  pass_percents: JsonText;
  bolt_count: number | null;
  note: string | null;
  recorded_by_user_id: number | null;
  created_at: Date;
  /** Issue 18 (migration 22): null on rows written before it. */
  tolerance_pct: number | null;
  wrench_class: string | null;
  passes_done: Flag | null;
  check_pass_done: Flag | null;
  /** Issue 18 (migration 27): the wrench and how the fastener is tightened; null on rows before it. */
  tool_serial: string | null;
  calibrated_on: DateText | null;
  wrench_max_value: number | null;
  wrench_max_unit: TorqueUnit | null;
  /** JSON list of degrees. */
  angle_stages: JsonText | null;
  angle_done: Flag | null;
  loosen_retorque: Flag | null;
  retorque_sequence: string | null;
  lubrication: string | null;
  lubrication_other: string | null;
  one_time: Flag | null;
};

export type ReadingsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  entry_id: number | null;
  label: string;
  value: number;
  unit: string | null;
  min_value: number | null;
  max_value: number | null;
  source: string | null;
  verdict: ReadingVerdict;
  chain: JsonText | null;
  recorded_by_user_id: number | null;
  created_at: Date;
  /** Decimals typed (the instrument's resolution); null on rows from before migration 25. */
  value_decimals: number | null;
  min_decimals: number | null;
  max_decimals: number | null;
};

/** Migration 26: a structured measurement set (issue 18 §5); its items below. */
export type MeasurementSetsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  entry_id: number | null;
  kind: string;
  title: string;
  unit: string;
  source: string;
  note: string | null;
  finding_id: number | null;
  recorded_by_user_id: number | null;
  created_at: Date;
};

export type MeasurementItemsTable = {
  id: number;
  shop_id: number;
  set_id: number;
  position: number;
  item_key: string;
  label: string;
  value: number;
  value_decimals: number;
  min_value: number | null;
  max_value: number | null;
  limit_decimals: number;
  verdict: ReadingVerdict;
  detail: JsonText | null;
};

export type TeardownStepsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  entry_id: number | null;
  seq: number;
  removed: string;
  count: number | null;
  size: string | null;
  notes: string | null;
  storage_label: string | null;
  photo_public_id: string | null;
  torque_value: number | null;
  torque_unit: TorqueUnit | null;
  torque_bolt_count: number | null;
  /** Migration 27: angle stages (JSON list of degrees), lubrication and one-time fasteners of the step's torque. */
  torque_angle_stages: JsonText | null;
  torque_lubrication: string | null;
  torque_one_time: Flag;
  /** Migration 32: null on steps written before. */
  torque_lubrication_other: string | null;
  torque_loosen_retorque: Flag | null;
  torque_retorque_sequence: string | null;
  replaced_new: Flag;
  checked_by_user_id: number | null;
  checked_at: Date | null;
  created_by_user_id: number | null;
  created_at: Date;
  /** Migration 28: bumped by each edit; a deleted step is only marked. */
  version: number;
  deleted_at: Date | null;
  deleted_by_user_id: number | null;
};

/** Migration 28: a teardown step as it was before each edit, torque change or delete. */
export type TeardownStepRevisionsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  step_id: number;
  version: number;
  change: "edit" | "torque" | "delete";
  previous: JsonText;
  changed_by_user_id: number | null;
  changed_at: Date;
};

export type JobPartsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  part_number: string | null;
  description: string;
  supplier: string | null;
  qty_thousandths: number;
  cost_minor: number | null;
  status: PartStatus;
  expected_on: DateText | null;
  /** The finding the part is for: it waits the job once that finding's work is approved. */
  finding_id: number | null;
  /** Staff marked it as for work that needs no OK from the owner. */
  no_ok_needed: Flag;
  created_by_user_id: number | null;
  created_at: Date;
  updated_at: Date;
  // Issue 19 price (migration 30): the priced finding line it belongs to, the owner's answer to
  // that line (null: not from a line), the unit sell price shown to the owner and why it differs
  // from the markup rule.
  finding_line_id: number | null;
  owner_answer: "pending" | "approved" | "declined" | null;
  sell_minor: number | null;
  price_reason: string | null;
  // Issue 19 ordering (migration 31).
  order_id: number | null;
  core_charge_minor: number | null;
  core_returned_at: Date | null;
  special_order: Flag;
  deposit_id: number | null;
};

export type JobPartEventsTable = { id: number; shop_id: number; part_id: number; from_status: PartStatus | null; to_status: PartStatus; changed_by_user_id: number | null; changed_at: Date; note: string | null };

export type PartOrdersTable = {
  id: number;
  shop_id: number;
  supplier: string;
  reference: string | null;
  ordered_on: DateText;
  expected_on: DateText | null;
  received_at: Date | null;
  created_by_user_id: number | null;
  created_at: Date;
};

export type SpecEntriesTable = {
  id: number;
  shop_id: number;
  make: string;
  model: string;
  kind: SpecKind;
  label: string;
  value: number | null;
  unit: string | null;
  min_value: number | null;
  max_value: number | null;
  bolt_count: number | null;
  notes: string | null;
  source: string | null;
  created_by_user_id: number | null;
  created_at: Date;
  /** Decimals typed (migration 32); null on rows written before. */
  value_decimals: number | null;
  min_decimals: number | null;
  max_decimals: number | null;
};

// ---- mail and following (06) -----------------------------------------------------------------

export type OutboxTable = {
  id: number;
  shop_id: number | null;
  /** The job the mail is about (its sent log); null for mail of no job, such as sign-in links. */
  job_id: number | null;
  dedupe_scope: number;
  dedupe_key: string | null;
  kind: string;
  from_address: string;
  to_email: string;
  reply_to: string | null;
  subject: string;
  html: string;
  text: string;
  headers: JsonText | null;
  idempotency_key: string;
  state: "queued" | "sending" | "retrying" | "sent" | "dead";
  attempts: number;
  next_attempt_at: Date;
  locked_until: Date | null;
  claim_token: string | null;
  last_error: string | null;
  provider_id: string | null;
  priority: number;
  send_before: Date | null;
  created_at: Date;
  sent_at: Date | null;
};

// ---- text messages (migration 34) ----------------------------------------------------------------

export type TextConsentLogTable = {
  id: number;
  shop_id: number;
  customer_id: number;
  phone: string;
  action: "granted" | "revoked";
  how: ConsentHow | OptOutHow;
  user_id: number | null;
  at: Date;
};

export type TextOutboxTable = {
  id: number;
  shop_id: number;
  job_id: number | null;
  customer_id: number | null;
  kind: string;
  purpose: "notice" | "keyword_reply";
  to_phone: string;
  from_phone: string;
  body: string;
  state: "queued" | "sending" | "retrying" | "sent" | "dead";
  delivery: TextDelivery | null;
  attempts: number;
  next_attempt_at: Date;
  locked_until: Date | null;
  claim_token: string | null;
  ref: string;
  dedupe_key: string | null;
  provider_sid: string | null;
  error_code: number | null;
  last_error: string | null;
  held_reason: string | null;
  created_at: Date;
  sent_at: Date | null;
  delivered_at: Date | null;
};

export type TextStatusEventsTable = { provider_sid: string; status: string; received_at: Date };

export type TextInboundTable = {
  id: number;
  provider_sid: string;
  shop_id: number | null;
  customer_id: number | null;
  job_id: number | null;
  from_phone: string;
  to_phone: string;
  body: string;
  filed: TextFiled;
  received_at: Date;
};

export type JobSubscribersTable = {
  id: number;
  shop_id: number;
  job_id: number;
  email: string;
  user_id: number | null;
  role: SubscriberRole;
  frequency: Frequency;
  unsubscribed_at: Date | null;
  invited_by_user_id: number | null;
  created_at: Date;
};

export type JobUpdateQueueTable = { id: number; shop_id: number; job_id: number; entry_id: number; shared_at: Date; every_sent_at: Date | null; daily_sent_at: Date | null };

export type JobAlertsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  kind: string;
  subscriber_id: number | null;
  payload: JsonText | null;
  dedupe_key: string | null;
  created_at: Date;
  sent_at: Date | null;
};

// ---- approvals (07) --------------------------------------------------------------------------

export type ShopMoneySettingsTable = {
  shop_id: number;
  labour_rate_minor: number | null;
  tax_rate_percent: number | string;
  tax_method: "per_line" | "per_invoice";
  parts_taxable: Flag;
  labour_taxable: Flag;
  fees_taxable: Flag;
  supplies_percent: number | string | null;
  supplies_base: "labour" | "parts_and_labour";
  supplies_cap_minor: number | null;
  supplies_taxable: Flag;
  /** Rates of their own for labour, fees and the supplies fee; NULL = the shop's rate (migration 23). */
  labour_tax_rate_percent: number | string | null;
  fee_tax_rate_percent: number | string | null;
  supplies_tax_rate_percent: number | string | null;
  /** The shop's standard drop-off terms, both set or both NULL (migration 23). */
  dropoff_charge_minor: number | null;
  dropoff_up_to_minor: number | null;
  tolerance_kind: "strict" | "greater_of";
  tolerance_fixed_minor: number;
  tolerance_percent: number | string;
  tolerance_cap_minor: number | null;
  reminder_delay_hours: number;
  /** 16: named labour rates, JSON [{name, rateMinor}]. */
  labour_rates: JsonText | null;
  updated_at: Date;
};

/** 16: one row per saved settings section: who, when, the values before and after (JSON). */
export type ShopSettingChangesTable = { id: number; shop_id: number; user_id: number | null; section: string; before: JsonText; after: JsonText; at: Date };

export type FindingsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  title: string;
  found: string;
  why_it_matters: string | null;
  safety: SafetyCategory;
  version: number;
  created_by_user_id: number | null;
  created_at: Date;
  updated_at: Date;
};

export type FindingEvidenceTable = { id: number; shop_id: number; finding_id: number; position: number; kind: EvidenceKind; ref: string; moment_ms: number | null };

export type FindingLinesTable = {
  id: number;
  shop_id: number;
  finding_id: number;
  position: number;
  kind: LineKind;
  description: string;
  part_number: string | null;
  qty_thousandths: number | null;
  unit_price_minor: number | null;
  hours_tenths: number | null;
  rate_minor: number | null;
  amount_minor: number | null;
  taxable: Flag;
  /** 38: an approved line whose part left the job: not billed; who, when and why (issue 19). */
  withdrawn_at: Date | null;
  withdrawn_by_user_id: number | null;
  withdrawn_reason: string | null;
};

export type ApprovalRequestsTable = {
  id: number;
  public_id: string;
  shop_id: number;
  job_id: number;
  finding_id: number;
  version: number;
  status: RequestStatus;
  replaced_by_id: number | null;
  snapshot: JsonText;
  canonical: string;
  hash: string;
  token_hash: string;
  currency: string;
  estimate_pre_tax_minor: number;
  estimate_tax_minor: number;
  estimate_total_minor: number;
  sent_to: string | null;
  sent_by_user_id: number | null;
  sent_at: Date;
  opened_at: Date | null;
  answered_at: Date | null;
  withdrawn_at: Date | null;
  /** The finding line id behind each snapshot line, in order (migration 30); null before it. */
  line_ids: JsonText | null;
  withdrawn_by_user_id: number | null;
};

export type ApprovalDecisionsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  request_id: number;
  method: DecisionMethod;
  person_name: string;
  signature_name: string | null;
  phone_called: string | null;
  note: string | null;
  wants_parts_back: Flag;
  decided_at: Date;
  recorded_at: Date;
  recorded_by_user_id: number | null;
  ip: string | null;
  user_agent: string | null;
  shown_hash: string;
  estimate_pre_tax_minor: number;
  estimate_total_minor: number;
  authorised_pre_tax_minor: number;
  authorised_tax_minor: number;
  authorised_total_minor: number;
};

export type ApprovalDecisionLinesTable = {
  id: number;
  shop_id: number;
  job_id: number;
  decision_id: number;
  line_no: number;
  answer: LineAnswer;
  kind: LineKind;
  description: string;
  part_number: string | null;
  qty_thousandths: number | null;
  hours_tenths: number | null;
  net_minor: number;
  taxable: Flag;
};

/** The view of every approved line of every answered request (migration 07). */
export type JobAuthorisedWorkView = Pick<ApprovalDecisionLinesTable, "shop_id" | "job_id" | "line_no" | "kind" | "description" | "part_number" | "qty_thousandths" | "hours_tenths" | "net_minor" | "taxable"> & {
  request_id: number;
  request_public_id: string;
  decision_id: number;
  method: DecisionMethod;
  decided_at: Date;
};

// ---- clips (08, 12) --------------------------------------------------------------------------

export type ClipsTable = {
  id: number;
  public_id: string;
  shop_id: number;
  job_id: number;
  /** Null for a failed upload: the video service rejected it and its entry was removed (12). */
  entry_id: number | null;
  uploaded_by_user_id: number | null;
  original_name: string | null;
  bytes: number;
  upload_id: string;
  asset_id: string | null;
  playback_id: string | null;
  status: ClipStatus;
  duration_seconds: number | null;
  aspect_ratio: string | null;
  error: string | null;
  created_at: Date;
  updated_at: Date;
};

export type ClipMomentsTable = { id: number; shop_id: number; clip_id: number; at_ms: number; label: string; created_by_user_id: number | null; created_at: Date };

export type WebhookEventsTable = { event_id: string; type: string; received_at: Date };

// ---- invoices and payments (09) --------------------------------------------------------------

export type InvoicesTable = {
  id: number;
  public_id: string;
  shop_id: number;
  job_id: number;
  number: number;
  status: InvoiceStatus;
  live_job_id: number | null;
  currency: string;
  totals: JsonText;
  subtotal_minor: number;
  discount_minor: number;
  supplies_minor: number;
  tax_minor: number;
  total_minor: number;
  paid_minor: number;
  balance_minor: number;
  discount_kind: "amount" | "percent" | null;
  discount_amount_minor: number | null;
  discount_percent: number | string | null;
  returned_parts_note: string | null;
  note: string | null;
  version: number;
  created_by_user_id: number | null;
  created_at: Date;
  issued_at: Date | null;
  issued_by_user_id: number | null;
  paid_at: Date | null;
  voided_at: Date | null;
};

export type InvoiceLinesTable = {
  id: number;
  shop_id: number;
  invoice_id: number;
  position: number;
  source: "authorised" | "added" | "core_charge" | "core_credit";
  request_public_id: string | null;
  request_line_no: number | null;
  kind: LineKind;
  description: string;
  part_number: string | null;
  qty_thousandths: number | null;
  unit_price_minor: number | null;
  hours_tenths: number | null;
  rate_minor: number | null;
  amount_minor: number | null;
  taxable: Flag;
  /** Migration 33: the part a core charge or credit line is for. */
  part_id: number | null;
};

export type DepositRequestsTable = {
  id: number;
  public_id: string;
  shop_id: number;
  job_id: number;
  request_public_id: string | null;
  amount_minor: number;
  currency: string;
  note: string | null;
  status: "open" | "paid" | "cancelled";
  requested_by_user_id: number | null;
  requested_at: Date;
  paid_at: Date | null;
};

export type PaymentCheckoutsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  invoice_id: number | null;
  deposit_id: number | null;
  provider_session_id: string;
  url: string | null;
  amount_minor: number;
  currency: string;
  status: "open" | "complete" | "expired";
  created_by_user_id: number | null;
  created_at: Date;
  closed_at: Date | null;
};

export type PaymentsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  invoice_id: number | null;
  deposit_id: number | null;
  kind: PaymentKind;
  method: PaymentMethod;
  amount_minor: number;
  currency: string;
  reference: string | null;
  provider_payment_id: string | null;
  provider_refund_id: string | null;
  provider_session_id: string | null;
  refund_of_payment_id: number | null;
  recorded_by_user_id: number | null;
  received_at: Date;
};

// ---- the public portfolio (10) ---------------------------------------------------------------

export type ShopProfilesTable = {
  shop_id: number;
  display_name: string | null;
  about: string | null;
  logo_key: string | null;
  location_text: string | null;
  show_location: Flag;
  public_email: string | null;
  public_phone: string | null;
  /** What the shop takes in, in its own words (20). */
  takes_in: string | null;
  updated_at: Date;
};

export type StoriesTable = {
  id: number;
  shop_id: number;
  job_id: number;
  slug: string;
  title: string;
  write_up: JsonText | null;
  cover_photo_id: number | null;
  status: StoryStatus;
  version: number;
  proposed_by_user_id: number | null;
  published_by_user_id: number | null;
  published_at: Date | null;
  created_at: Date;
  updated_at: Date;
};

export type StoryItemsTable = {
  id: number;
  shop_id: number;
  story_id: number;
  position: number;
  kind: StoryItemKind;
  entry_id: number | null;
  photo_id: number | null;
  moment_ms: number | null;
  caption: string | null;
};

export type StoryConsentsTable = {
  id: number;
  shop_id: number;
  story_id: number;
  user_id: number | null;
  name_typed: string;
  decision: ConsentDecision;
  decided_at: Date;
  ip: string;
  user_agent: string | null;
  /** SHA-256 of the curated content a "given" answer was made on (migration 24). */
  shown_hash: string | null;
};

export type ShopEventsTable = {
  id: number;
  shop_id: number;
  job_id: number | null;
  kind: string;
  inbox: Flag;
  owner_visible: Flag;
  payload: string;
  actor_user_id: number | null;
  created_at: Date;
};

export type InboxReadsTable = { user_id: number; event_id: number; read_at: Date };

export type InboxPreferencesTable = { user_id: number; shop_id: number; kind: string; delivery: "now" | "digest" | "off" };

export type InboxDigestsTable = { user_id: number; shop_id: number; through_event_id: number; last_sent_on: DateText | null };

/** The authorisation signed at drop-off (migration 19); the signature columns are null until signed. */
export type DropoffAuthorisationsTable = {
  id: number;
  public_id: string;
  shop_id: number;
  job_id: number;
  snapshot: JsonText;
  canonical: string;
  hash: string;
  currency: string;
  diagnosis_minor: number;
  authorised_up_to_minor: number;
  created_by_user_id: number | null;
  created_at: Date;
  updated_at: Date;
  sent_to: string | null;
  sent_at: Date | null;
  method: "online" | "in_person" | null;
  signature_name: string | null;
  wants_parts_back: Flag;
  signed_at: Date | null;
  shown_hash: string | null;
  ip: string | null;
  user_agent: string | null;
  recorded_by_user_id: number | null;
};

/** A client-made idempotency key and the answer its first request got (migration 36). */
export interface IdempotencyKeysTable {
  user_id: number;
  idem_key: string;
  request_hash: string;
  response_status: number;
  response_body: JsonText;
  created_at: Date;
  expires_at: Date;
}

// ---- questions on a job (35) -----------------------------------------------------------------

export type QuestionAuthor = "owner" | "staff";
export type QuestionVia = "page" | "sms" | "email";

/** One message of a job's question thread: an owner's question or the desk's answer. */
export type JobQuestionsTable = {
  id: number;
  shop_id: number;
  job_id: number;
  author: QuestionAuthor;
  customer_id: number | null;
  user_id: number | null;
  body: string;
  via: QuestionVia;
  approval_request_id: number | null;
  line_no: number | null;
  answers_question_id: number | null;
  answered_at: Date | null;
  inbox_event_id: number | null;
  source_ref: string | null;
  created_at: Date;
};

export type JobReplyTokensTable = { shop_id: number; job_id: number; token: string; created_at: Date };

declare module "knex/types/tables" {
  interface Tables {
    shops: ShopsTable;
    users: UsersTable;
    memberships: MembershipsTable;
    customers: CustomersTable;
    customer_merges: CustomerMergesTable;
    machines: MachinesTable;
    jobs: JobsTable;
    job_status_changes: JobStatusChangesTable;
    job_status_counts: JobStatusCountsTable;
    job_technician_counts: JobTechnicianCountsTable;
    shop_events: ShopEventsTable;
    inbox_reads: InboxReadsTable;
    inbox_preferences: InboxPreferencesTable;
    inbox_digests: InboxDigestsTable;
    sign_in_links: SignInLinksTable;
    auth_attempts: AuthAttemptsTable;
    staff_invites: StaffInvitesTable;
    password_resets: PasswordResetsTable;
    shop_signups: ShopSignupsTable;
    user_sessions: UserSessionsTable;
    journal_entries: JournalEntriesTable;
    journal_entry_revisions: JournalEntryRevisionsTable;
    photos: PhotosTable;
    shop_bench_settings: ShopBenchSettingsTable;
    torque_records: TorqueRecordsTable;
    readings: ReadingsTable;
    measurement_sets: MeasurementSetsTable;
    measurement_items: MeasurementItemsTable;
    teardown_steps: TeardownStepsTable;
    teardown_step_revisions: TeardownStepRevisionsTable;
    job_parts: JobPartsTable;
    job_part_events: JobPartEventsTable;
    shop_parts_markup: ShopPartsMarkupTable;
    part_orders: PartOrdersTable;
    spec_entries: SpecEntriesTable;
    outbox: OutboxTable;
    text_consent_log: TextConsentLogTable;
    text_outbox: TextOutboxTable;
    text_status_events: TextStatusEventsTable;
    text_inbound: TextInboundTable;
    job_subscribers: JobSubscribersTable;
    job_update_queue: JobUpdateQueueTable;
    job_alerts: JobAlertsTable;
    shop_money_settings: ShopMoneySettingsTable;
    shop_setting_changes: ShopSettingChangesTable;
    findings: FindingsTable;
    finding_evidence: FindingEvidenceTable;
    finding_lines: FindingLinesTable;
    approval_requests: ApprovalRequestsTable;
    approval_decisions: ApprovalDecisionsTable;
    approval_decision_lines: ApprovalDecisionLinesTable;
    job_authorised_work: JobAuthorisedWorkView;
    clips: ClipsTable;
    clip_moments: ClipMomentsTable;
    video_webhook_events: WebhookEventsTable;
    invoices: InvoicesTable;
    invoice_lines: InvoiceLinesTable;
    deposit_requests: DepositRequestsTable;
    payment_checkouts: PaymentCheckoutsTable;
    payments: PaymentsTable;
    payment_webhook_events: WebhookEventsTable;
    shop_profiles: ShopProfilesTable;
    stories: StoriesTable;
    story_items: StoryItemsTable;
    story_consents: StoryConsentsTable;
    dropoff_authorisations: DropoffAuthorisationsTable;
    job_questions: JobQuestionsTable;
    job_reply_tokens: JobReplyTokensTable;
    mail_webhook_events: WebhookEventsTable;
    idempotency_keys: IdempotencyKeysTable;
  }
}
