import "server-only";
import { Body, Button, Container, Head, Heading, Hr, Html, Preview, Section, Text } from "@react-email/components";
import { renderMail } from "./render";
import { mailColors as C, mailFont } from "./theme";

// The shop asks the machine's owner whether a finished job may be shown in its public portfolio.
// One request, no subscription: the button leads to the signed-in page where the owner answers.

export type ConsentMailProps = { shopName: string; ownerName: string; machine: string; answerUrl: string };

export const consentMailSubject = (p: Pick<ConsentMailProps, "shopName" | "machine">) => `${p.shopName} would like to show the work on your ${p.machine}`.slice(0, 300);

const text = { color: C.ink, fontSize: "16px", lineHeight: "24px", margin: "0 0 12px" } as const;

export function ConsentRequestEmail(p: ConsentMailProps) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{`May ${p.shopName} show the work on your ${p.machine} on its public page? Nothing is shown unless you say yes.`}</Preview>
      <Body style={{ backgroundColor: C.paper, fontFamily: mailFont, margin: 0, padding: "24px 0" }}>
        <Container style={{ backgroundColor: C.surface, border: `1px solid ${C.line}`, borderRadius: "12px", padding: "24px", maxWidth: "560px" }}>
          <Text style={{ color: C.oil, fontSize: "14px", fontWeight: 700, letterSpacing: 0.4, margin: 0, textTransform: "uppercase" }}>{p.shopName}</Text>
          <Heading as="h1" style={{ color: C.ink, fontSize: "22px", lineHeight: "1.3", margin: "8px 0 16px" }}>
            May we show the work on your {p.machine}?
          </Heading>
          <Text style={text}>Hello {p.ownerName},</Text>
          <Text style={text}>
            {p.shopName} would like to tell the story of this job on its public page: photos and clips from the bench and a short write-up, so other riders can see how
            the shop works.
          </Text>
          <Text style={text}>
            Your name, your machine&apos;s serial number, plates, prices and the invoice are never shown. Photos carry no location data. Nothing goes public unless you
            say yes, and you can take it back at any time: the story then comes down at once.
          </Text>
          <Section style={{ textAlign: "center", margin: "20px 0" }}>
            <Button href={p.answerUrl} style={{ backgroundColor: C.oil, color: C.onOil, borderRadius: "8px", padding: "14px 24px", fontSize: "17px", fontWeight: 700 }}>
              Answer the shop
            </Button>
          </Section>
          <Hr style={{ borderColor: C.line }} />
          <Text style={{ color: C.inkMuted, fontSize: "13px", lineHeight: "20px" }}>
            The button opens the question on Benchside. If you aren&apos;t signed in, ask for a sign-in link with this e-mail address and you&apos;ll come straight back to it.
            Reply to this e-mail to reach {p.shopName}.
          </Text>
        </Container>
      </Body>
    </Html>
  );
}

export async function renderConsentMail(p: ConsentMailProps): Promise<{ subject: string; html: string; text: string }> {
  return { subject: consentMailSubject(p), ...(await renderMail(<ConsentRequestEmail {...p} />)) };
}
