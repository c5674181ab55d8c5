import { openAlertCount } from "@/lib/db/monitors";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** The navigation badge's count of open monitor alerts. */
export const GET = guardRoute("read", async () => {
  return Response.json({ open: await openAlertCount() }, { headers: { "Cache-Control": "no-store" } });
});
