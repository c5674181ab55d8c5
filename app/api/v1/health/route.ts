import { publicRoute } from "@/app/guard";
import { health } from "@/lib/services/api";

export const dynamic = "force-dynamic";

/** No token needed: for load balancers and monitoring. */
export const GET = publicRoute("the health check answers anyone (load balancers, monitoring)", async () => Response.json(health()));
