import "server-only";
import { Body, Button, Container, Head, Heading, Hr, Html, Preview, Section, Text } from "@react-email/components";
import type { DropoffSnapshot } from "@/lib/dropoff";
import { renderMail } from "./render";
import { mailColors as C, mailFont } from "./theme";

// The drop-off authorisation sent for signing: the wording as the owner will sign it, and a button
// to the signed-in page where they sign. Nothing is agreed by the e-mail itself.

export type DropoffMailProps = { snapshot: DropoffSnapshot; jobNumber: string; signUrl: string };

const text = { color: C.ink, fontSize: "16px", lineHeight: "24px", margin: "0 0 12px" } as const;

export function DropoffAuthorisationEmail({ snapshot: s, jobNumber, signUrl }: DropoffMailProps) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{`${s.shop} asks you to sign the authorisation for your ${s.machine} before work starts.`}</Preview>
      <Body style={{ backgroundColor: C.paper, fontFamily: mailFont, margin: 0, padding: "24px 0" }}>
        <Container style={{ backgroundColor: C.surface, border: `1px solid ${C.line}`, borderRadius: "12px", padding: "24px", maxWidth: "560px" }}>
          <Text style={{ color: C.oil, fontSize: "14px", fontWeight: 700, letterSpacing: 0.4, margin: 0, textTransform: "uppercase" }}>{s.shop}</Text>
          <Heading as="h1" style={{ color: C.ink, fontSize: "22px", lineHeight: "1.3", margin: "8px 0 16px" }}>
            Please sign before work starts on your {s.machine}
          </Heading>
          <Text style={text}>Hello {s.owner},</Text>
          <Text style={text}>Here is what you are asked to agree to for job {jobNumber}:</Text>
          <Text style={{ ...text, borderLeft: `4px solid ${C.line}`, paddingLeft: "12px" }}>{s.wording}</Text>
          {s.terms ? <Text style={text}>Also agreed: {s.terms}</Text> : null}
          <Section style={{ textAlign: "center", margin: "20px 0" }}>
            <Button href={signUrl} style={{ backgroundColor: C.oil, color: C.onOil, borderRadius: "8px", padding: "14px 24px", fontSize: "17px", fontWeight: 700 }}>
              Read and sign
            </Button>
          </Section>
          <Hr style={{ borderColor: C.line }} />
          <Text style={{ color: C.inkMuted, fontSize: "13px", lineHeight: "20px" }}>
            The button opens the authorisation on Benchside, where you sign with your typed name. If you aren&apos;t signed in, ask for a sign-in link with this e-mail
            address and you&apos;ll come straight back to it. Reply to this e-mail to reach {s.shop}.
          </Text>
        </Container>
      </Body>
    </Html>
  );
}

export async function renderDropoffMail(p: DropoffMailProps): Promise<{ subject: string; html: string; text: string }> {
  return { subject: `${p.snapshot.shop}: please sign the authorisation for your ${p.snapshot.machine}`.slice(0, 300), ...(await renderMail(<DropoffAuthorisationEmail {...p} />)) };
}
