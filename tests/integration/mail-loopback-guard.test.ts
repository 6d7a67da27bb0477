// The loopback guard (tests/support/loopback-only.cjs, loaded as a setup file of this project)
// refuses anything that would leave the machine. 203.0.113.0/24 is TEST-NET-3, reserved for
// documentation (RFC 5737), so even without the guard nothing real would answer there.
import dns from "node:dns";
import net from "node:net";
import { describe, expect, it } from "vitest";

describe("loopback guard", () => {
  it("refuses a TCP connection to 203.0.113.1", () => {
    expect(() => net.connect({ host: "203.0.113.1", port: 443 })).toThrow(/loopback guard/);
    expect(() => new net.Socket().connect(80, "203.0.113.1")).toThrow(/loopback guard/);
  });

  it("refuses DNS lookups of outside names and fetches to them", async () => {
    expect(() => dns.lookup("example.org", () => {})).toThrow(/loopback guard/);
    await expect(dns.promises.lookup("example.org")).rejects.toThrow(/loopback guard/);
    await expect(fetch("http://203.0.113.1/")).rejects.toThrow();
  });

  it("still lets loopback connections through", async () => {
    const server = net.createServer((s) => s.end("hi"));
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", () => r()));
    const port = (server.address() as net.AddressInfo).port;
    const got = await new Promise<string>((resolve, reject) => {
      const c = net.connect({ host: "127.0.0.1", port }, () => undefined);
      let data = "";
      c.on("data", (d) => (data += String(d)));
      c.on("end", () => resolve(data));
      c.on("error", reject);
    });
    expect(got).toBe("hi");
    await new Promise<void>((r) => server.close(() => r()));
  });
});
