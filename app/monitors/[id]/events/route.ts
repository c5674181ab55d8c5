import { livePayload } from "@/lib/services/monitorPage";
import { onMonitorChange } from "@/lib/services/liveRegistry";
import { ensureSweeper } from "@/lib/services/monitors";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** Heartbeat (an SSE comment) so proxies keep the stream open, and a refresh of the staleness clock. */
const HEARTBEAT_MS = 15_000;

/**
 * Server-Sent Events for the live page: a "state" event with the whole page payload on connect and after
 * every change (new readings, alerts raised or cleared), at most one per 250 ms.
 */
export const GET = guardRoute("read", async (req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const { id } = await ctx.params;
  const first = await livePayload(id);
  if (!first) return new Response("no such monitor", { status: 404 });
  ensureSweeper();
  const enc = new TextEncoder();
  let stop = () => {};
  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      let closed = false;
      let timer: ReturnType<typeof setTimeout> | null = null;
      const send = (text: string) => {
        if (!closed) controller.enqueue(enc.encode(text));
      };
      const push = async () => {
        timer = null;
        try {
          const p = await livePayload(id);
          if (p) send(`event: state\ndata: ${JSON.stringify(p)}\n\n`);
        } catch (e) {
          console.error(`live events for ${id}:`, e);
        }
      };
      send(`retry: 2000\nevent: state\ndata: ${JSON.stringify(first)}\n\n`);
      const off = onMonitorChange(id, () => {
        timer ??= setTimeout(push, 250);
      });
      const beat = setInterval(() => send(`: heartbeat\n\n`), HEARTBEAT_MS);
      stop = () => {
        if (closed) return;
        closed = true;
        off();
        clearInterval(beat);
        if (timer) clearTimeout(timer);
        try {
          controller.close();
        } catch {
          /* already closed by the client */
        }
      };
      req.signal.addEventListener("abort", () => stop());
    },
    cancel() {
      stop();
    },
  });
  return new Response(stream, { headers: { "Content-Type": "text/event-stream; charset=utf-8", "Cache-Control": "no-cache, no-transform", Connection: "keep-alive", "X-Accel-Buffering": "no" } });
});
