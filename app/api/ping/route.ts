// Fixed JSON with no database work: the anchor the benchmarks compare real routes against.
import { publicRoute } from "@/lib/http/route";

export const GET = publicRoute(() => Response.json({ ok: true }));
