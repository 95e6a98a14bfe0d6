// Preloaded into the server process (`node --require scripts/peer-address.cjs next start`, see
// scripts/start.ts and tests/helpers/server.ts). Before Next sees a request, the forwarding
// headers a client may have written itself are replaced: x-forwarded-for becomes the socket's
// peer address, and x-forwarded-host / -proto / x-real-ip are dropped, unless the peer is a
// trusted reverse proxy listed in RAILWISE_TRUSTED_PROXIES (comma-separated addresses).
// Next only fills x-forwarded-for when it is absent, so without this any client could pick the
// address its sign-in attempts are counted under (DEVELOPERS.md § Sign-in limits).
// Plain CommonJS: it runs before anything is compiled or bundled.
"use strict";
const http = require("node:http");
const https = require("node:https");

/** "::ffff:10.0.0.1" (an IPv4 peer on a dual-stack socket) → "10.0.0.1". */
function plainAddress(address) {
  if (!address) return "unknown";
  return address.startsWith("::ffff:") && address.includes(".") ? address.slice(7) : address;
}

const trusted = new Set(
  (process.env.RAILWISE_TRUSTED_PROXIES || "")
    .split(",")
    .map((a) => plainAddress(a.trim()))
    .filter((a) => a !== "unknown"),
);

function rewriteForwarding(req) {
  const peer = plainAddress(req.socket?.remoteAddress);
  if (trusted.has(peer) && req.headers["x-forwarded-for"]) return;
  req.headers["x-forwarded-for"] = peer;
  delete req.headers["x-real-ip"];
  if (!trusted.has(peer)) {
    delete req.headers["x-forwarded-host"];
    delete req.headers["x-forwarded-proto"];
  }
}

for (const mod of [http, https]) {
  const createServer = mod.createServer;
  mod.createServer = function createServerWithPeerAddress(...args) {
    const server = createServer.apply(this, args);
    server.prependListener("request", rewriteForwarding);
    return server;
  };
}
