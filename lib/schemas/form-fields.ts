import type { z } from "zod";
import { benchSettingsSchema, chainReadingSchema, partSchema, partStatusSchema, stepTorqueSchema, teardownDeleteSchema, teardownEditSchema, teardownStepSchema } from "./bench";
import { contactFormSchema, mergeFormSchema } from "./customers";
import { dropoffFields, dropoffSignatureFields } from "./dropoff";
import { addLineSchema, draftDetailsSchema, issueSchema, recordPaymentSchema, removeLineSchema, requestDepositSchema, voidSchema } from "./invoices";
import {
  LABOUR_RATE_ROWS,
  digestSettingsSchema,
  dropoffSettingsSchema,
  hoursSettingsSchema,
  labourSettingsSchema,
  profileSettingsSchema,
  regionSettingsSchema,
  suppliesSettingsSchema,
  taxSettingsSchema,
  toleranceSettingsSchema,
} from "./shop-settings";
import { WEEKDAYS } from "@/lib/shop-settings";
import { BOOKING_BANNER, BOOKING_VISIBLE } from "@/lib/booking";
import { bookingRequestSchema } from "./booking";
import { markupSettingsSchema } from "./parts-pricing";
import { backOrderSchema, coreChargeSchema, movePartSchema, orderPartsSchema, orderShopPartsSchema, partDepositSchema } from "./part-orders";
import { CONFIRM_SIGNUP_VISIBLE, SHOP_SIGNUP_VISIBLE } from "@/lib/shop-signup";
import { confirmSignupSchema, shopSignupSchema } from "./shop-signup";
import { answerSchema, findingInputSchema, recordDecisionSchema, withdrawSchema } from "./approvals";
import { linkRequestSchema, linkTokenSchema, passwordSignInSchema } from "./auth";
import { readingSchema, specSchema, torqueRecordSchema } from "./bench";
import { measurementSetSchema } from "./measurements";
import { MEASUREMENT_SET_VISIBLE } from "@/lib/measurements";
import { checkInFormSchema } from "./check-in";
import { frequencySchema, inviteFollowerSchema } from "./following";
import { textChoiceSchema, textSettingsSchema } from "./texts";
import { answerQuestionSchema, askQuestionSchema } from "./questions";
import { inboxPreferencesSchema } from "./inbox";
import { recordDepositSchema, refundSchema } from "./invoices";
import { statusChangeFields } from "./jobs";
import { acceptInviteSchema, changePasswordSchema, inviteStaffSchema, passwordResetRequestSchema, passwordResetSchema, staffRoleSchema } from "./staff";
import { FORM_VISIBLE } from "@/lib/form-visible";
import { shopProfileSchema, storyConsentFields, storyCurationSchema } from "@/lib/portfolio";

// Which field names each form renders, per form schema (issue 16 §7: every error appears beside
// the field that caused it, or as a message that says what to do). `visible`: inputs the person
// sees, each in a <Field> that shows `fieldError(name)`. `banner`: what the form fills itself
// (ids, versions) or never shows; their messages go in the form's banner, because the form passes
// `visible` to useBenchForm (components/bench/action-form.tsx; ActionButton has none visible). tests/unit/form-fields.test.ts walks each schema's error paths against this list,
// and the forms import their `visible` from here (or from the zod-free list it names, e.g.
// FORM_VISIBLE in lib/form-visible.ts), so the list can't drift from what they render.
// Every action and JSON handler is either listed here or in NOT_FORMS below
// (tests/unit/form-registry.test.ts).

export type FormFields = { schema: z.ZodType; visible: readonly string[]; banner: readonly string[] };

const shop = ["shop"] as const;
const invoiceRef = ["invoice", "version"] as const;

export const FORM_FIELDS = {
  profileSettings: { schema: profileSettingsSchema, visible: ["name", "email", "phone", "address"], banner: shop },
  hoursSettings: { schema: hoursSettingsSchema, visible: WEEKDAYS.flatMap((d) => [`${d}Closed`, `${d}Open`, `${d}Close`]), banner: shop },
  regionSettings: { schema: regionSettingsSchema, visible: ["timezone", "currency"], banner: shop },
  labourSettings: {
    schema: labourSettingsSchema,
    visible: ["defaultRate", ...Array.from({ length: LABOUR_RATE_ROWS }, (_, i) => [`rateName${i}`, `rateAmount${i}`]).flat()],
    banner: shop,
  },
  taxSettings: { schema: taxSettingsSchema, visible: ["taxMethod", "taxRate", "labourTaxRate", "feeTaxRate", "suppliesTaxRate", "partsTaxable", "labourTaxable", "feesTaxable"], banner: shop },
  markupSettings: { schema: markupSettingsSchema, visible: ["markupKind", "markupPercent", "band1UpTo", "band1Percent", "band2UpTo", "band2Percent", "topPercent"], banner: shop },
  suppliesSettings: { schema: suppliesSettingsSchema, visible: ["suppliesPercent", "suppliesBase", "suppliesCap", "suppliesTaxable"], banner: shop },
  toleranceSettings: { schema: toleranceSettingsSchema, visible: ["toleranceKind", "tolerancePercent", "toleranceFixed", "toleranceCap"], banner: shop },
  digestSettings: { schema: digestSettingsSchema, visible: ["digestWindowMinutes"], banner: shop },
  dropoffSettings: { schema: dropoffSettingsSchema, visible: ["dropoffCharge", "dropoffUpTo"], banner: shop },
  benchSettings: { schema: benchSettingsSchema, visible: ["torqueUnit", "passes", "wrenchClass", "chainLimitPct", "clipMaxMinutes", "clipMaxGb", "ownerWaitDays"], banner: shop },
  // The bench page (app/(staff)/shop/[shop]/jobs/[number]/bench/_components/).
  part: { schema: partSchema, visible: ["description", "partNumber", "supplier", "qty", "cost", "status", "expectedOn", "forWork"], banner: ["job"] },
  partStatus: { schema: partStatusSchema, visible: ["to", "expectedOn"], banner: ["job", "part", "from"] },
  // Issue 19 ordering (bench page, part-order-forms.tsx): the ticked parts' ids travel in one hidden field whose message shows beside the boxes.
  orderParts: { schema: orderPartsSchema, visible: ["supplier", "reference", "orderedOn", "expectedOn", "parts"], banner: ["job"] },
  orderShopParts: { schema: orderShopPartsSchema, visible: ["supplier", "reference", "orderedOn", "expectedOn", "parts"], banner: ["shop"] },
  backOrder: { schema: backOrderSchema, visible: ["expectedOn"], banner: ["job", "part"] },
  movePart: { schema: movePartSchema, visible: ["toJob", "thisJob"], banner: ["job", "part"] },
  coreCharge: { schema: coreChargeSchema, visible: ["charge"], banner: ["job", "part"] },
  partDeposit: { schema: partDepositSchema, visible: ["amount", "note"], banner: ["job", "part"] },
  teardownStep: { schema: teardownStepSchema, visible: ["removed", "count", "size", "notes", "storage", "photo"], banner: ["job"] },
  teardownEdit: { schema: teardownEditSchema, visible: ["removed", "count", "size", "notes", "storage"], banner: ["job", "step", "version"] },
  // The delete button beside a step's edit form: everything is filled by the page, messages go in its banner.
  teardownDelete: { schema: teardownDeleteSchema, visible: [], banner: ["job", "step", "version"] },
  stepTorque: {
    schema: stepTorqueSchema,
    visible: ["torqueValue", "torqueUnit", "boltCount", "angleStages", "lubrication", "lubricationOther", "retorqueSequence"],
    banner: ["job", "step", "loosenRetorque", "oneTime", "plausibleChecked"],
  },
  chainReading: { schema: chainReadingSchema, visible: ["label", "pitchMm", "pitches", "measuredMm", "limitPct", "sprocketTeeth", "source"], banner: ["job", "countChecked"] },
  // The invoice page (app/(staff)/shop/[shop]/jobs/[number]/invoice/_components/draft-forms.tsx).
  // "qty"/"unitPrice", "hours"/"rate" and "amount" are shown by kind; the server names the one
  // the chosen kind needs (lib/server/invoices.ts addLine).
  addLine: { schema: addLineSchema, visible: ["kind", "description", "qty", "unitPrice", "hours", "rate", "amount", "taxable"], banner: [...invoiceRef, "partNumber"] },
  removeLine: { schema: removeLineSchema, visible: [], banner: [...invoiceRef, "line"] },
  draftDetails: { schema: draftDetailsSchema, visible: ["discountKind", "discountValue", "returnedPartsNote", "note"], banner: invoiceRef },
  issue: { schema: issueSchema, visible: [], banner: [...invoiceRef, "confirmed"] },
  void: { schema: voidSchema, visible: ["reason"], banner: [...invoiceRef, "confirmed"] },
  recordPayment: { schema: recordPaymentSchema, visible: ["method", "amount", "reference"], banner: ["invoice"] },
  requestDeposit: { schema: requestDepositSchema, visible: ["amount", "note", "request"], banner: ["job"] },
  // The customer page (app/(staff)/shop/[shop]/customers/[customer]/_components/).
  customerContact: { schema: contactFormSchema, visible: ["name", "email", "phone", "contactPreference"], banner: [...shop, "customer"] },
  customerMerge: { schema: mergeFormSchema, visible: ["duplicate", "confirm"], banner: [...shop, "customer"] },
  // The drop-off authorisation (app/(staff)/shop/[shop]/jobs/[number]/_components/dropoff-forms.tsx,
  // components/dropoff/sign-form.tsx); "job" is added by the actions and filled by the forms.
  dropoffPrepare: { schema: dropoffFields, visible: FORM_VISIBLE.dropoffPrepare, banner: ["job"] },
  dropoffSign: { schema: dropoffSignatureFields, visible: FORM_VISIBLE.dropoffSign, banner: ["job", "shownHash"] },
  // A new shop (app/(auth)/start/) and the public page's booking request (app/(public)/s/[shop]/_components/booking-form.tsx).
  shopSignup: { schema: shopSignupSchema, visible: SHOP_SIGNUP_VISIBLE, banner: [] },
  confirmSignup: { schema: confirmSignupSchema, visible: CONFIRM_SIGNUP_VISIBLE, banner: ["token"] },
  bookingRequest: { schema: bookingRequestSchema, visible: BOOKING_VISIBLE, banner: BOOKING_BANNER },
  // Signing in, the password pages and joining a shop (app/(auth)/, app/(staff)/shop/[shop]/account/).
  // "next" (where to go after) is added by the sign-in actions and filled by the forms.
  passwordSignIn: { schema: passwordSignInSchema, visible: FORM_VISIBLE.passwordSignIn, banner: ["next"] },
  ownerLink: { schema: linkRequestSchema, visible: FORM_VISIBLE.ownerLink, banner: ["next"] },
  linkSignIn: { schema: linkTokenSchema, visible: FORM_VISIBLE.linkSignIn, banner: ["token", "next"] },
  passwordResetRequest: { schema: passwordResetRequestSchema, visible: FORM_VISIBLE.passwordResetRequest, banner: [] },
  passwordReset: { schema: passwordResetSchema, visible: FORM_VISIBLE.passwordReset, banner: ["token"] },
  acceptInvite: { schema: acceptInviteSchema, visible: FORM_VISIBLE.acceptInvite, banner: ["token"] },
  changePassword: { schema: changePasswordSchema, visible: FORM_VISIBLE.changePassword, banner: [] },
  // The staff page (app/(staff)/shop/[shop]/staff/_components/): the role form's select is its only field.
  inviteStaff: { schema: inviteStaffSchema, visible: FORM_VISIBLE.inviteStaff, banner: shop },
  staffRole: { schema: staffRoleSchema, visible: FORM_VISIBLE.staffRole, banner: [...shop, "user"] },
  // Check-in (app/(staff)/shop/[shop]/jobs/new/_components/), the job's status (jobs/[number]/_components/status-form.tsx).
  checkIn: { schema: checkInFormSchema, visible: FORM_VISIBLE.checkIn, banner: shop },
  statusChange: { schema: statusChangeFields, visible: FORM_VISIBLE.statusChange, banner: ["job", "from"] },
  // The invoice's deposit and refund forms (invoice/_components/payment-forms.tsx).
  recordDeposit: { schema: recordDepositSchema, visible: FORM_VISIBLE.recordDeposit, banner: ["deposit"] },
  refund: { schema: refundSchema, visible: FORM_VISIBLE.refund, banner: ["job", "payment", "confirmed"] },
  // The findings page (JSON to /api/jobs/[job]/findings…, /api/approvals/[request]/…): the editor
  // shows "evidence…" and "lines…" messages in its evidence and lines sections.
  finding: { schema: findingInputSchema, visible: FORM_VISIBLE.finding, banner: ["version"] },
  recordDecision: { schema: recordDecisionSchema, visible: FORM_VISIBLE.recordDecision, banner: ["shownHash", "lines", "method", "wantsPartsBack"] },
  withdraw: { schema: withdrawSchema, visible: FORM_VISIBLE.withdraw, banner: [] },
  // The owner's pages (app/(owner)/my/jobs/[job]/): answering a request, followers, story consent
  // ("job" is added by the consent action and filled by the form; the frequency radios say their message in the banner).
  answer: { schema: answerSchema, visible: FORM_VISIBLE.answer, banner: ["shownHash", "lines", "wantsPartsBack", "confirmed"] },
  inviteFollower: { schema: inviteFollowerSchema, visible: FORM_VISIBLE.inviteFollower, banner: ["job"] },
  // Questions on a job (app/(owner)/my/jobs/[job]/_components/ask-form.tsx, the staff job page's
  // answer-question-form.tsx); job, request and question are filled by the pages.
  askQuestion: { schema: askQuestionSchema, visible: FORM_VISIBLE.askQuestion, banner: ["job", "request"] },
  answerQuestion: { schema: answerQuestionSchema, visible: FORM_VISIBLE.answerQuestion, banner: ["job", "question"] },
  frequency: { schema: frequencySchema, visible: FORM_VISIBLE.frequency, banner: ["job", "frequency"] },
  // Texts (issue 21): the owner's texts page; the shop's settings section.
  textChoice: { schema: textChoiceSchema, visible: FORM_VISIBLE.textChoice, banner: ["job"] },
  textSettings: { schema: textSettingsSchema, visible: ["smsFrom", "quietStart", "quietEnd", "languageEs", "languageFr"], banner: ["shop"] },
  storyConsent: { schema: storyConsentFields, visible: FORM_VISIBLE.storyConsent, banner: ["job", "decision", "shownHash"] },
  // The portfolio (app/(staff)/shop/[shop]/portfolio/_components/): "items" is the story editor's JSON, filled by the page.
  storyCuration: { schema: storyCurationSchema, visible: FORM_VISIBLE.storyCuration, banner: [...shop, "story", "version", "items"] },
  shopProfile: { schema: shopProfileSchema, visible: FORM_VISIBLE.shopProfile, banner: shop },
  // The desk inbox's delivery choices (inbox/settings/settings-form.tsx) and the spec library (specs/_components/spec-form.tsx).
  inboxSettings: { schema: inboxPreferencesSchema, visible: FORM_VISIBLE.inboxSettings, banner: shop },
  spec: { schema: specSchema, visible: FORM_VISIBLE.spec, banner: shop },
  // The bench's torque and reading forms (jobs/[number]/bench/_components/).
  torqueRecord: { schema: torqueRecordSchema, visible: FORM_VISIBLE.torqueRecord, banner: ["job", "plausibleChecked", "passesDone", "checkPass", "share", "angleDone", "loosenRetorque", "oneTime"] },
  reading: { schema: readingSchema, visible: FORM_VISIBLE.reading, banner: ["job"] },
  // Measurement sets on the bench page (bench/_components/measurement-form.tsx): numbered rows, one per item.
  measurementSet: { schema: measurementSetSchema, visible: MEASUREMENT_SET_VISIBLE, banner: ["job"] },
} satisfies Record<string, FormFields>;

/**
 * Server actions and JSON/upload handlers that are no form with fields a person types (by
 * `file#export` / `METHOD /route`, as tests/support/declarations.ts names them), each with why
 * its errors need no field. tests/unit/form-registry.test.ts fails on a declaration that is in
 * neither this nor FORM_FIELDS, and on a line here that matches nothing.
 */
export const NOT_FORMS: Record<string, string> = {
  "app/(owner)/my/jobs/[job]/texts/actions.ts#stopTextsAction": "a button; the job is filled by the page, its message shows beside the button",
  "app/(auth)/sign-in/actions.ts#signOutAction": "a button with no fields",
  "app/(auth)/sign-in/actions.ts#signOutEverywhereAction": "a button with no fields",
  "app/(owner)/my/jobs/[job]/following-actions.ts#removeFollowerAction": "a confirm button; job and follower ids are filled by the page, its message shows beside the button",
  "app/(owner)/my/jobs/[job]/invoice/actions.ts#payInvoiceAction": "a pay button; the invoice id is filled by the page, its message shows in the banner",
  "app/(owner)/my/jobs/[job]/invoice/actions.ts#payDepositAction": "a pay button; the deposit id is filled by the page, its message shows in the banner",
  "app/(staff)/shop/[shop]/inbox/actions.ts#markReadAction": "a button; shop and item ids are filled by the page",
  "app/(staff)/shop/[shop]/inbox/actions.ts#markAllReadAction": "a button; its hidden fields copy the list's filter and newest item",
  "app/(staff)/shop/[shop]/jobs/[number]/bench/actions.ts#tickStepAction": "a reassembly tick (ActionButton): job, step and value are filled by the page",
  "app/(staff)/shop/[shop]/jobs/[number]/bench/actions.ts#markReplacedAction": "a reassembly toggle (ActionButton): job, step and value are filled by the page",
  "POST /api/jobs/[job]/reassembly-ticks": "the reassembly tick sent later by the phone's outbox: job, step and value were filled by the page; a refusal shows on the queued item",
  "POST /api/jobs/[job]/reassembly-replaced": "the “replaced with new” toggle sent later by the phone's outbox: job, step and value were filled by the page; a refusal shows on the queued item",
  "app/(staff)/shop/[shop]/jobs/[number]/bench/part-order-actions.ts#coreReturnedAction": "“Core returned” (ActionButton): job and part are filled by the page",
  "app/(staff)/shop/[shop]/jobs/[number]/bench/part-order-actions.ts#specialOrderAction": "a special-order toggle (ActionButton): job, part and value are filled by the page",
  "app/(staff)/shop/[shop]/parts/actions.ts#receiveOrderAction": "“Order received” (ActionButton): shop and order are filled by the page",
  "app/(staff)/shop/[shop]/jobs/[number]/bench/measurement-actions.ts#draftSetFindingAction": "“Draft a finding” on a measurement set (ActionButton): job and set are filled by the page",
  "app/(staff)/shop/[shop]/jobs/[number]/dropoff-actions.ts#prepareStandardDropoffAction": "a button (the shop's standard terms); the job id is filled by the page",
  "app/(staff)/shop/[shop]/jobs/[number]/dropoff-actions.ts#sendDropoffLinkAction": "a button; the job id is filled by the page",
  "app/(staff)/shop/[shop]/jobs/[number]/invoice/actions.ts#createInvoiceAction": "a button; the job id is filled by the page",
  "app/(staff)/shop/[shop]/jobs/[number]/invoice/actions.ts#syncAuthorisedAction": "a button; invoice and version are filled by the page",
  "app/(staff)/shop/[shop]/outbox/actions.ts#retryMailAction": "a retry button; shop and mail ids are filled by the page",
  "app/(staff)/shop/[shop]/portfolio/actions.ts#proposeAction": "a button; shop and job are filled by the page",
  "app/(staff)/shop/[shop]/portfolio/actions.ts#publishAction": "a button (ActionButton); shop and story are filled by the page",
  "app/(staff)/shop/[shop]/portfolio/actions.ts#unpublishAction": "a button (ActionButton); shop and story are filled by the page",
  "app/(staff)/shop/[shop]/portfolio/actions.ts#askOwnerAction": "a button (ActionButton); shop and story are filled by the page",
  "app/(staff)/shop/[shop]/specs/actions.ts#deleteSpecAction": "a delete button; shop and spec ids are filled by the page",
  "app/(staff)/shop/[shop]/staff/actions.ts#deactivateStaffAction": "a button; shop and user ids are filled by the page, every message shows beside it",
  "app/(staff)/shop/[shop]/staff/actions.ts#reactivateStaffAction": "a button; shop and user ids are filled by the page, every message shows beside it",
  "app/(staff)/shop/[shop]/staff/actions.ts#revokeInviteAction": "a button; shop and invite ids are filled by the page, every message shows beside it",
  "app/unsubscribe/[token]/actions.ts#unsubscribeAction": "a confirm button; the token comes from the e-mailed link",
  "POST /api/jobs/[job]/findings/[finding]/send": "the send button: the finding version on screen is filled by the page, the refusal shows in the send panel",
  "POST /api/jobs/[job]/entries": "the journal composers (note, photos) post JSON they build; a refusal shows in the composer's own banner",
  "PATCH /api/jobs/[job]/entries/[entry]": "caption, note and sharing edits built by the journal; a refusal shows in its own banner",
  "DELETE /api/jobs/[job]/entries/[entry]": "a delete button; the version is filled by the page",
  "POST /api/jobs/[job]/clips": "the clip uploader's JSON (file name, size, type from the chosen file); a refusal shows in the uploader",
  "POST /api/jobs/[job]/clips/[clip]/moments": "the moment marker's JSON (the player's time and a label); a refusal shows beside the marker",
  "POST /api/jobs/[job]/photos": "a photo upload (multipart, streamed); a refusal shows on the photo's tile",
};
