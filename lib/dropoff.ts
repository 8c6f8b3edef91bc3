// The authorisation signed at drop-off: a diagnosis / inspection charge and an "authorised up to"
// amount, in words the owner agrees to (REFERENCES §6: a written estimate and consent before work,
// no charge above it without further consent). Pure: the desk's screen, the owner's page and the
// server build and read the same snapshot; its canonical JSON (lib/approvals.ts) is what is hashed.
import { type DraftLine, canonicalJson } from "@/lib/approvals";
import { AppError } from "@/lib/errors";
import { formatHours, formatMoney, lineTotal } from "@/lib/money";

export const DROPOFF_METHODS = ["online", "in_person"] as const;
export type DropoffMethod = (typeof DROPOFF_METHODS)[number];
export const DROPOFF_METHOD_LABEL: Record<DropoffMethod, string> = { online: "Signed online", in_person: "Signed at the counter" };
export const DEFAULT_DIAGNOSIS_DESCRIPTION = "Inspection and diagnosis";

export type DiagnosisCharge =
  | { kind: "fee"; description: string; amountMinor: number; taxable: boolean }
  | { kind: "labour"; description: string; hoursTenths: number; rateMinor: number; taxable: boolean };

/** Exactly what the owner is shown and signs; its canonical JSON is hashed. */
export type DropoffSnapshot = {
  format: 1;
  authorisation: string;
  job: string;
  shop: string;
  machine: string;
  owner: string;
  currency: string;
  diagnosis: DiagnosisCharge & { netMinor: number };
  /** Pre-tax; includes the diagnosis charge. */
  authorisedUpToMinor: number;
  wording: string;
  /** Anything else the desk and the owner agreed, in the desk's words. */
  terms: string | null;
};

export function diagnosisNet(d: DiagnosisCharge): number {
  return d.kind === "fee"
    ? lineTotal({ kind: "fee", amountMinor: d.amountMinor, taxable: d.taxable })
    : lineTotal({ kind: "labour", hoursTenths: d.hoursTenths, rateMinor: d.rateMinor, taxable: d.taxable });
}

/** "$95.00" or "1.5 h at $90.00 an hour ($135.00)". */
export function describeCharge(d: DiagnosisCharge, currency: string): string {
  const net = formatMoney(diagnosisNet(d), currency);
  return d.kind === "fee" ? net : `${formatHours(d.hoursTenths)} h at ${formatMoney(d.rateMinor, currency)} an hour (${net})`;
}

/** The agreement in plain words; amounts before tax, as the consent rules compare them (REFERENCES §6). */
export function dropoffWording(p: { shop: string; machine: string; currency: string; diagnosis: DiagnosisCharge; authorisedUpToMinor: number }): string {
  const upTo = formatMoney(p.authorisedUpToMinor, p.currency);
  const charge = diagnosisNet(p.diagnosis) === 0 ? `${p.diagnosis.description.toLowerCase()}, at no charge` : `${p.diagnosis.description.toLowerCase()}, charged at ${describeCharge(p.diagnosis, p.currency)}`;
  return [
    `I leave my ${p.machine} with ${p.shop} for ${charge}.`,
    `I authorise work and parts up to ${upTo} in total before tax, the diagnosis charge included.`,
    `Nothing above that amount will be done or charged without my further consent, which the shop will ask for with the added parts, labour and new total.`,
  ].join(" ");
}

export function buildDropoffSnapshot(input: Omit<DropoffSnapshot, "format" | "diagnosis" | "wording" | "currency"> & { currency: string; diagnosis: DiagnosisCharge }): DropoffSnapshot {
  const netMinor = diagnosisNet(input.diagnosis);
  if (!Number.isSafeInteger(input.authorisedUpToMinor) || input.authorisedUpToMinor <= 0) {
    throw new AppError("invalid", "Enter the amount the owner authorises.", { authorisedUpTo: ["Enter an amount above zero."] });
  }
  if (input.authorisedUpToMinor < netMinor) {
    throw new AppError("invalid", "The authorised amount must cover the diagnosis charge.", { authorisedUpTo: [`Enter at least ${formatMoney(netMinor, input.currency)}, the diagnosis charge.`] });
  }
  const currency = input.currency.toUpperCase();
  return {
    format: 1,
    authorisation: input.authorisation,
    job: input.job,
    shop: input.shop,
    machine: input.machine,
    owner: input.owner,
    currency,
    diagnosis: { ...input.diagnosis, netMinor },
    authorisedUpToMinor: input.authorisedUpToMinor,
    wording: dropoffWording({ ...input, currency }),
    terms: input.terms,
  };
}

export function dropoffCanonical(s: DropoffSnapshot): string {
  return canonicalJson(s);
}

/** The invoice line the diagnosis charge becomes (none when it is free). */
export function diagnosisLine(s: DropoffSnapshot): DraftLine | null {
  const d = s.diagnosis;
  if (d.netMinor === 0) return null;
  const base = { description: d.description, partNumber: null, qtyThousandths: null, unitPriceMinor: null, taxable: d.taxable };
  return d.kind === "fee"
    ? { ...base, kind: "fee", hoursTenths: null, rateMinor: null, amountMinor: d.amountMinor }
    : { ...base, kind: "labour", hoursTenths: d.hoursTenths, rateMinor: d.rateMinor, amountMinor: null };
}

/** Reads a stored snapshot back, refusing anything that isn't one. */
export function asDropoffSnapshot(value: unknown): DropoffSnapshot {
  const s = value as DropoffSnapshot | null;
  if (!s || s.format !== 1 || !s.diagnosis || typeof s.wording !== "string" || typeof s.authorisedUpToMinor !== "number") {
    throw new AppError("conflict", "This authorisation's record is damaged. Ask the shop to prepare it again.");
  }
  return s;
}
