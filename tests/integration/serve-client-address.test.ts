import type { AddressInfo } from "node:net";
import express from "express";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { CLIENT_ADDRESS_HEADER, clientAddress } from "~/lib/auth/throttle.server";
import {
  CLIENT_ADDRESS_HEADER as SERVER_HEADER,
  clientAddressMiddleware,
} from "../../scripts/serve.mjs";

// The production server reports the socket's address to the app; a client cannot
// choose the address sign-in throttling counts it under.
describe("the client address the server reports", () => {
  let base = "";
  let close: () => void = () => {};

  beforeAll(async () => {
    const app = express();
    app.use(clientAddressMiddleware);
    app.get("/who", (req, res) => {
      const request = new Request("http://t/who", {
        headers: { [CLIENT_ADDRESS_HEADER]: String(req.headers[CLIENT_ADDRESS_HEADER] ?? "") },
      });
      res.json({ address: clientAddress(request, false) });
    });
    const server = await new Promise<import("node:http").Server>((resolve) => {
      const s = app.listen(0, "127.0.0.1", () => resolve(s));
    });
    base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    close = () => server.close();
  });
  afterAll(() => close());

  it("uses the same header name on both sides", () => {
    expect(SERVER_HEADER).toBe(CLIENT_ADDRESS_HEADER);
  });

  it("is the socket's address, whatever the client claims", async () => {
    const res = await fetch(`${base}/who`, {
      headers: { [CLIENT_ADDRESS_HEADER]: "198.51.100.99" },
    });
    const { address } = (await res.json()) as { address: string };
    expect(address).not.toBe("198.51.100.99");
    expect(address).toMatch(/127\.0\.0\.1$/); // IPv4, possibly IPv4-mapped IPv6
  });

  it("falls back to one local address when no server reported one", () => {
    expect(clientAddress(new Request("http://t/login"), false)).toBe("127.0.0.1");
  });
});
