import { describe, expect, it } from "vitest";
import { describeForLog, redactSecrets } from "@/lib/http/redact";

describe("secrets never reach a log line", () => {
  it("redacts API tokens, sign-in and invitation secrets, bearer headers and session cookies", () => {
    const line =
      "token plt_AbCdEfGhIjKlMnOpQrStUvWxYz0123456789-_ and link /sign-in/link?token=pls_0123456789abcdefghijKLMNOP " +
      "invite /invite/pli_zyxwvutsrqponmlkjihgfedcba Authorization: Bearer abc.def.ghi cookie authjs.session-token=eyJhbGciOi.xyz; path=/";
    expect(redactSecrets(line)).toBe(
      "token [redacted] and link /sign-in/link?token=[redacted] " +
        "invite /invite/[redacted] Authorization: Bearer [redacted] cookie authjs.session-token=[redacted]; path=/",
    );
  });

  it("leaves ordinary text alone and redacts inside error stacks and causes", () => {
    expect(redactSecrets("plain words, pls_short")).toBe("plain words, pls_short");
    const err = new Error("failed for pls_0123456789abcdefghijKLMNOP", { cause: new Error("Bearer sekrit") });
    const text = describeForLog(err);
    expect(text).not.toContain("0123456789abcdefghij");
    expect(text).not.toContain("sekrit");
    expect(text).toContain("caused by: Error: Bearer [redacted]");
  });
});
