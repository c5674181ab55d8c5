import { guardRoute } from "@/app/guard";
import { readJsonBody } from "@/lib/api/body";
import { signOffRequestSchema } from "@/lib/api/schemas";
import { signOffFromApi } from "@/lib/services/api";
import { api } from "../../../_lib/apiRoute";
import { answered, bodyOf } from "../../../_lib/params";

export const dynamic = "force-dynamic";

/** Signs a review: the token names the signer, the owner's password in the body is the second component. */
export const POST = guardRoute("review:sign", api<{ id: string }>(async (req, { params, actor }) => {
  const body = bodyOf(await readJsonBody(req), signOffRequestSchema);
  return Response.json(answered(await signOffFromApi(params.id, body, actor)));
}));
