// A minimal valid request for each declaration that takes a body or a form, against the
// fixture (fixture.ts). Valid, so a refusal can only come from the wrapper or the resolver; and
// where the allowed call would change shared demo data, one the handler itself turns down
// (a stale version, a row that doesn't exist) — the wrapper has let it through by then.
// A declaration with a body and no sample here fails the test: add one.
import { DEFAULT_DELIVERY } from "../../../lib/shop-events";
import type { Body } from "./client";
import type { PersonaName } from "./expected";
import { type Fixture, PHOTO_FILE, note } from "./fixture";

export type SampleContext = { f: Fixture; persona: PersonaName };
export type HandlerSample = { body?: (c: SampleContext) => Body; query?: Record<string, string>; params?: (f: Fixture) => Record<string, string> };

const json = (value: unknown): Body => ({ kind: "json", value });
const STALE = "999999"; // a version no fixture row reaches
const NO_ROW = "999999999"; // a row id no fixture row has

/** Path params by name, for every route: the fixture's ids. */
export function paramValues(f: Fixture): Record<string, string> {
  return {
    shop: f.shop,
    job: f.job,
    customer: String(f.customer),
    number: String(f.number),
    entry: String(f.entry),
    finding: String(f.finding),
    request: f.request,
    invoice: f.invoice,
    clip: f.clip,
    photo: f.photos.shared,
    size: "thumb",
    file: "poster.jpg",
    story: f.storySlug,
    token: "access-test",
  };
}

export const HANDLER_SAMPLES: Record<string, HandlerSample> = {
  "POST /api/approvals/[request]/decision": { body: () => json({ shownHash: "0".repeat(64), lines: [], signature: "Access Test", wantsPartsBack: false, confirmed: true }) },
  "POST /api/approvals/[request]/recorded-decision": {
    body: () => json({ shownHash: "0".repeat(64), lines: [], method: "in_person", personName: "Access Test", decidedAt: new Date().toISOString(), wantsPartsBack: false }),
  },
  "POST /api/approvals/[request]/withdraw": { body: () => json({ reason: "Access test" }) },
  // The photo quoted as evidence of the request.
  "GET /api/approvals/[request]/evidence/[photo]/[size]": { params: (f) => ({ photo: f.photos.quoted }) },
  "POST /api/jobs/[job]/clips/[clip]/moments": { body: () => json({ atSeconds: 1, label: "Access test" }) },
  "POST /api/jobs/[job]/clips": { body: () => json({ name: "access.mp4", size: 1000, durationSeconds: 1, type: "video/mp4", visibility: "shop" }) },
  "PATCH /api/jobs/[job]/entries/[entry]": { body: () => json({ version: Number(STALE), visibility: "shop" }) },
  "DELETE /api/jobs/[job]/entries/[entry]": { body: () => json({ version: Number(STALE) }) },
  "PATCH /api/jobs/[job]/findings/[finding]": { body: () => json({ version: Number(STALE), title: "Access test", found: "Access test", safety: "none" }) },
  "POST /api/jobs/[job]/findings/[finding]/send": { body: () => json({ findingVersion: Number(STALE) }) },
  "POST /api/jobs/[job]/findings": { body: () => json({ title: "Access test finding", found: "Made by the access test.", safety: "none" }) },
  "POST /api/jobs/[job]/entries": { body: ({ persona }) => json({ kind: "note", note: note(`Access test, ${persona}`), visibility: "shop" }) },
  "POST /api/jobs/[job]/torque-records": { body: ({ f }) => json({ job: f.job, fastener: "Access test bolt", specValue: "10", unit: "nm" }) },
  "POST /api/jobs/[job]/readings": { body: ({ f }) => json({ job: f.job, label: "Access test reading", value: "1" }) },
  "POST /api/jobs/[job]/chain-readings": { body: ({ f }) => json({ job: f.job, pitchMm: "15.875", pitches: "20", measuredMm: "318" }) },
  "POST /api/jobs/[job]/measurement-sets": { body: ({ f }) => json({ job: f.job, kind: "leak_down", unit: "%", max: "10", source: "Access test manual p. 1", label0: "Cylinder 1", value0: "4" }) },
  "POST /api/jobs/[job]/teardown-steps": { body: ({ f }) => json({ job: f.job, removed: "Access test cover" }) },
  // No such step: allowed callers get a 404 and nothing is written.
  "POST /api/jobs/[job]/step-torques": { body: ({ f }) => json({ job: f.job, step: NO_ROW, torqueValue: "10", torqueUnit: "nm" }) },
  "POST /api/jobs/[job]/reassembly-ticks": { body: ({ f }) => json({ job: f.job, step: NO_ROW, value: "1" }) },
  "POST /api/jobs/[job]/reassembly-replaced": { body: ({ f }) => json({ job: f.job, step: NO_ROW, value: "1" }) },
  // picked_up → picked_up is no move: an allowed caller is turned down by the rules, nothing written.
  "POST /api/jobs/[job]/status": { body: () => json({ from: "picked_up", to: "picked_up", note: "" }) },
  "POST /api/jobs/[job]/photos": { body: () => ({ kind: "multipart", fields: { photo: { name: "access.jpg", mimeType: "image/jpeg", buffer: PHOTO_FILE } } }) },
  "GET /api/shops/[shop]/customers": { query: { q: "Calloway" } },
  // Unsigned: the handler's signature check answers, after the wrapper let it through.
  "POST /api/webhooks/payments": { body: () => ({ kind: "raw", text: "{}", contentType: "application/json" }) },
  "POST /api/webhooks/video": { body: () => ({ kind: "raw", text: "{}", contentType: "application/json" }) },
  "POST /api/webhooks/mail": { body: () => ({ kind: "raw", text: "{}", contentType: "application/json" }) },
  // Texts (issue 21): form-encoded as the SMS service sends them, unsigned, so the signature check answers 401.
  "POST /api/webhooks/sms/status": { body: () => ({ kind: "raw", text: "MessageSid=SM00000000000000000000000000000000&MessageStatus=delivered", contentType: "application/x-www-form-urlencoded" }) },
  "POST /api/webhooks/sms/inbound": { body: () => ({ kind: "raw", text: "MessageSid=SM00000000000000000000000000000000&From=%2B15550100001&To=%2B15550100999&Body=STOP", contentType: "application/x-www-form-urlencoded" }) },
  // RFC 8058 one-click, with a token that isn't one.
  "POST /u/[token]": { body: () => ({ kind: "raw", text: "List-Unsubscribe=One-Click", contentType: "application/x-www-form-urlencoded" }) },
};

const SIGN_IN = "app/(auth)/sign-in/actions.ts";
const FOLLOWING = "app/(owner)/my/jobs/[job]/following-actions.ts";
const OWNER_INVOICE = "app/(owner)/my/jobs/[job]/invoice/actions.ts";
const BENCH = "app/(staff)/shop/[shop]/jobs/[number]/bench/actions.ts";
const INVOICE = "app/(staff)/shop/[shop]/jobs/[number]/invoice/actions.ts";
const PORTFOLIO = "app/(staff)/shop/[shop]/portfolio/actions.ts";
const SPECS = "app/(staff)/shop/[shop]/specs/actions.ts";
const PART_ORDERS = "app/(staff)/shop/[shop]/jobs/[number]/bench/part-order-actions.ts";
const PARTS_PAGE = "app/(staff)/shop/[shop]/parts/actions.ts";
const SETTINGS = "app/(staff)/shop/[shop]/settings/actions.ts";
const INBOX = "app/(staff)/shop/[shop]/inbox/actions.ts";
const DROPOFF = "app/(staff)/shop/[shop]/jobs/[number]/dropoff-actions.ts";

type Fields = (c: SampleContext) => Record<string, string>;
const invoiceRef = (f: Fixture) => ({ invoice: f.invoice, version: STALE });

export const ACTION_SAMPLES: Record<string, Fields> = {
  // Addresses nobody has, one per persona (the per-address limits stay out of the way).
  [`${SIGN_IN}#signInWithPassword`]: ({ f, persona }) => ({ email: `nobody.${f.run}.${persona.toLowerCase()}@access.test`, password: "not-the-password" }),
  [`${SIGN_IN}#requestOwnerLink`]: ({ f, persona }) => ({ email: `nobody.${f.run}.${persona.toLowerCase()}@access.test` }),
  [`${SIGN_IN}#signInWithLink`]: () => ({ token: "A".repeat(43) }),
  [`${SIGN_IN}#signOutAction`]: () => ({}),
  [`${SIGN_IN}#signOutEverywhereAction`]: () => ({}),
  [`${FOLLOWING}#inviteFollowerAction`]: ({ f, persona }) => ({ job: f.job, email: `friend.${f.run}.${persona.toLowerCase()}@access.test` }),
  [`${FOLLOWING}#removeFollowerAction`]: ({ f }) => ({ job: f.job, subscriber: NO_ROW }),
  [`${FOLLOWING}#setFrequencyAction`]: ({ f }) => ({ job: f.job, frequency: "daily" }),
  // Texts (issue 21): the owner keeps e-mail (no consent recorded), then stops texts (nothing to stop).
  ["app/(owner)/my/jobs/[job]/texts/actions.ts#chooseTextsAction"]: ({ f }) => ({ job: f.job, channels: "email" }),
  ["app/(owner)/my/jobs/[job]/texts/actions.ts#stopTextsAction"]: ({ f }) => ({ job: f.job }),
  // Questions on a job (issue 21): the owner asks on the fixture's own job; the desk answers a
  // question that doesn't exist, so allowed callers get the handler's 404 and nothing is written.
  ["app/(owner)/my/jobs/[job]/question-actions.ts#askQuestionAction"]: ({ f, persona }) => ({ job: f.job, body: `Access test question from ${persona}` }),
  ["app/(staff)/shop/[shop]/jobs/[number]/question-actions.ts#answerQuestionAction"]: ({ f }) => ({ job: f.job, question: NO_ROW, body: "Access test answer" }),
  [`${OWNER_INVOICE}#payInvoiceAction`]: ({ f }) => ({ invoice: f.invoice }),
  [`${OWNER_INVOICE}#payDepositAction`]: ({ f }) => ({ deposit: f.deposit }),
  ["app/(owner)/my/jobs/[job]/portfolio/actions.ts#consentAction"]: ({ f }) => ({ job: f.job, decision: "refused", name: "Access Test" }),
  // The drop-off authorisation on the fixture's own job. Signatures carry a hash nothing was shown
  // with, so the handler refuses them ("changed" or "nothing to sign") after the wrapper let them through.
  [`${DROPOFF}#prepareDropoffAction`]: ({ f }) => ({ job: f.job, chargeKind: "amount", chargeAmount: "95.00", description: "Inspection and diagnosis", authorisedUpTo: "300.00" }),
  [`${DROPOFF}#sendDropoffLinkAction`]: ({ f }) => ({ job: f.job }),
  // The demo shop has no standard drop-off terms: allowed callers get a 400 and nothing is written.
  [`${DROPOFF}#prepareStandardDropoffAction`]: ({ f }) => ({ job: f.job }),
  [`${DROPOFF}#signDropoffAtCounterAction`]: ({ f }) => ({ job: f.job, shownHash: "0".repeat(64), signature: "Access Test", agree: "on" }),
  ["app/(owner)/my/jobs/[job]/authorisation/actions.ts#signDropoffOnlineAction"]: ({ f }) => ({ job: f.job, shownHash: "0".repeat(64), signature: "Access Test", agree: "on" }),
  // A move that doesn't exist: the job's status stays.
  ["app/(staff)/shop/[shop]/jobs/[number]/actions.ts#changeStatusAction"]: ({ f }) => ({ job: f.job, from: "picked_up", to: "picked_up", note: "" }),
  [`${BENCH}#recordTorqueAction`]: ({ f }) => ({ job: f.job, fastener: "Access test bolt", specValue: "10", unit: "nm" }),
  [`${BENCH}#recordReadingAction`]: ({ f }) => ({ job: f.job, label: "Access test reading", value: "1" }),
  [`${BENCH}#recordChainAction`]: ({ f }) => ({ job: f.job, pitchMm: "15.875", pitches: "20", measuredMm: "318" }),
  // Measurement sets (issue 18 §5) on the fixture's own job; drafting from a set that doesn't exist: allowed callers get a 404 and nothing is written.
  ["app/(staff)/shop/[shop]/jobs/[number]/bench/measurement-actions.ts#recordMeasurementSetAction"]: ({ f }) => ({ job: f.job, kind: "leak_down", unit: "%", max: "10", source: "Access test manual p. 1", label0: "Cylinder 1", value0: "4" }),
  ["app/(staff)/shop/[shop]/jobs/[number]/bench/measurement-actions.ts#draftSetFindingAction"]: ({ f }) => ({ job: f.job, set: NO_ROW }),
  [`${BENCH}#addTeardownStepAction`]: ({ f }) => ({ job: f.job, removed: "Access test cover" }),
  // No such step: allowed callers get a 404 and nothing is written.
  [`${BENCH}#editTeardownStepAction`]: ({ f }) => ({ job: f.job, step: NO_ROW, version: "1", removed: "Access test cover" }),
  [`${BENCH}#deleteTeardownStepAction`]: ({ f }) => ({ job: f.job, step: NO_ROW, version: "1" }),
  [`${BENCH}#setStepTorqueAction`]: ({ f }) => ({ job: f.job, step: NO_ROW, torqueValue: "10", torqueUnit: "nm" }),
  [`${BENCH}#tickStepAction`]: ({ f }) => ({ job: f.job, step: NO_ROW, value: "1" }),
  [`${BENCH}#markReplacedAction`]: ({ f }) => ({ job: f.job, step: NO_ROW, value: "1" }),
  [`${BENCH}#addPartAction`]: ({ f }) => ({ job: f.job, description: "Access test part", status: "received", forWork: "booked" }),
  [`${BENCH}#changePartStatusAction`]: ({ f }) => ({ job: f.job, part: NO_ROW, from: "needed", to: "ordered" }),
  // Issue 19 ordering: each names a part (or order) no fixture row has, so the allowed call is turned down by the handler.
  [`${PART_ORDERS}#orderPartsAction`]: ({ f }) => ({ job: f.job, supplier: "Access Supply", orderedOn: "2026-12-01", parts: NO_ROW }),
  [`${PART_ORDERS}#backOrderAction`]: ({ f }) => ({ job: f.job, part: NO_ROW, expectedOn: "2026-12-20" }),
  [`${PART_ORDERS}#movePartAction`]: ({ f }) => ({ job: f.job, part: NO_ROW, toJob: String(f.number), thisJob: "needs" }), // its own job: "Choose another job."
  [`${PART_ORDERS}#coreChargeAction`]: ({ f }) => ({ job: f.job, part: NO_ROW, charge: "25.00" }),
  [`${PART_ORDERS}#coreReturnedAction`]: ({ f }) => ({ job: f.job, part: NO_ROW }),
  [`${PART_ORDERS}#specialOrderAction`]: ({ f }) => ({ job: f.job, part: NO_ROW, special: "1" }),
  [`${PART_ORDERS}#partDepositAction`]: ({ f }) => ({ job: f.job, part: NO_ROW, amount: "120.00" }),
  [`${PARTS_PAGE}#receiveOrderAction`]: ({ f }) => ({ shop: f.shop, order: NO_ROW }),
  [`${PARTS_PAGE}#orderShopPartsAction`]: ({ f }) => ({ shop: f.shop, supplier: "Access Supply", orderedOn: "2026-12-01", parts: NO_ROW }),
  // The job has its live invoice already; the rest name a stale version.
  [`${INVOICE}#createInvoiceAction`]: ({ f }) => ({ job: f.job }),
  [`${INVOICE}#syncAuthorisedAction`]: ({ f }) => invoiceRef(f),
  [`${INVOICE}#addLineAction`]: ({ f }) => ({ ...invoiceRef(f), kind: "fee", description: "Access test fee", amount: "1.00" }),
  [`${INVOICE}#removeLineAction`]: ({ f }) => ({ ...invoiceRef(f), line: NO_ROW }),
  [`${INVOICE}#draftDetailsAction`]: ({ f }) => invoiceRef(f),
  [`${INVOICE}#issueInvoiceAction`]: ({ f }) => ({ ...invoiceRef(f), confirmed: "yes" }),
  [`${INVOICE}#voidInvoiceAction`]: ({ f }) => ({ ...invoiceRef(f), reason: "Access test", confirmed: "yes" }),
  [`${INVOICE}#recordPaymentAction`]: ({ f }) => ({ invoice: f.invoice, method: "cash", amount: "1.00" }),
  [`${INVOICE}#requestDepositAction`]: ({ f }) => ({ job: f.job, amount: "5.00" }),
  [`${INVOICE}#recordDepositAction`]: ({ f }) => ({ deposit: f.deposit, method: "cash" }),
  [`${INVOICE}#refundAction`]: ({ f }) => ({ job: f.job, payment: NO_ROW, amount: "1.00", confirmed: "yes" }),
  // An owner on file that doesn't exist: nothing is checked in.
  ["app/(staff)/shop/[shop]/jobs/new/actions.ts#checkInMachine"]: ({ f }) => ({ shop: f.shop, customerMode: "existing", customerId: NO_ROW, machineMode: "existing", machineId: NO_ROW, concern: "Access test" }),
  // Customers (issue 16 §4), on Ruth Calloway's record: an e-mail another customer of the shop has
  // (409 beside the field), and a duplicate that doesn't exist (refused by the merge, nothing moves).
  ["app/(staff)/shop/[shop]/customers/[customer]/actions.ts#saveContactAction"]: ({ f }) => ({ shop: f.shop, customer: String(f.customer), name: "Ruth Calloway", email: "jonah.pike@mail.test", phone: "+1 555 013 2290", contactPreference: "" }),
  ["app/(staff)/shop/[shop]/customers/[customer]/actions.ts#mergeCustomerAction"]: ({ f }) => ({ shop: f.shop, customer: String(f.customer), duplicate: NO_ROW, confirm: "yes" }),
  ["app/(staff)/shop/[shop]/outbox/actions.ts#retryMailAction"]: ({ f }) => ({ shop: f.shop, id: NO_ROW }),
  // The desk inbox: an item that doesn't exist; "mark all" up to item 0 (marks nothing); the settings as the defaults.
  [`${INBOX}#markReadAction`]: ({ f }) => ({ shop: f.shop, item: NO_ROW }),
  [`${INBOX}#markAllReadAction`]: ({ f }) => ({ shop: f.shop, through: "0", kind: "", job: "" }),
  [`${INBOX}#saveInboxSettingsAction`]: ({ f }) => ({ shop: f.shop, ...DEFAULT_DELIVERY }),
  [`${PORTFOLIO}#proposeAction`]: ({ f }) => ({ shop: f.shop, job: f.job }),
  [`${PORTFOLIO}#curateAction`]: ({ f }) => ({ shop: f.shop, story: String(f.story), version: STALE, title: "Access test story", slug: f.storySlug, items: "[]" }),
  [`${PORTFOLIO}#publishAction`]: ({ f }) => ({ shop: f.shop, story: String(f.story) }),
  [`${PORTFOLIO}#unpublishAction`]: ({ f }) => ({ shop: f.shop, story: String(f.story) }),
  [`${PORTFOLIO}#askOwnerAction`]: ({ f }) => ({ shop: f.shop, story: String(f.story) }),
  // The profile and settings as they are (and put back afterwards all the same).
  [`${PORTFOLIO}#saveProfileAction`]: ({ f }) => ({ shop: f.shop, ...f.profile }),
  [`${SPECS}#addSpecAction`]: ({ f }) => ({ shop: f.shop, make: `Access ${f.run}`, model: "Test", kind: "note", label: "Access test", notes: "Access test note" }),
  [`${SPECS}#deleteSpecAction`]: ({ f }) => ({ shop: f.shop, spec: NO_ROW }),
  // Shop settings (issue 16 §2), on the demo shop: the seed's own values (saved again, nothing
  // changes and no change is recorded), or values the server turns down after the wrapper (an
  // amount with too many decimals, a percent that isn't one). Opening hours have no server-side
  // refusal: the owner's call sets the demo shop's hours, which restoreShopSettings (fixture.ts) puts back.
  [`${SETTINGS}#saveProfileAction`]: ({ f }) => ({ shop: f.shop, name: "Copper Gulch Powersports", email: "desk@coppergulch.test", phone: "+1 555 010 4471", address: "" }),
  [`${SETTINGS}#saveHoursAction`]: ({ f }) => ({ shop: f.shop, ...Object.fromEntries(["mon", "tue", "wed", "thu", "fri", "sat"].flatMap((d) => [[`${d}Open`, "08:00"], [`${d}Close`, "17:30"]])), sunClosed: "on" }),
  [`${SETTINGS}#saveRegionAction`]: ({ f }) => ({ shop: f.shop, timezone: "America/Denver", currency: "USD" }),
  [`${SETTINGS}#saveLabourAction`]: ({ f }) => ({ shop: f.shop, defaultRate: "95.001" }),
  [`${SETTINGS}#saveTaxAction`]: ({ f }) => ({ shop: f.shop, taxMethod: "per_line", taxRate: "eight" }),
  [`${SETTINGS}#saveSuppliesAction`]: ({ f }) => ({ shop: f.shop, suppliesPercent: "five", suppliesBase: "labour" }),
  [`${SETTINGS}#saveToleranceAction`]: ({ f }) => ({ shop: f.shop, toleranceKind: "custom", tolerancePercent: "ten" }),
  [`${SETTINGS}#saveDropoffTermsAction`]: ({ f }) => ({ shop: f.shop, dropoffCharge: "lots", dropoffUpTo: "300.00" }),
  [`${SETTINGS}#saveDigestAction`]: ({ f }) => ({ shop: f.shop, digestWindowMinutes: "15" }),
  // A time that isn't one: allowed callers get the 422, so the demo shop's quiet hours stay as seeded.
  // The demo shop's own settings (the defaults): the form is checked before access, so a refusal needs a valid form.
  [`${SETTINGS}#saveTextsAction`]: ({ f }) => ({ shop: f.shop, smsFrom: "", quietStart: "21:00", quietEnd: "08:00" }),
  [`${SETTINGS}#saveMarkupAction`]: ({ f }) => ({ shop: f.shop, markupKind: "bands", band1UpTo: "ten", band1Percent: "100", topPercent: "35" }),
  [`${SPECS}#saveBenchSettingsAction`]: ({ f }) => ({ shop: f.shop, torqueUnit: "nm", passes: "30, 60, 100", chainLimitPct: "3", clipMaxMinutes: "10", clipMaxGb: "2", ownerWaitDays: "3" }),
  ["app/unsubscribe/[token]/actions.ts#unsubscribeAction"]: () => ({ token: "access-test" }),
  // Staff accounts (issue 16 §3): an invitation to someone already on the staff (409), people and
  // invitations that don't exist (404), a wrong current password, tokens that aren't any link's.
  ["app/(staff)/shop/[shop]/staff/actions.ts#inviteStaffAction"]: ({ f }) => ({ shop: f.shop, email: "dana@coppergulch.test", name: "Access Test", role: "technician" }),
  ["app/(staff)/shop/[shop]/staff/actions.ts#changeStaffRoleAction"]: ({ f }) => ({ shop: f.shop, user: NO_ROW, role: "technician" }),
  ["app/(staff)/shop/[shop]/staff/actions.ts#deactivateStaffAction"]: ({ f }) => ({ shop: f.shop, user: NO_ROW }),
  ["app/(staff)/shop/[shop]/staff/actions.ts#reactivateStaffAction"]: ({ f }) => ({ shop: f.shop, user: NO_ROW }),
  ["app/(staff)/shop/[shop]/staff/actions.ts#revokeInviteAction"]: ({ f }) => ({ shop: f.shop, invite: NO_ROW }),
  ["app/(staff)/shop/[shop]/account/actions.ts#changeOwnPasswordAction"]: () => ({ current: "not-the-password", password: "access test passphrase" }),
  ["app/(auth)/join/actions.ts#acceptInviteAction"]: () => ({ token: "A".repeat(43), name: "Access Test", password: "access test passphrase" }),
  ["app/(auth)/sign-in/password-actions.ts#requestPasswordResetAction"]: ({ f, persona }) => ({ email: `nobody.${f.run}.${persona.toLowerCase()}@access.test` }),
  ["app/(auth)/sign-in/password-actions.ts#resetPasswordAction"]: () => ({ token: "A".repeat(43), password: "access test passphrase" }),
  // A new shop (issue 16 §1): a reserved address, refused beside its field before anything is
  // written or mailed; a confirmation token that is no sign-up's (404 from the handler, not the wrapper).
  ["app/(auth)/start/actions.ts#startShopAction"]: ({ f, persona }) => ({
    shopName: "Access Test Shop",
    slug: "admin",
    timezone: "UTC",
    currency: "USD",
    ownerName: "Access Test",
    email: `nobody.${f.run}.${persona.toLowerCase()}@access.test`,
    password: "access test passphrase",
  }),
  ["app/(auth)/start/actions.ts#confirmShopAction"]: () => ({ token: "A".repeat(43), password: "access test passphrase" }),
  // A booking request (issue 16 §6) with a ticket no page signed: refused before anything is written.
  ["app/(public)/s/[shop]/booking-actions.ts#requestBookingAction"]: ({ persona }) => ({
    shop: "copper-gulch",
    ticket: "A".repeat(40),
    name: "Access Test",
    email: `booking.${persona.toLowerCase()}@access.test`,
    machine: "Access test machine",
    work: "Access test: nothing to do",
  }),
};
