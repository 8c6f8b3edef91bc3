import { Field, Input } from "@/components/ui";
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from "@/lib/password-rules";

/** The one way to choose a password (invitation, reset, account page): the rules said up front, no composition rules. */
export function NewPasswordField({ id, label, error }: { id: string; label: string; error?: string }) {
  return (
    <Field
      id={id}
      label={label}
      hint={`At least ${PASSWORD_MIN_LENGTH} characters, up to ${PASSWORD_MAX_LENGTH}. Spaces and any characters are fine; a few words in a row are easy to remember. Common passwords are refused.`}
      error={error}
      required
    >
      <Input name="password" type="password" autoComplete="new-password" />
    </Field>
  );
}
