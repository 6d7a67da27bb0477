// Loopback guard for test runs: any attempt to open a TCP connection or resolve a name that is not
// this machine (127.0.0.0/8, ::1, localhost) throws at once, so nothing under test can reach the
// internet. Preloaded into the e2e web server with NODE_OPTIONS=--require and into the integration
// tests as a setup file. When LOOPBACK_GUARD_LOG names a file, each refusal is also appended there so
// a test can fail on refusals that some library swallowed.
"use strict";
/* eslint-disable @typescript-eslint/no-require-imports -- loaded with node --require, so CommonJS */
const net = require("node:net");
const dns = require("node:dns");
const fs = require("node:fs");

const FLAG = Symbol.for("platewright.loopbackGuard");

function isLoopback(host) {
  if (host === undefined || host === null || host === "") return true; // Node's default is localhost
  const h = String(host).toLowerCase().replace(/^\[|\]$/g, "");
  if (h === "localhost" || h.endsWith(".localhost")) return true;
  if (h === "::1" || h === "0:0:0:0:0:0:0:1") return true;
  const v4 = h.startsWith("::ffff:") ? h.slice(7) : h;
  return /^127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/.test(v4);
}

function refuse(what) {
  const err = new Error(`loopback guard: refused ${what}; tests may only talk to 127.0.0.1`);
  err.code = "ERR_LOOPBACK_GUARD";
  const log = process.env.LOOPBACK_GUARD_LOG;
  if (log) {
    try {
      fs.appendFileSync(log, `${new Date().toISOString()} pid ${process.pid} ${what}\n`);
    } catch {
      // The log is a convenience; the throw below is the guard.
    }
  }
  return err;
}

/** Works out the target host of the many call shapes of connect(); IPC paths are local. */
function targetOf(args) {
  let a = args[0];
  if (Array.isArray(a)) a = a[0]; // internal normalised form
  if (a && typeof a === "object") {
    if (a.path) return { local: true };
    return { host: a.host ?? a.hostname, port: a.port };
  }
  if (typeof a === "number" || (typeof a === "string" && /^\d+$/.test(a))) {
    return { host: typeof args[1] === "string" ? args[1] : undefined, port: a };
  }
  if (typeof a === "string") return { local: true };
  return { host: undefined };
}

function check(args) {
  const t = targetOf(args);
  if (t.local) return;
  if (!isLoopback(t.host)) throw refuse(`a connection to ${t.host}:${t.port}`);
}

if (!globalThis[FLAG]) {
  globalThis[FLAG] = true;

  const origConnect = net.Socket.prototype.connect;
  net.Socket.prototype.connect = function guardedConnect(...args) {
    check(args);
    return origConnect.apply(this, args);
  };
  for (const name of ["connect", "createConnection"]) {
    const orig = net[name];
    net[name] = function guarded(...args) {
      check(args);
      return orig.apply(this, args);
    };
  }

  const origLookup = dns.lookup;
  dns.lookup = function guardedLookup(hostname, ...rest) {
    if (!isLoopback(hostname)) throw refuse(`a DNS lookup of ${hostname}`);
    return origLookup.call(this, hostname, ...rest);
  };
  const origPromiseLookup = dns.promises.lookup;
  dns.promises.lookup = function guardedPromiseLookup(hostname, ...rest) {
    if (!isLoopback(hostname)) return Promise.reject(refuse(`a DNS lookup of ${hostname}`));
    return origPromiseLookup.call(this, hostname, ...rest);
  };
}

module.exports = { isLoopback };
