/** An observer as the Review desk's tables show them: name, then their code in small type. */
export function ObserverTag({ name, code }: { name: string; code: string }) {
  return (
    <span>
      {name} <span className="text-xs text-ink-500">{code}</span>
    </span>
  );
}
