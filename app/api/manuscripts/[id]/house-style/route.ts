// The manuscript's house style for figure exports: font, text sizes, line widths, panel letters.
import { withPermission } from "@/lib/http/route";
import { houseStyleSchema } from "@/lib/figures/house-style";
import { getHouseStyle, setHouseStyle } from "@/lib/server/house-style";

export const GET = withPermission("manuscript.read", { scope: ({ params }) => params.id }, async ({ user, params }) => getHouseStyle(user, params.id));

export const PUT = withPermission("figure.edit", { scope: ({ params }) => params.id, body: houseStyleSchema }, async ({ user, params, body }) =>
  setHouseStyle(user, params.id, body),
);
