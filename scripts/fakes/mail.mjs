// Local mail capture: an in-process SMTP server (smtp-server) that accepts every message on 127.0.0.1 and stores it
// as one JSON file under .data/mail/ (test mode: .data/mail-test/, emptied at start). Nothing is ever delivered.
// The app sends to it with nodemailer (SMTP_URL) and the development mailbox page reads MAIL_CAPTURE_DIR.
import { mkdirSync, readdirSync, rmSync, writeFileSync, renameSync } from "node:fs";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { SMTPServer } from "smtp-server";
import { simpleParser } from "mailparser";
import { HOST, ROOT, portFromEnv } from "../lib/common.mjs";

export const name = "mail capture";

/** Messages larger than this are refused (the app's mails are a few kilobytes). */
const MAX_BYTES = 5 * 1024 * 1024;

/**
 * Starts the capture server. `dir` and `port` may be given directly (tests of the fake itself do).
 * @param {{ mode?: "dev" | "test", port?: number, dir?: string }} options
 */
export async function start({ mode = "dev", port, dir } = {}) {
  const test = mode === "test";
  const smtpPort = port ?? (test ? portFromEnv("TEST_SMTP_PORT", 2526) : portFromEnv("SMTP_PORT", 2525));
  const base = process.env.TACTUS_DATA_DIR || path.join(ROOT, ".data");
  const folder = path.resolve(dir ?? path.join(base, test ? "mail-test" : "mail"));
  if (test) rmSync(folder, { recursive: true, force: true });
  mkdirSync(folder, { recursive: true });

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    hideSTARTTLS: true,
    size: MAX_BYTES,
    logger: false,
    onData(stream, session, callback) {
      const chunks = [];
      let size = 0;
      stream.on("data", (chunk) => {
        size += chunk.length;
        if (size <= MAX_BYTES) chunks.push(chunk);
      });
      stream.on("end", async () => {
        if (stream.sizeExceeded) return callback(Object.assign(new Error("message too large"), { responseCode: 552 }));
        try {
          const raw = Buffer.concat(chunks);
          const parsed = await simpleParser(raw);
          const receivedAt = new Date();
          const id = `${receivedAt.getTime()}-${randomUUID().slice(0, 8)}`;
          const message = {
            id,
            receivedAt: receivedAt.toISOString(),
            envelope: {
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
              to: session.envelope.rcptTo.map((r) => r.address),
            },
            from: parsed.from?.text ?? "",
            to: parsed.to ? [].concat(parsed.to).map((a) => a.text).join(", ") : "",
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : "",
            messageId: parsed.messageId ?? null,
          };
          // Write then rename, so a reader never sees half a file.
          const file = path.join(folder, `${id}.json`);
          writeFileSync(`${file}.tmp`, JSON.stringify(message, null, 2));
          renameSync(`${file}.tmp`, file);
          callback();
        } catch (error) {
          callback(Object.assign(new Error(`could not store the message: ${error.message}`), { responseCode: 451 }));
        }
      });
    },
  });

  await new Promise((resolve, reject) => {
    const onError = (error) => {
      reject(
        error.code === "EADDRINUSE"
          ? new Error(`port ${smtpPort} on ${HOST} is in use: stop what holds it or set ${test ? "TEST_SMTP_PORT" : "SMTP_PORT"}=NNNN`)
          : error,
      );
    };
    server.server.once("error", onError);
    server.listen(smtpPort, HOST, () => {
      server.server.off("error", onError);
      resolve();
    });
  });
  // Errors after start (a client hanging up mid-message) must not take the process down.
  server.on("error", () => {});

  return {
    // TACTUS_DEV_MAILBOX: mail goes nowhere but here, so the app's development mailbox page is the way to read it.
    env: { SMTP_URL: `smtp://${HOST}:${smtpPort}`, MAIL_CAPTURE_DIR: folder, TACTUS_DEV_MAILBOX: "1" },
    describe: `smtp://${HOST}:${smtpPort}, messages in ${folder.startsWith(ROOT) ? path.relative(ROOT, folder) : folder} (${readdirSync(folder).length} stored)`,
    stop: () => new Promise((resolve) => server.close(() => resolve())),
  };
}
