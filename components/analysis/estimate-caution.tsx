/** The caution every page with fitted numbers carries (DESIGN.md §8). */
export function EstimateCaution() {
  return (
    <p className="mb-6 flex items-start gap-2 rounded-sm border border-rule bg-sheet px-3 py-2 text-sm" role="note">
      <span aria-hidden className="font-bold text-warn">
        △
      </span>
      <span>
        <strong className="font-semibold">Fits give estimates, not calibrations.</strong>{" "}
        <span className="text-muted">State the model, the weighting and the assumptions beside any number you publish.</span>
      </span>
    </p>
  );
}
