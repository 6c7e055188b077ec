/** A refused write said in the server's own words, beside the control that sent it. */
export function Problem({ error }: { error: Error | null }) {
  if (!error) return null;
  return (
    <p role="alert" className="mt-2 font-medium text-state-stop">
      ⚠ {error.message}
    </p>
  );
}
