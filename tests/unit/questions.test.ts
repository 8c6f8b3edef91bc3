import { describe, expect, it } from "vitest";
import { bareAddress, lineLabel, openQuestions, replyAddress, tokenOfAddress, type ThreadMessage } from "@/lib/questions";

describe("reply-to addresses of mail about a job", () => {
  const token = "abcdefghijklmnopqrstuvwxyz";
  it("reads the job token back from the address, whatever its case or display name", () => {
    expect(tokenOfAddress(replyAddress(token, "reply.benchside.test"))).toBe(token);
    expect(tokenOfAddress(`"Copper Gulch" <Q-${token.toUpperCase()}@Reply.Benchside.Test>`)).toBe(token);
  });
  it("finds no token in other addresses", () => {
    expect(tokenOfAddress("desk@coppergulch.test")).toBeNull();
    expect(tokenOfAddress(`q-${token}x@reply.benchside.test`)).toBeNull();
    // 0, 1, 8 and 9 are not in the token's base-32 alphabet (RFC 4648 §6).
    expect(tokenOfAddress(`q-${"0".repeat(26)}@reply.benchside.test`)).toBeNull();
  });
  it("compares senders by their bare address", () => {
    expect(bareAddress("Ruth Calloway <Ruth.Calloway@Mail.Test>")).toBe("ruth.calloway@mail.test");
    expect(bareAddress(" ruth@mail.test ")).toBe("ruth@mail.test");
  });
});

describe("the thread", () => {
  const base = { authorName: "Ruth", via: "page" as const, line: null, answersQuestionId: null, at: "2026-12-05T10:00:00.000Z" };
  it("lists the owner's unanswered questions as open", () => {
    const thread: ThreadMessage[] = [
      { ...base, id: 1, author: "owner", body: "a", answeredAt: "2026-12-05T11:00:00.000Z" },
      { ...base, id: 2, author: "staff", body: "b", answersQuestionId: 1, answeredAt: null },
      { ...base, id: 3, author: "owner", body: "c", answeredAt: null },
    ];
    expect(openQuestions(thread).map((m) => m.id)).toEqual([3]);
  });
  it("names a line by number and description", () => {
    expect(lineLabel({ requestPublicId: "x", no: 2, description: "Cam chain tensioner" })).toBe("About line 2: Cam chain tensioner");
    expect(lineLabel({ requestPublicId: "x", no: 2, description: null })).toBe("About line 2");
  });
});
