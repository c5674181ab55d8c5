import { openAlertCount } from "@/lib/db/monitors";
import { LiveAlertBadge } from "./LiveAlertBadge";

/** The number of open monitor alerts beside "Monitors" in the navigation, kept current by the client. */
export async function AlertBadge() {
  return <LiveAlertBadge initial={await openAlertCount()} />;
}
