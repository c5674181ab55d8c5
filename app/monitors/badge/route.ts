import { openAlertCount } from "@/lib/db/monitors";

export const dynamic = "force-dynamic";

/** The navigation badge's count of open monitor alerts. */
export async function GET() {
  return Response.json({ open: await openAlertCount() }, { headers: { "Cache-Control": "no-store" } });
}
