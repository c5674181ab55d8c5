import { guardRoute } from "@/app/guard";
import { readJsonBody } from "@/lib/api/body";
import { storeDefinitionFromApi } from "@/lib/services/api";
import { api } from "../../_lib/apiRoute";
import { answered, kindOf } from "../../_lib/params";

export const dynamic = "force-dynamic";

/** A new definition: version 1, from the same JSON the CLI reads. */
export const POST = guardRoute("definition:edit", api<{ kind: string }>(async (req, { params, actor }) => {
  const kind = kindOf(params.kind);
  const body = await readJsonBody(req);
  return Response.json(answered(await storeDefinitionFromApi(kind, body, actor)), { status: 201 });
}));
