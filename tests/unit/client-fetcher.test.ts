// lib/client/fetcher.ts: an HttpError's message names the fields the way the screen does
// (lib/workbench/screen-words.ts), for every caller — not "stage.rFeedback: …" from the zod path.
import { describe, expect, it } from "vitest";
import { HttpError } from "@/lib/client/fetcher";

describe("HttpError message", () => {
  it("a 400 with zod issues reads in screen words", () => {
    const err = new HttpError(400, {
      error: "invalid_input",
      message: "The scenario is not valid.",
      issues: [{ path: ["scenario", "stage", "rFeedback"], message: "stage.rFeedback must be greater than 0" }],
    });
    expect(err.message).not.toMatch(/rFeedback/);
    expect(err.message).toMatch(/^The scenario is not valid\.: .*must be greater than 0/);
  });

  it("answers without issues keep the server's message, then the status words", () => {
    expect(new HttpError(409, { error: "conflict", message: "Someone saved first." }).message).toBe(
      "Someone saved first.",
    );
    expect(new HttpError(403, null).message).toBe("Your role does not allow this.");
  });
});
