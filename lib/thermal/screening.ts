/** A duration in readable units: "45 s", "12.5 min", "3 h 20 min", "2 d 4 h". */
export function readableDuration(seconds: number): string {
  if (!Number.isFinite(seconds)) return String(seconds);
  if (seconds < 90) return `${Number(seconds.toPrecision(3))} s`;
  const min = seconds / 60;
  if (min < 90) return `${Number(min.toPrecision(3))} min`;
  const totalMin = Math.round(min);
  const h = Math.floor(totalMin / 60);
  if (h < 48) return `${h} h ${totalMin - h * 60} min`;
  const totalH = Math.round(min / 60);
  const d = Math.floor(totalH / 24);
  return `${d} d ${totalH - d * 24} h`;
}
