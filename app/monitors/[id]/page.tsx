import { headers } from "next/headers";
import { notFound } from "next/navigation";
import { livePayload } from "@/lib/services/monitorPage";
import { ensureSweeper, usesDemoToken } from "@/lib/services/monitors";
import { DEMO_MONITOR } from "@/lib/services/demoNames";
import { displayZone } from "@/app/displayZone";
import { LiveView } from "./LiveView";

export const dynamic = "force-dynamic";

export default async function MonitorPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const [payload, zone] = await Promise.all([livePayload(id), displayZone()]);
  if (!payload) notFound();
  ensureSweeper();
  // the demo monitor's token is public (README): show the whole command that feeds it
  const demoToken = (await usesDemoToken(id, DEMO_MONITOR.token)) ? DEMO_MONITOR.token : null;
  // the address this page was served from, for the replay command's --url (its default, port 3000, may be another server)
  const h = await headers();
  const host = h.get("x-forwarded-host") ?? h.get("host");
  const origin = host ? `${h.get("x-forwarded-proto")?.split(",")[0]?.trim() || "http"}://${host}` : null;
  return <LiveView initial={payload} zone={zone} demoToken={demoToken} origin={origin} />;
}
