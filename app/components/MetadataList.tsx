/** The metadata lines a logger wrote above or below its data ("Logger serial: A1234"), as read and stored. */
export function MetadataList({ lines, testId }: { lines: ReadonlyArray<{ row: number; key: string; value: string }>; testId: string }) {
  if (lines.length === 0) return null;
  return (
    <table data-testid={testId} className="metadata">
      <thead><tr><th className="num">line</th><th>key</th><th>value</th></tr></thead>
      <tbody>
        {lines.map((m) => (
          <tr key={m.row}><td className="num">{m.row}</td><td>{m.key || <span className="muted">(title)</span>}</td><td>{m.value}</td></tr>
        ))}
      </tbody>
    </table>
  );
}
