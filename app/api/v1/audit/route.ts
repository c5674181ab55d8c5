import { guardRoute } from "@/app/guard";
import { auditQuerySchema } from "@/lib/api/schemas";
import { auditForApi } from "@/lib/services/api";
import { api } from "../_lib/apiRoute";
import { queryOf } from "../_lib/params";

export const dynamic = "force-dynamic";

/** The audit chain in order, for external archiving: walk it with `after` = the previous page's next_after. */
export const GET = guardRoute("read", api(async (req) => {
  const q = queryOf(req, auditQuerySchema);
  return Response.json(await auditForApi(q.after ?? 0, q.limit ?? 100));
}));
