// Everything the test run started (the app, PostgreSQL, the mail catcher, the payments fake) listens on
// loopback only: a connection to the same port on any other address of this machine is refused.
import { networkInterfaces } from "node:os";
import { Socket } from "node:net";
import { describe, expect, it } from "vitest";

function connects(host: string, port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = new Socket();
    socket.setTimeout(1500);
    socket.once("connect", () => {
      socket.destroy();
      resolve(true);
    });
    socket.once("timeout", () => {
      socket.destroy();
      resolve(false);
    });
    socket.once("error", () => resolve(false));
    socket.connect(port, host);
  });
}

const ports = {
  app: Number(new URL(process.env.BENDWISE_APP_URL!).port),
  postgres: Number(new URL(process.env.DATABASE_URL!).port),
  smtp: Number(new URL(process.env.SMTP_URL!).port),
  mailInbox: Number(process.env.BENDWISE_MAIL_WEB_PORT),
  payments: Number(new URL(process.env.PAYMENTS_API_URL!).port),
};

const otherAddresses = Object.values(networkInterfaces())
  .flat()
  .filter((a) => a && !a.internal && a.family === "IPv4")
  .map((a) => a!.address);

describe("listening addresses", () => {
  for (const [name, port] of Object.entries(ports)) {
    it(`${name} answers on 127.0.0.1:${port} and on no other address`, async () => {
      expect(await connects("127.0.0.1", port)).toBe(true);
      for (const address of otherAddresses) expect(await connects(address, port)).toBe(false);
    });
  }
});
