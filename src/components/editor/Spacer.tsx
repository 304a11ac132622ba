/** Column windowing: stands in for `count` columns that are not rendered. */
export function Spacer({ count }: { count: number }) {
  if (count <= 0) return null;
  return <div className="tx-spacer" aria-hidden="true" style={{ width: `calc(var(--cell) * ${count})` }} />;
}
