// The fields some forms show beside their inputs: FORM_FIELDS' `visible` (lib/schemas/form-fields.ts,
// checked by tests/unit/form-fields.test.ts) for forms whose components shouldn't load a schema
// (zod) just to know them. No imports but zod-free ones, so any client component may use this.
import type { FieldErrors } from "@/lib/errors";
import { INBOX_KINDS } from "@/lib/shop-events";

export const FORM_VISIBLE = {
  passwordSignIn: ["email", "password"],
  ownerLink: ["email"],
  linkSignIn: [],
  passwordResetRequest: ["email"],
  passwordReset: ["password"],
  acceptInvite: ["name", "password"],
  changePassword: ["current", "password"],
  inviteStaff: ["name", "email", "role"],
  staffRole: ["role"],
  checkIn: [
    ...["customerMode", "customerId", "customerName", "customerEmail", "customerPhone"],
    ...["machineMode", "machineId", "machineKind", "machineYear", "machineMake", "machineModel", "machineEngineCc", "machineSerial", "machineHours", "machineOdometer", "machineOdometerUnit"],
    ...["concern", "intakeNotes", "promisedOn", "technicianId", "textConsent"],
  ],
  statusChange: ["to", "note", "override"],
  recordDeposit: ["method", "reference"],
  refund: ["amount", "reason"],
  finding: ["title", "found", "whyItMatters", "safety", "evidence", "lines"],
  // The line answers show "lines.<no>" messages beside each line; the list itself, the method
  // radios and the parts-back box say theirs in the banner.
  recordDecision: ["personName", "phoneCalled", "decidedAt", "note"],
  withdraw: ["reason"],
  answer: ["signature"],
  inviteFollower: ["email"],
  // Questions on a job (issue 21): the line picker is shown on the approval request page only.
  askQuestion: ["body", "line"],
  answerQuestion: ["body"],
  // The radios say their message in the banner.
  frequency: [],
  // Texts (issue 21): the owner's choice and consent on their page.
  textChoice: ["channels", "phone", "consent"],
  storyConsent: ["name"],
  storyCuration: ["title", "slug", "writeUp", "cover"],
  shopProfile: ["displayName", "about", "takesIn", "locationText", "showLocation", "publicEmail", "publicPhone", "removeLogo", "logo"],
  inboxSettings: INBOX_KINDS,
  spec: ["make", "model", "kind", "label", "value", "unit", "min", "max", "boltCount", "notes", "source"],
  // Its tick boxes (passes done, check pass, value checked, share, angle done, loosen-and-retorque,
  // one-time) show no message of their own.
  torqueRecord: [
    ...["fastener", "specValue", "unit", "appliedValue", "boltCount", "wrenchClass", "tolerancePct", "passes", "tool", "note"],
    // Issue 18 §3–4: the wrench's details and how the fastener was tightened (torque-special-fields.tsx).
    ...["toolSerial", "calibratedOn", "wrenchMax", "wrenchMaxUnit", "angleStages", "lubrication", "lubricationOther", "retorqueSequence"],
  ],
  reading: ["label", "value", "unit", "min", "max", "source"],
  // Drop-off authorisation: the desk prepares it on the staff job page, the owner signs it on theirs.
  dropoffPrepare: ["chargeKind", "chargeAmount", "chargeHours", "description", "authorisedUpTo", "terms"],
  dropoffSign: ["signature", "wantsPartsBack", "agree"],
} as const satisfies Record<string, readonly string[]>;

const BESIDE = "Some fields need attention: see the messages beside them.";

/**
 * The banner of a refused form: the message when no field is named; otherwise the messages of the
 * fields the form doesn't show (ids, versions it fills itself), and, for the ones beside their
 * inputs, a pointer to them; a refusal that isn't about what was typed (too many tries, a
 * conflict) keeps its own message instead, since it says more. Without `visible`, every field
 * counts as shown.
 */
export function formBanner(error: { code?: string; message: string; fields?: FieldErrors } | null | undefined, visible?: readonly string[]): string | null {
  if (!error) return null;
  if (!error.fields) return error.message;
  const names = Object.keys(error.fields);
  if (!names.length) return null;
  const unseen = visible ? names.filter((n) => !visible.includes(n)).map((n) => error.fields![n]![0]!) : [];
  const beside = visible ? names.some((n) => visible.includes(n)) : true;
  const pointer = error.code === undefined || error.code === "invalid" ? BESIDE : error.message;
  return [...new Set([...unseen, ...(beside ? [pointer] : [])])].join(" ");
}
