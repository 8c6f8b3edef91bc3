import "server-only";
import { Body, Button, Container, Head, Heading, Hr, Html, Preview, Section, Text } from "@react-email/components";
import { render } from "@react-email/render";
import { mailColors as C, mailFont } from "./theme";

// Invoices, deposit requests and receipts: one plain layout (the shop, a heading, a few sentences,
// a table of amounts, one button). Transactional mail to the machine's owner only, so no
// unsubscribe footer; followers never get it. The text part is written out from the same content.

export type MoneyMailContent = {
  shopName: string;
  /** "J-0005 · 2019 Tessaro Ridgeline 570" */
  context: string;
  subject: string;
  preview: string;
  heading: string;
  greeting: string;
  paragraphs: string[];
  /** Label and amount rows; the last one is shown in bold. */
  rows: [string, string][];
  button: { href: string; label: string } | null;
  footnote: string;
};

export function MoneyEmail(p: MoneyMailContent) {
  const cell = { padding: "8px 0", borderBottom: `1px solid ${C.line}`, fontSize: "15px", color: C.ink, verticalAlign: "top" } as const;
  return (
    <Html lang="en">
      <Head />
      <Preview>{p.preview}</Preview>
      <Body style={{ backgroundColor: C.paper, fontFamily: mailFont, margin: 0, padding: "24px 0" }}>
        <Container style={{ backgroundColor: C.surface, border: `1px solid ${C.line}`, borderRadius: "12px", padding: "24px", maxWidth: "560px" }}>
          <Text style={{ color: C.inkMuted, fontSize: "14px", margin: 0 }}>
            {p.shopName} · {p.context}
          </Text>
          <Heading as="h1" style={{ color: C.ink, fontSize: "22px", lineHeight: "1.3", margin: "8px 0 16px" }}>
            {p.heading}
          </Heading>
          <Text style={{ color: C.ink, fontSize: "16px" }}>{p.greeting}</Text>
          {p.paragraphs.map((text) => (
            <Text key={text} style={{ color: C.ink, fontSize: "16px" }}>
              {text}
            </Text>
          ))}
          <table role="presentation" width="100%" cellPadding={0} cellSpacing={0} style={{ borderCollapse: "collapse" }}>
            <tbody>
              {p.rows.map(([label, value], i) => {
                const last = i === p.rows.length - 1;
                return (
                  <tr key={label}>
                    <td style={{ ...cell, fontWeight: last ? 700 : 400 }}>{label}</td>
                    <td style={{ ...cell, textAlign: "right", whiteSpace: "nowrap", paddingLeft: "12px", fontWeight: last ? 700 : 400 }}>{value}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          {p.button ? (
            <Section style={{ textAlign: "center", margin: "20px 0" }}>
              <Button href={p.button.href} style={{ backgroundColor: C.oil, color: C.onOil, borderRadius: "8px", padding: "14px 24px", fontSize: "17px", fontWeight: 700 }}>
                {p.button.label}
              </Button>
            </Section>
          ) : null}
          <Hr style={{ borderColor: C.line }} />
          <Text style={{ color: C.inkMuted, fontSize: "13px" }}>{p.footnote}</Text>
        </Container>
      </Body>
    </Html>
  );
}

export function moneyMailText(p: MoneyMailContent): string {
  return [
    `${p.shopName} · ${p.context}`,
    "",
    p.heading,
    "",
    p.greeting,
    ...p.paragraphs.flatMap((text) => ["", text]),
    "",
    ...p.rows.map(([label, value]) => `${label}: ${value}`),
    ...(p.button ? ["", `${p.button.label}: ${p.button.href}`] : []),
    "",
    p.footnote,
  ].join("\n");
}

export async function renderMoneyMail(p: MoneyMailContent): Promise<{ subject: string; html: string; text: string }> {
  return { subject: p.subject.slice(0, 300), html: await render(<MoneyEmail {...p} />), text: moneyMailText(p) };
}
