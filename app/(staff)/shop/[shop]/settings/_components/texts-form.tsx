"use client";
import { Field, Input } from "@/components/ui";
import { EXTRA_LANGUAGES, LANGUAGE_LABEL, type Language } from "@/lib/texts";
import { saveTextsAction } from "../actions";
import { Checkbox, SaveRow, SettingsFormTop, useSettingsForm } from "./use-settings-form";

const remount = (state: unknown, stored: unknown) => JSON.stringify([state ?? null, stored]);

const FIELD: Record<(typeof EXTRA_LANGUAGES)[number], "languageEs" | "languageFr"> = { es: "languageEs", fr: "languageFr" };

/** The shop's own sender number for texts, its quiet hours (texts queued then wait for the morning) and the languages it texts in. */
export function TextsForm({
  shopSlug,
  texts,
}: {
  shopSlug: string;
  texts: { smsFrom: string; quietStart: string; quietEnd: string; defaultFrom: string | null; languages: Language[] };
}) {
  const form = useSettingsForm(saveTextsAction, "textSettings");
  const { values, fieldError } = form;
  return (
    <form key={remount(form.state, texts)} action={form.formAction} className="space-y-4" aria-label="Text messages">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <Field
        id="texts-from"
        label="The shop's number for texts"
        hint={`Owners see texts come from it and reply to it. Empty: ${texts.defaultFrom ? `the service's shared number, ${texts.defaultFrom}` : "texts are off until a number is set"}.`}
        error={fieldError("smsFrom")}
      >
        <Input name="smsFrom" type="tel" inputMode="tel" defaultValue={values?.smsFrom ?? texts.smsFrom} placeholder="+15550100777" />
      </Field>
      <fieldset className="grid items-end gap-3 sm:grid-cols-2">
        <legend className="font-semibold text-ink">Quiet hours, on the shop&apos;s clock</legend>
        <Field id="texts-quiet-start" label="No texts from" error={fieldError("quietStart")}>
          <Input name="quietStart" type="time" defaultValue={values?.quietStart ?? texts.quietStart} />
        </Field>
        <Field id="texts-quiet-end" label="Until" error={fieldError("quietEnd")}>
          <Input name="quietEnd" type="time" defaultValue={values?.quietEnd ?? texts.quietEnd} />
        </Field>
      </fieldset>
      <fieldset className="space-y-1">
        <legend className="font-semibold text-ink">Languages the shop texts in</legend>
        <p className="text-sm text-ink-muted">
          Owners may send STOP, START and HELP in these languages and get the answer in the language they wrote in. English is always on. A stop word is honoured in every
          language; another word in a language not ticked reaches the desk as a question.
        </p>
        {EXTRA_LANGUAGES.map((language) => (
          <Checkbox
            key={language}
            name={FIELD[language]}
            label={LANGUAGE_LABEL[language]}
            defaultChecked={values ? values[FIELD[language]] === "on" : texts.languages.includes(language)}
            error={fieldError(FIELD[language])}
          />
        ))}
      </fieldset>
      <SaveRow form={form} label="Save text settings" />
    </form>
  );
}
