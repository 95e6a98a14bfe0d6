// Form messages in the words of the screen (#16 item 6): real zod issues of the part profile and
// invitation contracts, said with the labels the Parts and Team forms print above their fields
// and with limits in the unit the field is typed in. The expected labels are the forms' own
// (common practice, no source); 1e12 V/s = 1e6 V/µs is the SI prefix definition (BIPM SI
// Brochure, 9th ed., table 7: micro = 1e-6).
import { describe, expect, it } from "vitest";
import { OPAMP_PARAM_INFO, partProfileSchema } from "@/lib/schemas/part";
import { emailSchema } from "@/lib/schemas/team";
import { fieldIssueText } from "@/lib/workbench/screen-words";
import { scenario } from "./sim-fixtures";

const { opamp } = scenario({});

function partIssue(change: Record<string, number>) {
  const r = partProfileSchema.safeParse({ name: "test", opamp: { ...opamp, ...change } });
  expect(r.success).toBe(false);
  const issue = r.error!.issues[0];
  return { key: String(issue.path[1]), message: issue.message };
}

describe("fieldIssueText", () => {
  it("names a part parameter by its form label, never its contract key", () => {
    const { key, message } = partIssue({ openLoopGain: 0.5 });
    expect(key).toBe("openLoopGain");
    expect(fieldIssueText(message, { code: key, label: OPAMP_PARAM_INFO.openLoopGain.label })).toBe(
      "Open-loop gain must be at least 1 V/V",
    );
    const headroom = partIssue({ outputHeadroomHigh: -0.01 });
    expect(fieldIssueText(headroom.message, { code: headroom.key, label: "Headroom to V+" })).toBe(
      "Headroom to V+ must not be negative",
    );
  });

  it("restates a limit in the unit the field is typed in", () => {
    const { key, message } = partIssue({ slewRate: 5e12 });
    const text = fieldIssueText(message, {
      code: key,
      label: "Slew rate (rising)",
      scale: { unit: "V/µs", factor: 1e6 },
    });
    expect(text).toBe("Slew rate (rising) must be at most 1,000,000 V/µs");
    const gbw = partIssue({ gainBandwidth: 1e12 });
    // 1e11 Hz = 100 GHz (SI prefix giga = 1e9).
    expect(fieldIssueText(gbw.message, { code: gbw.key, label: "Gain-bandwidth" })).toBe(
      "Gain-bandwidth must be at most 100 GHz",
    );
  });

  it("says the invitation's address problem with the E-mail label", () => {
    const r = emailSchema.safeParse("rita.field-at-fjordline");
    expect(r.success).toBe(false);
    const text = fieldIssueText(r.error!.issues[0].message, { code: "email", label: "E-mail" });
    expect(text).toBe("E-mail must be an e-mail address");
    expect(text).not.toMatch(/\bemail\b/);
  });

  it("puts the label in front of a message that does not start with the code name", () => {
    expect(fieldIssueText("Invalid input", { code: "name", label: "Name" })).toBe("Name: Invalid input");
  });
});
