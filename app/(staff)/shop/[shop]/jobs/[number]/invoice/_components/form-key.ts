// React resets a form after its action answers, to the defaults it rendered with first: a select
// would fall back to its first option (a cheque recorded as cash). A key that changes with each
// answer and with the stored invoice remounts the form instead, so every field starts from what
// was typed (after an error) or what is now stored (after a save).
export function formKey(state: unknown, ...stored: (string | number)[]): string {
  return `${stored.join(":")}|${JSON.stringify(state ?? null)}`;
}
