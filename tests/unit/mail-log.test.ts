import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { MessageList } from "@/app/(staff)/shop/[shop]/jobs/[number]/mail/_components/message-list";
import { type SentMessage, mailKindLabel, messageState } from "@/lib/mail-log";

// A job's sent log in words: what each mail was, whether it went, and what happens next.

const NOW = new Date("2026-12-04T15:00:00Z");
const base: SentMessage = {
  channel: "email",
  id: 1,
  kind: "progress",
  to: "vera.lindgren@mail.test",
  subject: "Testmake Ridgeline: 2 updates from Kettle Creek Motors",
  state: "sent",
  attempts: 1,
  lastError: null,
  providerId: "re_4f1c2a",
  queuedAt: new Date("2026-12-04T14:00:00Z"),
  sentAt: new Date("2026-12-04T14:00:03Z"),
  nextAttemptAt: new Date("2026-12-04T14:00:00Z"),
  sendBefore: null,
};

describe("messageState", () => {
  it("names each state in a word or two, never by colour alone", () => {
    expect(messageState(base, NOW)).toEqual({ label: "Sent", tone: "moss", icon: "sent" });
    expect(messageState({ ...base, state: "dead" }, NOW)).toEqual({ label: "Not sent", tone: "rust", icon: "failed" });
    expect(messageState({ ...base, state: "retrying" }, NOW)).toEqual({ label: "Retrying", tone: "signal", icon: "retrying" });
    expect(messageState({ ...base, state: "sending" }, NOW).label).toBe("Sending now");
    // A reminder queued to go tomorrow is scheduled; one due now is about to go.
    expect(messageState({ ...base, state: "queued", nextAttemptAt: new Date("2026-12-05T15:00:00Z") }, NOW).label).toBe("Scheduled");
    expect(messageState({ ...base, state: "queued", nextAttemptAt: NOW }, NOW).label).toBe("Waiting to send");
  });

  it("labels known kinds, and reads a new kind as its own words", () => {
    expect(mailKindLabel("approval-reminder")).toBe("Approval reminder");
    expect(mailKindLabel("daily")).toBe("Daily digest");
    expect(mailKindLabel("parts_late")).toBe("Parts late");
    expect(mailKindLabel("")).toBe("E-mail");
  });
});

describe("MessageList", () => {
  const messages: SentMessage[] = [
    { ...base, id: 3, kind: "ready", state: "dead", attempts: 5, lastError: "The address bounced", providerId: null, sentAt: null },
    { ...base, id: 2, kind: "approval-reminder", state: "queued", attempts: 0, providerId: null, sentAt: null, nextAttemptAt: new Date("2026-12-05T15:00:00Z") },
    base,
  ];
  const html = renderToStaticMarkup(h(MessageList, { messages, timeZone: "America/Denver", now: NOW }));

  it("shows one card per message for phones and one table row per message from the small breakpoint up", () => {
    expect(html.match(/data-testid="message-card"/g)).toHaveLength(3);
    expect(html.match(/data-testid="message-row"/g)).toHaveLength(3);
    expect(html).toMatch(/<ul class="space-y-3 sm:hidden"/);
    expect(html).toMatch(/class="[^"]*hidden sm:block/);
  });

  it("says when the mail service took it, with its id, in the shop's time zone", () => {
    // 14:00:03 UTC is 7:00 AM in Denver (UTC−7 in December).
    expect(html).toContain('Taken by the mail service <time dateTime="2026-12-04T14:00:03.000Z">Dec 4, 7:00 AM</time>');
    expect(html).toContain("re_4f1c2a");
    expect(html).toContain("E-mail");
  });

  it("says why a mail didn't go and what happens next", () => {
    expect(html).toContain("Gave up after 5 tries. Last error: The address bounced. It won&#x27;t go unless someone sends it again.");
    expect(html).toContain('Goes <time dateTime="2026-12-05T15:00:00.000Z">Dec 5, 8:00 AM</time>');
    expect(html).toContain("Approval reminder");
  });
});
