// How a machine's owner likes to be reached, and the wording the desk sees. Pure.

export const CONTACT_PREFERENCES = ["email", "phone", "text"] as const;
export type ContactPreference = (typeof CONTACT_PREFERENCES)[number];

export const CONTACT_PREFERENCE_LABEL: Record<ContactPreference, string> = {
  email: "E-mail",
  phone: "Phone call",
  text: "Text message",
};

/** What a merge moved from the removed record to the kept one (kept in `customer_merges.moved`). */
export type MergeMoved = {
  jobIds: number[];
  machineIds: number[];
  took: string[];
};
