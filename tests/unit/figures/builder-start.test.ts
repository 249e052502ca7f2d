import { describe, expect, it } from "vitest";
import { initialState } from "@/app/(app)/panels/[id]/_components/builder-model";

describe("the builder's start after the fit page", () => {
  it("chooses the version it left for and the run stored there", () => {
    const s = initialState(null, { versionId: "v1", analysisId: "a1", templateId: "decay-curve" });
    expect(s.templateId).toBe("decay-curve");
    expect(s.picks).toEqual({ dataName: "v:v1", fitName: "a:a1", residualName: "a:a1" });
  });
  it("ignores a template it does not know and starts as usual without a return", () => {
    expect(initialState(null, { versionId: "v1", analysisId: null, templateId: "no-such" }).picks).toEqual({ dataName: "v:v1" });
    expect(initialState(null, { versionId: null, analysisId: null, templateId: null }).picks).toEqual({});
  });
});
