// Check a reproducibility bundle (multipart: file = the bundle's .zip) from its own contents: hashes, parses, fits, renders.
import { withPermission } from "@/lib/http/route";
import { verifyUploadedBundle } from "@/lib/server/export/verify-bundle";

export const POST = withPermission("bundle.verify", { rawBody: true }, ({ user, req }) => verifyUploadedBundle(user, req));
