import { Text } from "@react-email/components";
import { MailButton, type MailFooter, MailLayout, paragraph } from "./layout";

/** One thing that can't wait: ready to collect, an approval request, an invitation to follow. */
export function AlertEmail(p: { shopName: string; heading: string; lines: string[]; action: { href: string; label: string }; footer: MailFooter }) {
  return (
    <MailLayout shopName={p.shopName} preview={p.lines[0] ?? p.heading} heading={p.heading} footer={p.footer}>
      {p.lines.map((line) => (
        <Text key={line} style={paragraph}>
          {line}
        </Text>
      ))}
      <MailButton href={p.action.href}>{p.action.label}</MailButton>
    </MailLayout>
  );
}
