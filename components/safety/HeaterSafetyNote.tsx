type HeaterSafetyNoteProps = {
  /** Shown opened where an appliance is assigned to a plug. */
  open?: boolean;
  /** The site's continuous-load margin, named when known. */
  continuousLoadPercent?: number;
};

/** The standing caution about heaters on switched plugs. */
export function HeaterSafetyNote({ open = false, continuousLoadPercent }: HeaterSafetyNoteProps) {
  const margin =
    continuousLoadPercent === undefined
      ? "with margin for loads that run for hours"
      : `and a load that runs for hours within ${continuousLoadPercent} % of that rating`;
  return (
    <details open={open} className="group rounded-lg border border-soil-200 bg-soil-50 px-4 py-3 text-sm text-soil-900">
      <summary className="flex min-h-11 cursor-pointer list-none items-center font-semibold marker:hidden [&::-webkit-details-marker]:hidden">
        <span className="inline-flex items-center gap-2">
          <span aria-hidden="true" className="inline-block transition-transform group-open:rotate-90">
            ›
          </span>
          Heaters, damp and electricity: read before you plug in
        </span>
      </summary>
      <ul className="mt-3 list-disc space-y-1.5 pl-5 text-soil-800">
        <li>Use outdoor-rated sockets and plugs on a circuit protected by an RCD (GFCI).</li>
        <li>Keep each appliance’s load within its plug’s rating, {margin}.</li>
        <li>Keep heaters clear of plants, water, and anything that can burn.</li>
        <li>Follow your local electrical codes, and a licensed electrician’s advice.</li>
      </ul>
      <p className="mt-3 text-soil-800">
        Cloche switches power on and off. It is not a safety device and does not replace thermal cut-outs, RCDs or fuses.
      </p>
    </details>
  );
}
