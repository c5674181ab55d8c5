import { guardRoute } from "@/app/guard";
import { traceForApi } from "@/lib/services/api";
import { api } from "../../_lib/apiRoute";
import { answered } from "../../_lib/params";

export const dynamic = "force-dynamic";

export const GET = guardRoute("read", api<{ id: string }>(async (_req, { params }) => Response.json(answered(await traceForApi(params.id)))));
