import type { ErrorBody } from "@/lib/errors";

/**
 * The form's banner: the message itself when no field is named; otherwise `besideFields` (the
 * messages are beside the fields) followed by any message about a field the form fills itself.
 */
export function bannerText(error: ErrorBody["error"], visible: readonly string[], besideFields = "Some fields need attention: see the messages beside them."): string {
  if (!error.fields) return error.message;
  const hidden = Object.entries(error.fields)
    .filter(([key]) => !visible.includes(key))
    .map(([, messages]) => messages?.[0])
    .filter(Boolean);
  return [besideFields, ...hidden].filter(Boolean).join(" ");
}
