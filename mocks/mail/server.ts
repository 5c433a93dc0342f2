/**
 * Local SMTP fake with a mailbox. SMTP on 127.0.0.1:MAIL_FAKE_SMTP_PORT (default 2525), HTTP on
 * 127.0.0.1:MAIL_FAKE_HTTP_PORT (default 2580). Messages are kept as JSON files under
 * .data/mail so they survive a restart of the fake.
 *
 * HTTP:
 *   GET    /api/messages?to=addr    list (newest first), each with subject, text, html, links
 *   GET    /api/messages/:id        one message
 *   DELETE /api/messages?to=addr    delete (all, or one recipient's)
 *   POST   /_fake/reset             delete everything and clear faults
 *   POST   /_fake/faults            {"tempFail": N} answer the next N messages with 451
 *   GET    /health                  {"ok":true}
 *   GET    /                        the mailbox page; /messages/:id one message
 * Recipients at the domain `bounce.test` are refused with 550 (a permanent failure).
 */
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { randomUUID } from "node:crypto";
import { SMTPServer } from "smtp-server";
import { simpleParser } from "mailparser";

export interface StoredMessage {
  id: string;
  receivedAt: string;
  messageId: string | null;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  links: string[];
  /** Files sent with it; text kept as UTF-8, anything else as base64. */
  attachments: {
    filename: string;
    contentType: string;
    content: string;
    encoding: "utf8" | "base64";
  }[];
}

export interface MailFakeOptions {
  smtpPort?: number;
  httpPort?: number;
  dir?: string;
}

const escapeHtml = (s: string) =>
  s.replace(
    /[&<>"']/g,
    (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!,
  );

function extractLinks(text: string, html: string | null): string[] {
  const found = new Set<string>();
  for (const m of `${text}\n${html ?? ""}`.matchAll(/https?:\/\/[^\s"'<>)]+/g))
    found.add(m[0].replace(/&amp;/g, "&"));
  return [...found];
}

export function startMailFake(options: MailFakeOptions = {}) {
  const smtpPort = options.smtpPort ?? Number(process.env.MAIL_FAKE_SMTP_PORT ?? 2525);
  const httpPort = options.httpPort ?? Number(process.env.MAIL_FAKE_HTTP_PORT ?? 2580);
  const dir = options.dir ?? join(process.cwd(), ".data", "mail");
  mkdirSync(dir, { recursive: true });
  let tempFail = 0;

  const all = (): StoredMessage[] =>
    readdirSync(dir)
      .filter((f) => f.endsWith(".json"))
      .map((f) => JSON.parse(readFileSync(join(dir, f), "utf8")) as StoredMessage)
      .sort((a, b) => (a.receivedAt < b.receivedAt ? 1 : -1));

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    onRcptTo(address, _session, callback) {
      if (address.address.toLowerCase().endsWith("@bounce.test")) {
        const err = new Error(`5.1.1 <${address.address}>: mailbox does not exist`) as Error & {
          responseCode: number;
        };
        err.responseCode = 550;
        return callback(err);
      }
      callback();
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", async () => {
        if (tempFail > 0) {
          tempFail -= 1;
          const err = new Error("4.3.0 temporary failure (fault switch)") as Error & {
            responseCode: number;
          };
          err.responseCode = 451;
          return callback(err);
        }
        try {
          const parsed = await simpleParser(Buffer.concat(chunks));
          const html = typeof parsed.html === "string" ? parsed.html : null;
          const text = parsed.text ?? "";
          const msg: StoredMessage = {
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            messageId: parsed.messageId ?? null,
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
            to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            subject: parsed.subject ?? "",
            text,
            html,
            links: extractLinks(text, html),
            attachments: parsed.attachments.map((a) => {
              const textual = a.contentType.startsWith("text/");
              return {
                filename: a.filename ?? "",
                contentType: a.contentType,
                content: a.content.toString(textual ? "utf8" : "base64"),
                encoding: textual ? ("utf8" as const) : ("base64" as const),
              };
            }),
          };
          writeFileSync(
            join(dir, `${msg.receivedAt.replace(/[:.]/g, "-")}-${msg.id}.json`),
            JSON.stringify(msg),
          );
          callback();
        } catch (err) {
          callback(err as Error);
        }
      });
    },
  });

  const send = (res: ServerResponse, status: number, body: unknown, type = "application/json") => {
    res.writeHead(status, { "content-type": type });
    res.end(type === "application/json" ? JSON.stringify(body) : String(body));
  };

  const readBody = (req: IncomingMessage) =>
    new Promise<string>((resolve) => {
      let data = "";
      req.on("data", (c) => (data += c));
      req.on("end", () => resolve(data));
    });

  const page = (title: string, body: string) =>
    `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(title)}</title>
<style>body{font-family:system-ui,sans-serif;margin:2rem;max-width:60rem;color:#0f172a}table{border-collapse:collapse;width:100%}
td,th{padding:.5rem;border-bottom:1px solid #e2e8f0;text-align:left}a{color:#9d4f25}pre{white-space:pre-wrap;background:#f8fafc;padding:1rem}
iframe{width:100%;height:30rem;border:1px solid #cbd5e1}</style></head><body>${body}</body></html>`;

  const http = createServer(async (req, res) => {
    const url = new URL(req.url ?? "/", `http://127.0.0.1:${httpPort}`);
    const to = url.searchParams.get("to")?.toLowerCase();
    const match = (m: StoredMessage) => !to || m.to.includes(to);
    try {
      if (url.pathname === "/health") return send(res, 200, { ok: true });
      if (url.pathname === "/_fake/reset" && req.method === "POST") {
        for (const m of readdirSync(dir)) rmSync(join(dir, m), { force: true });
        tempFail = 0;
        return send(res, 200, { ok: true });
      }
      if (url.pathname === "/_fake/faults" && req.method === "POST") {
        const body = JSON.parse((await readBody(req)) || "{}") as { tempFail?: number };
        tempFail = Math.max(0, Number(body.tempFail ?? 0));
        return send(res, 200, { tempFail });
      }
      if (url.pathname === "/api/messages" && req.method === "GET")
        return send(res, 200, all().filter(match));
      if (url.pathname === "/api/messages" && req.method === "DELETE") {
        let deleted = 0;
        for (const f of readdirSync(dir).filter((x) => x.endsWith(".json"))) {
          const m = JSON.parse(readFileSync(join(dir, f), "utf8")) as StoredMessage;
          if (match(m)) {
            rmSync(join(dir, f));
            deleted += 1;
          }
        }
        return send(res, 200, { deleted });
      }
      const one = url.pathname.match(/^\/(?:api\/)?messages\/([\w-]+)$/);
      if (one && req.method === "GET") {
        const m = all().find((x) => x.id === one[1]);
        if (!m) return send(res, 404, { error: "no such message" });
        if (url.pathname.startsWith("/api/")) return send(res, 200, m);
        const links = m.links
          .map((l) => `<li><a href="${escapeHtml(l)}">${escapeHtml(l)}</a></li>`)
          .join("");
        return send(
          res,
          200,
          page(
            m.subject,
            `<p><a href="/">← Mailbox</a></p><h1>${escapeHtml(m.subject)}</h1><p>To ${escapeHtml(m.to.join(", "))} · ${escapeHtml(m.receivedAt)}</p>
<h2>HTML part</h2>${m.html ? `<iframe sandbox srcdoc="${escapeHtml(m.html)}"></iframe>` : "<p>none</p>"}
<h2>Text part</h2><pre>${escapeHtml(m.text)}</pre><h2>Links</h2><ul>${links}</ul>`,
          ),
          "text/html; charset=utf-8",
        );
      }
      if (url.pathname === "/" && req.method === "GET") {
        const rows = all()
          .filter(match)
          .map(
            (m) =>
              `<tr><td>${escapeHtml(m.receivedAt.replace("T", " ").slice(0, 19))}</td><td>${escapeHtml(m.to.join(", "))}</td><td><a href="/messages/${m.id}">${escapeHtml(m.subject)}</a></td></tr>`,
          )
          .join("");
        return send(
          res,
          200,
          page(
            "Demo mailbox",
            `<h1>Demo mailbox</h1><p>Every e-mail Loopwright sends locally lands here.</p><table><thead><tr><th>Received</th><th>To</th><th>Subject</th></tr></thead><tbody>${rows || '<tr><td colspan="3">No messages yet.</td></tr>'}</tbody></table>`,
          ),
          "text/html; charset=utf-8",
        );
      }
      send(res, 404, { error: "not found" });
    } catch (err) {
      send(res, 500, { error: err instanceof Error ? err.message : "error" });
    }
  });

  return new Promise<{ close: () => Promise<void>; smtpPort: number; httpPort: number }>(
    (resolve, reject) => {
      smtp.on("error", reject);
      smtp.listen(smtpPort, "127.0.0.1", () => {
        http.listen(httpPort, "127.0.0.1", () =>
          resolve({
            smtpPort,
            httpPort,
            close: () =>
              new Promise<void>((done) => {
                http.close(() => smtp.close(() => done()));
              }),
          }),
        );
      });
    },
  );
}

// Run directly: `tsx mocks/mail/server.ts`.
if (process.argv[1] && /mocks[\\/]mail[\\/]server\.ts$/.test(process.argv[1])) {
  startMailFake().then(
    ({ smtpPort, httpPort }) =>
      console.log(
        `[mail-fake] SMTP on 127.0.0.1:${smtpPort}, mailbox on http://127.0.0.1:${httpPort}`,
      ),
    (err: unknown) => {
      console.error("[mail-fake] failed to start:", err);
      process.exit(1);
    },
  );
}
