/**
 * Mail render child: a plain Node process (child_process.fork with IPC) that turns mail views into
 * HTML with react-email. Not in the server process because React renders HTML only outside the
 * react-server condition, which Next's server code and the tsx scripts run under.
 * Started by ../render-html.ts from process.cwd(); plain JavaScript, no path aliases.
 *
 * Messages in:  { id, views: MailView[] }
 * Messages out: { type: "ready" } once, then { id, html: Array<string | null>, errors: string[] }
 */
import { renderMailView } from "./mail-views.mjs";

process.on("message", async (msg) => {
  const html = [];
  const errors = [];
  for (const view of msg.views) {
    try {
      html.push(await renderMailView(view));
    } catch (err) {
      html.push(null);
      errors.push(String(err?.message ?? err));
    }
  }
  process.send({ id: msg.id, html, errors });
});
process.send({ type: "ready" });
