/** The caution line shown above everything, always. */
export function CautionBanner() {
  return (
    <div className="t-caution" role="note" aria-label="Caution">
      Research tool — not a medical device; not for diagnosis. Demo data are synthetic.
    </div>
  );
}
