import Link from "next/link";
import { getRun } from "@/lib/services/runs";
import { RunProgress } from "./RunProgress";
import { can, pageActor } from "@/app/guard";

export const dynamic = "force-dynamic";

export default async function RunPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const [run, actor] = await Promise.all([getRun(id), pageActor()]);
  if (!run) {
    return (
      <main>
        <h1>Run not found</h1>
        <p>This server has no run {id}. Runs are forgotten an hour after they end and when the server restarts; a run that did not finish stored nothing.</p>
        <p>
          <Link href="/reviews">Reviews</Link>
        </p>
      </main>
    );
  }
  return (
    <main>
      <h1>Running: {run.title}</h1>
      <p className="muted">The engine works in the background; you can leave this page and find the review under Reviews when it is done.</p>
      <RunProgress initial={run} mayCancel={can(actor, "review:run")} />
    </main>
  );
}
