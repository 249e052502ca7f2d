import "server-only";
import fs from "node:fs";
import path from "node:path";
import net from "node:net";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";
import { newId } from "../crypto";

export interface SinkHandle {
  port: number;
  close(): Promise<void>;
}

function portInUse(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect({ port, host: "127.0.0.1" }, () => {
      s.destroy();
      resolve(true);
    });
    s.on("error", () => resolve(false));
  });
}

/**
 * A real SMTP listener on loopback that stores each message as `<id>.eml` plus `<id>.json`
 * (envelope, subject, text, html). Refuses to start when the port is taken, and says so.
 */
export async function startMailSink(opts: { port: number; dir: string; quiet?: boolean }): Promise<SinkHandle> {
  if (await portInUse(opts.port)) throw new Error(`Port ${opts.port} is already in use: another mail sink (or program) is listening there.`);
  fs.mkdirSync(opts.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on(
        "end",
        () =>
          void (async () => {
            try {
              const raw = Buffer.concat(chunks);
              const parsed = await simpleParser(raw);
              const id = `${Date.now()}-${newId()}`;
              fs.writeFileSync(path.join(opts.dir, `${id}.eml`), raw);
              const record = {
                id,
                receivedAt: new Date().toISOString(),
                envelope: {
                  from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
                  to: session.envelope.rcptTo.map((r) => r.address),
                },
                messageId: parsed.messageId ?? null,
                subject: parsed.subject ?? "",
                text: parsed.text ?? "",
                html: typeof parsed.html === "string" ? parsed.html : null,
              };
              // Written last and atomically: a reader never sees a half message.
              const tmp = path.join(opts.dir, `.${id}.json.tmp`);
              fs.writeFileSync(tmp, JSON.stringify(record, null, 2));
              fs.renameSync(tmp, path.join(opts.dir, `${id}.json`));
              if (!opts.quiet) console.log(`[mail-sink] ${record.envelope.to.join(", ")} — ${record.subject}`);
              callback();
            } catch (err) {
              callback(err as Error);
            }
          })(),
      );
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, "127.0.0.1", () => resolve());
  });
  return { port: opts.port, close: () => new Promise<void>((r) => server.close(() => r())) };
}
