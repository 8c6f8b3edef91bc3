// The shop's contact details as the owner's job page shows them. Pure.

/**
 * A tel: address for a phone number as the shop typed it: digits only, a leading "+" kept, and
 * null when there are too few digits to dial. RFC 3966 §3 allows visual separators ("-", ".",
 * "(", ")") in a tel: URI but phones dial the bare digits the same, so they are dropped.
 */
export function telHref(phone: string | null | undefined): string | null {
  if (!phone) return null;
  const trimmed = phone.trim();
  const digits = trimmed.replace(/\D/g, "");
  // ITU-T E.164 §6: at most 15 digits; anything under 3 can't be a number to call.
  if (digits.length < 3 || digits.length > 15) return null;
  return `tel:${trimmed.startsWith("+") ? "+" : ""}${digits}`;
}
