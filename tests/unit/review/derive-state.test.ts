import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { figureReviewState, panelReviewState, type DecisionRecord } from "@/lib/review/derive-state";

const H1 = "a".repeat(64);
const H2 = "b".repeat(64);
const d = (userId: string, decision: DecisionRecord["decision"], contentHash = H1, createdAt = 1): DecisionRecord => ({
  userId,
  decision,
  contentHash,
  createdAt,
});

describe("panel review state", () => {
  it("walks draft → in review → approved / needs revision → signed off", () => {
    expect(panelReviewState({ currentHash: null, decisions: [], requiredReviewers: [], signedOff: false }).state).toBe("draft");
    expect(panelReviewState({ currentHash: H1, decisions: [], requiredReviewers: ["r"], signedOff: false }).state).toBe("in_review");
    expect(panelReviewState({ currentHash: H1, decisions: [d("r", "approved")], requiredReviewers: ["r"], signedOff: false }).state).toBe("approved");
    expect(
      panelReviewState({ currentHash: H1, decisions: [d("r", "approved"), d("s", "needs_revision")], requiredReviewers: ["r"], signedOff: false }).state,
    ).toBe("needs_revision");
    expect(panelReviewState({ currentHash: H1, decisions: [d("r", "approved")], requiredReviewers: ["r"], signedOff: true }).state).toBe("signed_off");
  });

  it("decisions on an old hash do not count (they are stale)", () => {
    const s = panelReviewState({ currentHash: H2, decisions: [d("r", "approved", H1)], requiredReviewers: ["r"], signedOff: false });
    expect(s).toMatchObject({ state: "in_review", approvedBy: [], waitingOn: ["r"] });
  });

  it("a later decision by the same person replaces the earlier one", () => {
    const s = panelReviewState({
      currentHash: H1,
      decisions: [d("r", "needs_revision", H1, 1), d("r", "approved", H1, 2)],
      requiredReviewers: ["r"],
      signedOff: false,
    });
    expect(s.state).toBe("approved");
  });

  it("every required reviewer must approve", () => {
    expect(panelReviewState({ currentHash: H1, decisions: [d("r", "approved")], requiredReviewers: ["r", "s"], signedOff: false })).toMatchObject({
      state: "in_review",
      waitingOn: ["s"],
    });
  });

  // Property: over random sequences of revisions and decisions, the state always follows from the
  // decisions on the current hash alone, and approval never survives a change of hash.
  it("holds its invariants over random histories", () => {
    const event = fc.oneof(
      fc.record({ type: fc.constant("revise" as const) }),
      fc.record({
        type: fc.constant("decide" as const),
        user: fc.constantFrom("r", "s", "t"),
        decision: fc.constantFrom("approved" as const, "needs_revision" as const),
      }),
    );
    fc.assert(
      fc.property(fc.array(event, { maxLength: 40 }), fc.subarray(["r", "s", "t"]), (events, required) => {
        let hash: string | null = null;
        let n = 0;
        const decisions: DecisionRecord[] = [];
        for (const [i, e] of events.entries()) {
          if (e.type === "revise") hash = `h${++n}`.padEnd(64, "0");
          else if (hash) decisions.push({ userId: e.user, decision: e.decision, contentHash: hash, createdAt: i });
          const s = panelReviewState({ currentHash: hash, decisions, requiredReviewers: required, signedOff: false });
          if (!hash) {
            expect(s.state).toBe("draft");
            continue;
          }
          const onCurrent = decisions.filter((x) => x.contentHash === hash);
          if (e.type === "revise") expect(s.state).toBe("in_review");
          if (s.state === "approved") {
            expect(onCurrent.length).toBeGreaterThan(0);
            expect(s.needsRevisionBy).toEqual([]);
            for (const r of required) expect(s.approvedBy).toContain(r);
          }
          if (s.state === "needs_revision") expect(s.needsRevisionBy.length).toBeGreaterThan(0);
          for (const u of [...s.approvedBy, ...s.needsRevisionBy]) expect(onCurrent.some((x) => x.userId === u)).toBe(true);
        }
      }),
      { numRuns: 500 },
    );
  });
});

describe("figure review state", () => {
  it("is as far along as its least advanced panel", () => {
    expect(figureReviewState([], false)).toBe("draft");
    expect(figureReviewState(["approved", "in_review"], false)).toBe("in_review");
    expect(figureReviewState(["approved", "needs_revision"], false)).toBe("needs_revision");
    expect(figureReviewState(["approved", "approved"], false)).toBe("approved");
    expect(figureReviewState(["approved", "needs_revision"], true)).toBe("signed_off");
  });
});
