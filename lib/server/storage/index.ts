// Start-up housekeeping for uploads (called from instrumentation.ts).
import "server-only";
export { sweepUploadTemp } from "./blob-store";
export { startOrphanSweeper } from "./orphan-sweep";
