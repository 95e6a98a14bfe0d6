// lib/session-token.ts against next-auth's own token writer (next-auth/jwt `encode`, the npm
// package as reference): same claims back, and null for another secret, a changed token or an
// expired one.
import { encode } from "next-auth/jwt";
import { describe, expect, it } from "vitest";
import { readSessionToken } from "@/lib/session-token";

const secret = "unit-test-secret-for-session-tokens";
const claims = {
  sub: "5b1e6a52-0d55-4a0e-9f0f-1f2d3c4b5a69",
  teamId: "t-1",
  role: "designer" as const,
  gen: 3,
  name: "Ada",
};

describe("readSessionToken", () => {
  it("reads what next-auth's encode wrote", async () => {
    const token = await encode({ token: claims, secret, maxAge: 60 });
    const read = await readSessionToken(token, secret);
    expect(read).toMatchObject(claims);
    // next-auth sets iat/exp from maxAge (next-auth/jwt encode).
    expect(Number(read?.exp) - Number(read?.iat)).toBe(60);
  });

  it("refuses another secret and a changed token", async () => {
    const token = await encode({ token: claims, secret, maxAge: 60 });
    expect(await readSessionToken(token, `${secret}-other`)).toBeNull();
    const parts = token.split(".");
    const tag = parts[4];
    parts[4] = (tag[0] === "A" ? "B" : "A") + tag.slice(1);
    expect(await readSessionToken(parts.join("."), secret)).toBeNull();
    expect(await readSessionToken("not-a-token", secret)).toBeNull();
  });

  it("refuses a token past its expiry plus next-auth's 15 s tolerance", async () => {
    const token = await encode({ token: claims, secret, maxAge: -20 });
    expect(await readSessionToken(token, secret)).toBeNull();
    const fresh = await encode({ token: claims, secret, maxAge: -5 });
    expect(await readSessionToken(fresh, secret)).toMatchObject({ sub: claims.sub });
  });
});
