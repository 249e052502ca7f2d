// Start-up housekeeping for uploads (called from instrumentation.ts).
export { sweepUploadTemp } from "./blob-store";
