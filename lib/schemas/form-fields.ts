import type { z } from "zod";
import { benchSettingsSchema, chainReadingSchema, partSchema, partStatusSchema, stepTorqueSchema, teardownStepSchema } from "./bench";
import { contactFormSchema, mergeFormSchema } from "./customers";
import { dropoffFields, dropoffSignatureFields } from "./dropoff";
import { addLineSchema, draftDetailsSchema, issueSchema, recordPaymentSchema, removeLineSchema, requestDepositSchema, voidSchema } from "./invoices";
import {
  LABOUR_RATE_ROWS,
  digestSettingsSchema,
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
import { CONFIRM_SIGNUP_VISIBLE, SHOP_SIGNUP_VISIBLE } from "@/lib/shop-signup";
import { confirmSignupSchema, shopSignupSchema } from "./shop-signup";

// Which field names each form renders, per form schema (issue 16 §7: every error appears beside
// the field that caused it, or as a message that says what to do). `visible`: inputs the person
// sees, each in a <Field> that shows `fieldError(name)`. `banner`: what the form fills itself
// (ids, versions) or never shows; their messages go in the form's banner, because the form passes
// `visible` to useBenchForm (components/bench/action-form.tsx; ActionButton has none visible). tests/unit/form-fields.test.ts walks each schema's error paths against this list,
// and the forms import their `visible` from here, so the list can't drift from what they render.
// Not every form of the app is listed yet: a form joins when its schema is added here.

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
  taxSettings: { schema: taxSettingsSchema, visible: ["taxMethod", "taxRate", "partsTaxable", "labourTaxable", "feesTaxable"], banner: shop },
  suppliesSettings: { schema: suppliesSettingsSchema, visible: ["suppliesPercent", "suppliesBase", "suppliesCap", "suppliesTaxable"], banner: shop },
  toleranceSettings: { schema: toleranceSettingsSchema, visible: ["toleranceKind", "tolerancePercent", "toleranceFixed", "toleranceCap"], banner: shop },
  digestSettings: { schema: digestSettingsSchema, visible: ["digestWindowMinutes"], banner: shop },
  benchSettings: { schema: benchSettingsSchema, visible: ["torqueUnit", "passes", "chainLimitPct", "clipMaxMinutes", "clipMaxGb", "ownerWaitDays"], banner: shop },
  // The bench page (app/(staff)/shop/[shop]/jobs/[number]/bench/_components/).
  part: { schema: partSchema, visible: ["description", "partNumber", "supplier", "qty", "cost", "status", "expectedOn", "forWork"], banner: ["job"] },
  partStatus: { schema: partStatusSchema, visible: ["to", "expectedOn"], banner: ["job", "part", "from"] },
  teardownStep: { schema: teardownStepSchema, visible: ["removed", "count", "size", "notes", "storage", "photo"], banner: ["job"] },
  stepTorque: { schema: stepTorqueSchema, visible: ["torqueValue", "torqueUnit", "boltCount"], banner: ["job", "step"] },
  chainReading: { schema: chainReadingSchema, visible: ["label", "pitchMm", "pitches", "measuredMm", "limitPct", "source"], banner: ["job"] },
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
  dropoffPrepare: { schema: dropoffFields, visible: ["chargeKind", "chargeAmount", "chargeHours", "description", "authorisedUpTo", "terms"], banner: ["job"] },
  dropoffSign: { schema: dropoffSignatureFields, visible: ["signature", "wantsPartsBack", "agree"], banner: ["job", "shownHash"] },
  // A new shop (app/(auth)/start/) and the public page's booking request (app/(public)/s/[shop]/_components/booking-form.tsx).
  shopSignup: { schema: shopSignupSchema, visible: SHOP_SIGNUP_VISIBLE, banner: [] },
  confirmSignup: { schema: confirmSignupSchema, visible: CONFIRM_SIGNUP_VISIBLE, banner: ["token"] },
  bookingRequest: { schema: bookingRequestSchema, visible: BOOKING_VISIBLE, banner: BOOKING_BANNER },
} satisfies Record<string, FormFields>;
