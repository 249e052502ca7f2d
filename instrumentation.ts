export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { stampPeerAddress } = await import("@/lib/server/edge/stamp-peer-address");
  stampPeerAddress();
  // The write-ahead log is copied into the database file off the main thread, not by whichever commit fills it.
  const [{ startCheckpointer }, { env }] = await Promise.all([import("@/db/checkpointer"), import("@/lib/env")]);
  startCheckpointer(env().databaseUrl);
  // Part files left by a crash or a killed process; a generous grace spares another instance's upload in progress.
  const { startOrphanSweeper, sweepUploadTemp } = await import("@/lib/server/storage");
  await sweepUploadTemp(30 * 60 * 1000).catch((err) => console.warn("[prooflight] could not sweep uploads/tmp:", (err as Error).message));
  // Stored files no version references (a crash between storing a file and recording it), past their grace period.
  startOrphanSweeper();
  const { startOutboxWorker } = await import("@/lib/server/mail/outbox");
  startOutboxWorker();
  // Digests fall due at each person's hour; every instance may look (the unique period key sends each once).
  const { startDigestScheduler } = await import("@/lib/server/mail/digests");
  startDigestScheduler();
}
