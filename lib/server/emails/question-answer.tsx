import "server-only";
import { Body, Container, Head, Heading, Hr, Html, Link, Preview, Section, Text } from "@react-email/components";
import { renderMail } from "./render";
import { mailColors as c, mailFont } from "./theme";

// The desk's answer to an owner's question, sent to the owner. Mail they asked for by asking,
// so no unsubscribe footer: it says how to reply (the reply-to address files the reply on the job).

const text = { color: c.ink, fontSize: 16, lineHeight: "24px", margin: "0 0 12px", whiteSpace: "pre-line" } as const;
const muted = { color: c.inkMuted, fontSize: 14, lineHeight: "20px", margin: "0 0 4px" } as const;

export type QuestionAnswerMail = {
  shopName: string;
  /** "J-0042 · 2019 Tessaro Ridgeline 570". */
  job: string;
  question: string;
  lineLabel: string | null;
  answer: string;
  answeredBy: string;
  jobUrl: string;
};

function QuestionAnswerEmail(p: QuestionAnswerMail) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{p.answer.slice(0, 120)}</Preview>
      <Body style={{ backgroundColor: c.paper, color: c.ink, fontFamily: mailFont, margin: 0, padding: "24px 0" }}>
        <Container style={{ backgroundColor: c.surface, border: `1px solid ${c.line}`, borderRadius: 12, maxWidth: 600, padding: "24px" }}>
          <Text style={{ color: c.oil, fontSize: 14, fontWeight: 700, letterSpacing: 0.4, margin: 0, textTransform: "uppercase" }}>{p.shopName}</Text>
          <Heading as="h1" style={{ color: c.ink, fontSize: 22, lineHeight: "28px", margin: "8px 0 16px" }}>
            Your question is answered
          </Heading>
          <Text style={muted}>{p.job}</Text>
          <Section style={{ borderLeft: `4px solid ${c.line}`, margin: "0 0 16px", paddingLeft: 12 }}>
            {p.lineLabel ? <Text style={muted}>{p.lineLabel}</Text> : null}
            <Text style={text}>You asked: {p.question}</Text>
          </Section>
          <Section style={{ borderLeft: `4px solid ${c.oil}`, margin: "0 0 16px", paddingLeft: 12 }}>
            <Text style={text}>{p.answer}</Text>
            <Text style={muted}>{p.answeredBy}</Text>
          </Section>
          <Text style={text}>
            <Link href={p.jobUrl} style={{ color: c.oil, textDecoration: "underline" }}>
              See the job page
            </Link>
          </Text>
          <Hr style={{ borderColor: c.line, margin: "24px 0 12px" }} />
          <Text style={{ color: c.inkMuted, fontSize: 13, lineHeight: "20px", margin: 0 }}>
            Reply to this e-mail to ask {p.shopName} something else about this job; your reply goes on the job&apos;s questions.
          </Text>
        </Container>
      </Body>
    </Html>
  );
}

export async function renderQuestionAnswerMail(p: QuestionAnswerMail): Promise<{ subject: string; html: string; text: string }> {
  const { html, text: plain } = await renderMail(<QuestionAnswerEmail {...p} />);
  return { subject: `${p.shopName} answered your question`, html, text: plain };
}
