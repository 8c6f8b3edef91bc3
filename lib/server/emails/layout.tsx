import type { ReactNode } from "react";
import { Body, Container, Head, Heading, Hr, Html, Link, Preview, Section, Text } from "@react-email/components";
import { mailColors as c, mailFont } from "./theme";

export type MailFooter = {
  /** Why this person gets the mail, in one sentence. */
  reason: string;
  /** Where they choose how often (the job page). */
  manageUrl: string;
  /** The visible unsubscribe link; the same address as the List-Unsubscribe header. */
  unsubscribeUrl: string;
};

/** The frame of every Benchside e-mail: the shop's name on top, what it's about, then why you got it and how to stop it. */
export function MailLayout({ shopName, preview, heading, footer, children }: { shopName: string; preview: string; heading: string; footer: MailFooter; children: ReactNode }) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={{ backgroundColor: c.paper, color: c.ink, fontFamily: mailFont, margin: 0, padding: "24px 0" }}>
        <Container style={{ backgroundColor: c.surface, border: `1px solid ${c.line}`, borderRadius: 12, maxWidth: 600, padding: "24px" }}>
          <Text style={{ color: c.oil, fontSize: 14, fontWeight: 700, letterSpacing: 0.4, margin: 0, textTransform: "uppercase" }}>{shopName}</Text>
          <Heading as="h1" style={{ color: c.ink, fontSize: 24, lineHeight: "30px", margin: "8px 0 16px" }}>
            {heading}
          </Heading>
          {children}
          <Hr style={{ borderColor: c.line, margin: "24px 0 12px" }} />
          <Section>
            <Text style={{ color: c.inkMuted, fontSize: 13, lineHeight: "20px", margin: "0 0 8px" }}>
              {footer.reason} <Link href={footer.manageUrl} style={footerLink}>Choose how often</Link> or{" "}
              <Link href={footer.unsubscribeUrl} style={footerLink}>stop these e-mails</Link>.
            </Text>
            <Text style={{ color: c.inkMuted, fontSize: 13, lineHeight: "20px", margin: 0 }}>Reply to this e-mail to reach {shopName}.</Text>
          </Section>
        </Container>
      </Body>
    </Html>
  );
}

/** The one big link of a mail, as a plain styled link (buttons made of tables add nothing here). */
export function MailButton({ href, children }: { href: string; children: ReactNode }) {
  return (
    <Section style={{ margin: "20px 0" }}>
      <Link href={href} style={{ backgroundColor: c.oil, borderRadius: 8, color: c.onOil, display: "inline-block", fontSize: 16, fontWeight: 700, padding: "12px 20px", textDecoration: "none" }}>
        {children}
      </Link>
    </Section>
  );
}

const footerLink = { color: c.oil, textDecoration: "underline" } as const;
export const paragraph = { color: c.ink, fontSize: 16, lineHeight: "24px", margin: "0 0 12px" } as const;
