/** Where live temperature and humidity will go; until readings arrive, says so plainly. */
export function ReadingsPlaceholder({ hasSensor }: { hasSensor: boolean }) {
  return (
    <div className="rounded-lg border border-dashed border-frost-300 bg-frost-50 px-3 py-3">
      <p className="text-sm font-medium text-frost-800">No readings yet</p>
      <p className="mt-0.5 text-xs text-frost-600">
        {hasSensor
          ? "Temperature and humidity show here once this house’s sensor reports."
          : "Add a sensor to this house to see its temperature and humidity here."}
      </p>
    </div>
  );
}
