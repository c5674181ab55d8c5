const LABELS: Record<string, string> = {
  pass: "pass",
  fail: "fail",
  inconclusive: "inconclusive",
  accept: "accept",
  hold: "hold for review",
  reject: "reject",
};

export function StatusBadge({ status }: { status: string }) {
  return <span className={`status status-${status}`}>{LABELS[status] ?? status}</span>;
}
