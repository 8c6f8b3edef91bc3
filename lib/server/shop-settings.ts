import "server-only";
import { getMoneySettings, saveMoneySettings } from "@/db/queries/findings";
import { type DropoffStandard, type NamedRate, getDropoffStandard, getNamedRates, saveDropoffStandard, getShopRowSettings, insertSettingChange, listSettingChanges, lockShopRow, saveNamedRates, updateShopRow } from "@/db/queries/shop-settings";
import { type Tx, transaction } from "@/db/transaction";
import type { ShopMoneySettings } from "@/lib/approvals";
import { AppError } from "@/lib/errors";
import { type SuppliesSetting, type TaxKindRates, type TaxSetting, type ToleranceSetting, parseMoney, parsePercent } from "@/lib/money";
import type { Actor } from "@/lib/permissions";
import type {
  DigestSettingsInput,
  DropoffSettingsInput,
  HoursSettingsInput,
  LabourSettingsInput,
  ProfileSettingsInput,
  RegionSettingsInput,
  SuppliesSettingsInput,
  TaxSettingsInput,
  ToleranceSettingsInput,
} from "@/lib/schemas/shop-settings";
import { LABOUR_RATE_ROWS } from "@/lib/schemas/shop-settings";
import { type OpeningHours, TOLERANCE_PRESETS, WEEKDAYS, minorToInput } from "@/lib/shop-settings";
import type { Resolved } from "@/lib/server/access";
// Names the form field of an `invalid` error, so the form shows it beside that field.
import { onField as field } from "@/lib/server/bench";

// The owner's shop settings, one section at a time. Each save runs in one transaction with the
// shop row locked: read the section as it stands, write the new values, and record who changed
// what (shop_setting_changes, before and after). Money settings reach new estimates and invoices
// only: a sent request and an invoice keep the pricing they were made with (their snapshots).

export const SETTING_SECTIONS = ["profile", "hours", "region", "labour", "tax", "supplies", "tolerance", "dropoff", "digest", "bench", "markup", "texts"] as const;
export type SettingSection = (typeof SETTING_SECTIONS)[number];
export const SECTION_LABEL: Record<SettingSection, string> = {
  profile: "Profile and contact",
  hours: "Opening hours",
  region: "Time zone and currency",
  labour: "Labour rates",
  tax: "Tax",
  supplies: "Shop-supplies fee",
  tolerance: "Over-estimate tolerance",
  dropoff: "Standard drop-off terms",
  digest: "Update digest",
  bench: "Bench, clip and board settings",
  markup: "Parts markup",
  texts: "Text messages",
};

const percent = (key: string, text: string, what: string) => field(key, () => (parsePercent(text.replace(/\s*%$/, ""), what), text.replace(/\s*%$/, "")));
const money = (key: string, text: string, currency: string) => field(key, () => parseMoney(text, currency));

export type Save<T> = (tx: Tx, shopId: number) => Promise<{ before: T; after: T } | null>;

/** Saves one section with the shop row locked and records the change; also used by the bench settings (lib/server/bench-parts.ts). */
export async function saveSection<T>(actor: Actor, { shop }: Resolved<"shop">, section: SettingSection, save: Save<T>) {
  await transaction(async (tx) => {
    await lockShopRow(tx, { shopId: shop.id });
    const changed = await save(tx, shop.id);
    // Saving the same values again records nothing.
    if (changed && JSON.stringify(changed.before) !== JSON.stringify(changed.after)) {
      await insertSettingChange(tx, { shopId: shop.id, userId: actor.userId, section, before: changed.before, after: changed.after });
    }
  });
  return { shop };
}

async function moneySection<T>(tx: Tx, shopId: number, pick: (s: ShopMoneySettings) => T, change: (s: ShopMoneySettings, currency: string) => ShopMoneySettings) {
  const settings = await getMoneySettings({ shopId }, tx);
  const { currency } = await getShopRowSettings({ shopId }, tx);
  const next = change(settings, currency);
  await saveMoneySettings({ shopId, settings: next }, tx);
  return { before: pick(settings), after: pick(next) };
}

export async function saveProfile(actor: Actor, found: Resolved<"shop">, input: ProfileSettingsInput) {
  return saveSection(actor, found, "profile", async (tx, shopId) => {
    const { name, email, phone, address } = await getShopRowSettings({ shopId }, tx);
    const after = { name: input.name, email: input.email, phone: input.phone, address: input.address };
    await updateShopRow(tx, { shopId, change: after });
    return { before: { name, email, phone, address }, after };
  });
}

export async function saveHours(actor: Actor, found: Resolved<"shop">, input: HoursSettingsInput) {
  const values = input as Record<string, unknown>;
  const after = Object.fromEntries(WEEKDAYS.map((d) => [d, values[`${d}Closed`] ? null : { open: String(values[`${d}Open`]), close: String(values[`${d}Close`]) }])) as OpeningHours;
  return saveSection(actor, found, "hours", async (tx, shopId) => {
    const { openingHours } = await getShopRowSettings({ shopId }, tx);
    await updateShopRow(tx, { shopId, change: { openingHours: after } });
    return { before: openingHours, after };
  });
}

export async function saveRegion(actor: Actor, found: Resolved<"shop">, input: RegionSettingsInput) {
  return saveSection(actor, found, "region", async (tx, shopId) => {
    const { timezone, currency } = await getShopRowSettings({ shopId }, tx);
    const after = { timezone: input.timezone, currency: input.currency };
    await updateShopRow(tx, { shopId, change: after });
    return { before: { timezone, currency }, after };
  });
}

export async function saveLabour(actor: Actor, found: Resolved<"shop">, input: LabourSettingsInput) {
  const values = input as Record<string, string>;
  return saveSection(actor, found, "labour", async (tx, shopId) => {
    const named = await getNamedRates({ shopId }, tx);
    const changed = await moneySection(
      tx,
      shopId,
      (s) => s.labourRateMinor,
      (s, currency) => ({ ...s, labourRateMinor: values.defaultRate ? money("defaultRate", values.defaultRate, currency) : null }),
    );
    const { currency } = await getShopRowSettings({ shopId }, tx);
    const rates: NamedRate[] = [];
    for (let i = 0; i < LABOUR_RATE_ROWS; i++) {
      const name = values[`rateName${i}`] ?? "";
      if (name) rates.push({ name, rateMinor: money(`rateAmount${i}`, values[`rateAmount${i}`] ?? "", currency) });
    }
    await saveNamedRates(tx, { shopId, rates });
    return { before: { defaultRateMinor: changed.before, named }, after: { defaultRateMinor: changed.after, named: rates } };
  });
}

export async function saveTax(actor: Actor, found: Resolved<"shop">, input: TaxSettingsInput) {
  if (!input.taxRate) throw new AppError("invalid", "Enter the tax rate (0 for none).", { taxRate: ["Enter the tax rate (0 for none)."] });
  const ratePercent = percent("taxRate", input.taxRate, "The tax rate");
  const own = {
    labour: input.labourTaxRate ? percent("labourTaxRate", input.labourTaxRate, "The labour tax rate") : null,
    fee: input.feeTaxRate ? percent("feeTaxRate", input.feeTaxRate, "The fees tax rate") : null,
    supplies: input.suppliesTaxRate ? percent("suppliesTaxRate", input.suppliesTaxRate, "The shop-supplies tax rate") : null,
  };
  const kindRates = Object.fromEntries(Object.entries(own).filter(([, rate]) => rate != null)) as TaxKindRates;
  const tax: TaxSetting = Object.keys(kindRates).length ? { ratePercent, method: input.taxMethod, kindRates } : { ratePercent, method: input.taxMethod };
  return saveSection(actor, found, "tax", (tx, shopId) =>
    moneySection(
      tx,
      shopId,
      (s) => ({ tax: s.tax, taxable: s.taxable }),
      (s) => ({ ...s, tax, taxable: { part: input.partsTaxable, labour: input.labourTaxable, fee: input.feesTaxable } }),
    ),
  );
}

export async function saveSupplies(actor: Actor, found: Resolved<"shop">, input: SuppliesSettingsInput) {
  return saveSection(actor, found, "supplies", (tx, shopId) =>
    moneySection(
      tx,
      shopId,
      (s) => s.supplies,
      (s, currency) => {
        if (!input.suppliesPercent) return { ...s, supplies: null };
        const supplies: SuppliesSetting = {
          percent: percent("suppliesPercent", input.suppliesPercent, "The shop-supplies percent"),
          base: input.suppliesBase,
          capMinor: input.suppliesCap ? money("suppliesCap", input.suppliesCap, currency) : null,
          taxable: input.suppliesTaxable,
        };
        return { ...s, supplies };
      },
    ),
  );
}

export async function saveTolerance(actor: Actor, found: Resolved<"shop">, input: ToleranceSettingsInput) {
  return saveSection(actor, found, "tolerance", (tx, shopId) =>
    moneySection(
      tx,
      shopId,
      (s) => s.tolerance,
      (s, currency) => {
        let tolerance: ToleranceSetting;
        if (input.toleranceKind === "strict") tolerance = { kind: "strict" };
        else if (input.toleranceKind === "custom") {
          tolerance = {
            kind: "greater_of",
            percent: input.tolerancePercent ? percent("tolerancePercent", input.tolerancePercent, "The tolerance percent") : "0",
            fixedMinor: input.toleranceFixed ? money("toleranceFixed", input.toleranceFixed, currency) : 0,
            capMinor: input.toleranceCap ? money("toleranceCap", input.toleranceCap, currency) : null,
          };
        } else {
          const message = "These amounts are in US dollars: choose Custom and enter your own.";
          if (currency !== "USD") throw new AppError("invalid", message, { toleranceKind: [message] });
          tolerance = { ...TOLERANCE_PRESETS[input.toleranceKind].setting };
        }
        return { ...s, tolerance };
      },
    ),
  );
}

export async function saveDropoffTerms(actor: Actor, found: Resolved<"shop">, input: DropoffSettingsInput) {
  return saveSection(actor, found, "dropoff", async (tx, shopId) => {
    const { currency } = await getShopRowSettings({ shopId }, tx);
    const before = await getDropoffStandard({ shopId }, tx);
    const after: DropoffStandard | null = input.dropoffCharge && input.dropoffUpTo ? { chargeMinor: money("dropoffCharge", input.dropoffCharge, currency), upToMinor: money("dropoffUpTo", input.dropoffUpTo, currency) } : null;
    if (after && after.upToMinor < after.chargeMinor) throw new AppError("invalid", "The authorised amount can't be less than the diagnosis charge.", { dropoffUpTo: ["At least the diagnosis charge."] });
    await saveDropoffStandard(tx, { shopId, standard: after });
    return { before, after };
  });
}

export async function saveDigest(actor: Actor, found: Resolved<"shop">, input: DigestSettingsInput) {
  return saveSection(actor, found, "digest", async (tx, shopId) => {
    const { digestWindowMinutes } = await getShopRowSettings({ shopId }, tx);
    await updateShopRow(tx, { shopId, change: { digest_window_minutes: input.digestWindowMinutes } });
    return { before: { digestWindowMinutes }, after: { digestWindowMinutes: input.digestWindowMinutes } };
  });
}

/** The invoice's add-line form: the default rate and the named ones, as the text a rate field takes. */
export async function labourRateChoices(shopId: number, currency: string) {
  const [moneySettings, named] = await Promise.all([getMoneySettings({ shopId }), getNamedRates({ shopId })]);
  return {
    defaultRate: moneySettings.labourRateMinor == null ? null : minorToInput(moneySettings.labourRateMinor, currency),
    named: named.map((r) => ({ name: r.name, rate: minorToInput(r.rateMinor, currency) })),
  };
}

/** Everything the settings page shows. */
export async function settingsPageData(shopId: number) {
  const [row, moneySettings, named, dropoff, changes] = await Promise.all([
    getShopRowSettings({ shopId }),
    getMoneySettings({ shopId }),
    getNamedRates({ shopId }),
    getDropoffStandard({ shopId }),
    listSettingChanges({ shopId, limit: 15 }),
  ]);
  return { row, money: moneySettings, named, dropoff, changes };
}
