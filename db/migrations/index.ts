import type { Knex } from "knex";
import * as shopsUsers from "./20261201_01_shops_users";
import * as customersMachinesJobs from "./20261201_02_customers_machines_jobs";
import * as signIn from "./20261201_03_sign_in";
import * as journal from "./20261202_04_journal";
import * as bench from "./20261202_05_bench";
import * as outboxFollowing from "./20261202_06_outbox_following";
import * as approvals from "./20261202_07_approvals";
import * as clips from "./20261202_08_clips";
import * as invoices from "./20261202_09_invoices";
import * as portfolio from "./20261202_10_portfolio";
import * as sessionsPriorityMail from "./20261203_11_sessions_priority_mail";
import * as failedClips from "./20261203_12_failed_clips";
import * as membershipDeactivation from "./20261204_13_membership_deactivation";
import * as workflowInbox from "./20261204_14_workflow_inbox";
import * as outboxJob from "./20261204_15_outbox_job";
import * as shopSettings from "./20261204_16_shop_settings";
import * as staffInvites from "./20261204_17_staff_invites";
import * as customerContact from "./20261204_18_customer_contact";
import * as dropoffAuthorisation from "./20261204_19_dropoff_authorisation";
import * as shopSignup from "./20261204_20_shop_signup";
import * as boardIndexes from "./20261204_21_board_indexes";
import * as torqueOutcome from "./20261204_22_torque_outcome";
import * as taxRatesByKind from "./20261204_23_tax_rates_by_kind";
import * as consentShown from "./20261204_24_consent_shown";
import * as readingResolution from "./20261205_25_reading_resolution";
import * as measurementSets from "./20261205_26_measurement_sets";
import * as torqueToolSpecial from "./20261205_27_torque_tool_special";
import * as teardownHistorySafety from "./20261205_28_teardown_history_safety";
import * as jobStatusCounts from "./20261205_29_job_status_counts";
import * as partsPrice from "./20261205_30_parts_price";
import * as partOrders from "./20261205_31_part_orders";
import * as specResolution from "./20261205_32_spec_resolution";
import * as invoiceCoreLines from "./20261205_33_invoice_core_lines";
import * as textMessages from "./20261205_34_text_messages";
import * as jobQuestions from "./20261205_35_job_questions";
import * as idempotencyKeys from "./20261205_36_idempotency_keys";
import * as textLanguages from "./20261206_37_text_languages";
import * as lineWithdrawals from "./20261206_38_line_withdrawals";
import * as jobSearchText from "./20261206_39_job_search_text";
import * as jobTechnicianCounts from "./20261206_40_job_technician_counts";
import * as pageVersions from "./20261207_41_page_versions";

type Migration = { name: string; module: Knex.Migration };

// Listed by hand, in order, so migrations run the same under tsx, Vitest and Next
// without Knex scanning the folder. A new migration file must be added here.
const MIGRATIONS: Migration[] = [
  { name: "20261201_01_shops_users", module: shopsUsers },
  { name: "20261201_02_customers_machines_jobs", module: customersMachinesJobs },
  { name: "20261201_03_sign_in", module: signIn },
  { name: "20261202_04_journal", module: journal },
  { name: "20261202_05_bench", module: bench },
  { name: "20261202_06_outbox_following", module: outboxFollowing },
  { name: "20261202_07_approvals", module: approvals },
  { name: "20261202_08_clips", module: clips },
  { name: "20261202_09_invoices", module: invoices },
  { name: "20261202_10_portfolio", module: portfolio },
  { name: "20261203_11_sessions_priority_mail", module: sessionsPriorityMail },
  { name: "20261203_12_failed_clips", module: failedClips },
  { name: "20261204_13_membership_deactivation", module: membershipDeactivation },
  { name: "20261204_14_workflow_inbox", module: workflowInbox },
  { name: "20261204_15_outbox_job", module: outboxJob },
  { name: "20261204_16_shop_settings", module: shopSettings },
  { name: "20261204_17_staff_invites", module: staffInvites },
  { name: "20261204_18_customer_contact", module: customerContact },
  { name: "20261204_19_dropoff_authorisation", module: dropoffAuthorisation },
  { name: "20261204_20_shop_signup", module: shopSignup },
  { name: "20261204_21_board_indexes", module: boardIndexes },
  { name: "20261204_22_torque_outcome", module: torqueOutcome },
  { name: "20261204_23_tax_rates_by_kind", module: taxRatesByKind },
  { name: "20261204_24_consent_shown", module: consentShown },
  { name: "20261205_25_reading_resolution", module: readingResolution },
  { name: "20261205_26_measurement_sets", module: measurementSets },
  { name: "20261205_27_torque_tool_special", module: torqueToolSpecial },
  { name: "20261205_28_teardown_history_safety", module: teardownHistorySafety },
  { name: "20261205_29_job_status_counts", module: jobStatusCounts },
  { name: "20261205_30_parts_price", module: partsPrice },
  { name: "20261205_31_part_orders", module: partOrders },
  { name: "20261205_32_spec_resolution", module: specResolution },
  { name: "20261205_33_invoice_core_lines", module: invoiceCoreLines },
  { name: "20261205_34_text_messages", module: textMessages },
  { name: "20261205_35_job_questions", module: jobQuestions },
  { name: "20261205_36_idempotency_keys", module: idempotencyKeys },
  { name: "20261206_37_text_languages", module: textLanguages },
  { name: "20261206_38_line_withdrawals", module: lineWithdrawals },
  { name: "20261206_39_job_search_text", module: jobSearchText },
  { name: "20261206_40_job_technician_counts", module: jobTechnicianCounts },
  { name: "20261207_41_page_versions", module: pageVersions },
];

export const migrationSource: Knex.MigrationSource<Migration> = {
  getMigrations: async () => MIGRATIONS,
  getMigrationName: (m) => m.name,
  getMigration: async (m) => m.module,
};
