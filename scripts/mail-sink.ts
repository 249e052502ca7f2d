import { env } from "@/lib/env";
import { startMailSink } from "@/lib/server/mail/sink-server";

const { smtpPort, mailSinkDir } = env();
try {
  await startMailSink({ port: smtpPort, dir: mailSinkDir });
  console.log(`Mail sink listening on smtp://127.0.0.1:${smtpPort}, storing messages in ${mailSinkDir}`);
} catch (err) {
  console.error(`Mail sink not started: ${(err as Error).message}`);
  process.exit(1);
}
