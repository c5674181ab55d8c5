import { guardRoute } from "@/app/guard";
import { readJsonBody } from "@/lib/api/body";
import { storeDefinitionFromApi } from "@/lib/services/api";
import { api } from "../../../_lib/apiRoute";
import { answered, kindOf } from "../../../_lib/params";

export const dynamic = "force-dynamic";

/** A new version of the definition `id` belongs to; earlier versions stay as they were. */
export const PUT = guardRoute("definition:edit", api<{ kind: string; id: string }>(async (req, { params, actor }) => {
  const kind = kindOf(params.kind);
  const body = await readJsonBody(req);
  return Response.json(answered(await storeDefinitionFromApi(kind, body, actor, params.id)), { status: 201 });
}));
