export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { stampPeerAddress } = await import("@/lib/server/edge/stamp-peer-address");
  stampPeerAddress();
  const { startOutboxWorker } = await import("@/lib/server/mail/outbox");
  startOutboxWorker();
}
