// Entry of a fit worker thread (../fit-pool.ts). Worker threads do not take --import from
// execArgv on every Node version we support, so the TypeScript loader is registered here, before
// the fit code is loaded.
import { register } from "tsx/esm/api";

register();
await import("./fit-worker-loop.ts");
