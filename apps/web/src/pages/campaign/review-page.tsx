// Placeholder until the Review screen is built.
export function ReviewPage() {
  return (
    <section className="space-y-1">
      <h2 className="text-xl font-semibold">Review</h2>
      <p className="text-sm text-[var(--muted)]">Here you will see the geometry coloured by progress and quality, any FRF with its coherence and hits, overlays, and the reciprocity and linearity checks.</p>
    </section>
  );
}
