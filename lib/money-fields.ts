// What counts as money in a response, once: amounts are integers in minor units whose names end
// in "Minor" (DESIGN.md §4); typed prices are the few text fields below; the approval warnings
// quote amounts in words. Responses to someone without `money:view` (lib/permissions.ts) leave
// through `stripMoney`, in the route wrapper, not route by route. Pure.

const MONEY_TEXT = ["unitPrice", "rate", "amount", "warnings"] as const;
const MONEY_TEXT_KEYS = new Set<string>(MONEY_TEXT);

/** The type of `stripMoney(value)`: the same shape without the money keys, at any depth. */
export type WithoutMoney<T> = T extends Date
  ? T
  : T extends readonly (infer U)[]
    ? WithoutMoney<U>[]
    : T extends object
      ? { [K in keyof T as K extends `${string}Minor` | (typeof MONEY_TEXT)[number] ? never : K]: WithoutMoney<T[K]> }
      : T;

export function isMoneyKey(key: string): boolean {
  return key.endsWith("Minor") || MONEY_TEXT_KEYS.has(key);
}

/** A copy of `value` without any money field, at any depth. */
export function stripMoney<T>(value: T): WithoutMoney<T> {
  if (Array.isArray(value)) return value.map((v) => stripMoney(v)) as WithoutMoney<T>;
  if (value === null || typeof value !== "object" || value instanceof Date) return value as WithoutMoney<T>;
  const out: Record<string, unknown> = {};
  for (const [key, v] of Object.entries(value as Record<string, unknown>)) {
    if (!isMoneyKey(key)) out[key] = stripMoney(v);
  }
  return out as WithoutMoney<T>;
}
