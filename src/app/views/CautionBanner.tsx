export interface CautionBannerProps {
  /** The open sample set's `synthetic` flag; undefined while no set is open. */
  readonly synthetic?: boolean;
}

/** The caution line shown above everything, always; it says whether the open set is marked synthetic. */
export function CautionBanner({ synthetic }: CautionBannerProps) {
  const data =
    synthetic === undefined
      ? 'Images stay on this machine.'
      : synthetic
        ? 'The open sample set is synthetic (marked so in its manifest).'
        : 'The open sample set is not marked synthetic: treat it as patient data; images stay on this machine.';
  return (
    <div className="t-caution" role="note" aria-label="Caution">
      Research tool — not a medical device; not for diagnosis or treatment. {data}
    </div>
  );
}
