/** Fixed at the top of every valve card: not a warning to click away. */
export function Cautions() {
  return (
    <section aria-labelledby="cautions" className="rounded-card border-l-8 border-ink bg-paper-sunk p-4">
      <h2 id="cautions" className="text-lg font-bold">Before you measure</h2>
      <ul className="mt-2 list-disc space-y-1 pl-6 text-lg">
        <li>Measure with the engine cold, at the temperature of the workshop.</li>
        <li>Ignition off and the bike held secure on a stand.</li>
        <li>Turn the engine by hand only, and only in its normal direction of rotation; bring each cylinder to top dead centre of its compression stroke before measuring its valves.</li>
        <li>The maker’s service manual rules for the specs, the procedure and every torque value; where it differs from this card, follow the manual.</li>
        <li>This is safety-critical work: local rules and licensed practice come first.</li>
      </ul>
    </section>
  );
}
