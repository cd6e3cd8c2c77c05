// The local stand-in for the shop's mail provider: an SMTP server on loopback that keeps
// every message it receives in memory, and a small JSON API to read them:
//   GET /messages        newest first, without bodies
//   GET /messages/:id    one message with text and html
//   DELETE /messages     forget them all
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

export type CaughtMessage = {
  id: string;
  messageId: string | null;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  receivedAt: string;
};

export type MailCatcher = {
  smtpPort: number;
  apiPort: number;
  smtpUrl: string;
  apiUrl: string;
  messages: CaughtMessage[];
  stop: () => Promise<void>;
};

export async function startMailCatcher(
  opts: { smtpPort?: number; apiPort?: number; quiet?: boolean } = {},
): Promise<MailCatcher> {
  const messages: CaughtMessage[] = [];
  let counter = 0;

  const smtp = new SMTPServer({
    authOptional: true,
    // the bundled certificate has expired; loopback needs no TLS
    disabledCommands: ["STARTTLS"],
    logger: false,
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          counter += 1;
          const to = session.envelope.rcptTo.map((r) => r.address);
          messages.push({
            id: String(counter),
            messageId: parsed.messageId ?? null,
            from:
              parsed.from?.text ??
              (session.envelope.mailFrom ? session.envelope.mailFrom.address : ""),
            to,
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : null,
            receivedAt: new Date().toISOString(),
          });
          if (!opts.quiet)
            console.log(`mail: caught "${parsed.subject ?? ""}" for ${to.join(", ")}`);
          callback();
        })
        .catch((e: Error) => callback(e));
    },
  });
  await new Promise<void>((resolve, reject) => {
    smtp.once("error", reject);
    smtp.listen(opts.smtpPort ?? 0, "127.0.0.1", () => resolve());
  });
  smtp.on("error", (e) => console.warn(`mail: smtp error: ${e.message}`));
  const smtpPort = (smtp.server.address() as AddressInfo).port;

  const api: Server = createServer((req, res) => {
    const url = new URL(req.url ?? "/", "http://127.0.0.1");
    const send = (status: number, body: unknown) => {
      res.writeHead(status, { "Content-Type": "application/json", "Cache-Control": "no-store" });
      res.end(JSON.stringify(body));
    };
    if (url.pathname === "/messages" && req.method === "GET") {
      return send(
        200,
        [...messages].reverse().map(({ text: _t, html: _h, ...summary }) => summary),
      );
    }
    if (url.pathname === "/messages" && req.method === "DELETE") {
      messages.length = 0;
      return send(200, { ok: true });
    }
    const one = /^\/messages\/([^/]+)$/.exec(url.pathname);
    if (one && req.method === "GET") {
      const found = messages.find((m) => m.id === one[1]);
      return found ? send(200, found) : send(404, { error: "no such message" });
    }
    send(404, { error: "not found" });
  });
  await new Promise<void>((resolve, reject) => {
    api.once("error", reject);
    api.listen(opts.apiPort ?? 0, "127.0.0.1", () => resolve());
  });
  const apiPort = (api.address() as AddressInfo).port;

  return {
    smtpPort,
    apiPort,
    smtpUrl: `smtp://127.0.0.1:${smtpPort}`,
    apiUrl: `http://127.0.0.1:${apiPort}`,
    messages,
    stop: async () => {
      api.closeAllConnections();
      await Promise.all([
        new Promise<void>((r) => smtp.close(() => r())),
        new Promise<void>((r) => api.close(() => r())),
      ]);
    },
  };
}
