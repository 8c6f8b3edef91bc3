import "server-only";
import type { ReactElement } from "react";
import { render } from "@react-email/render";

/** An e-mail's HTML and its text part, both from the same template (the text part is derived from the HTML). */
export async function renderMail(element: ReactElement): Promise<{ html: string; text: string }> {
  const [html, text] = await Promise.all([render(element), render(element, { plainText: true })]);
  return { html, text };
}
