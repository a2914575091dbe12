/** Where live temperature and humidity go; until readings arrive, says so plainly. */
export function ReadingsPlaceholder({ hasSensor, heardBefore = false }: { hasSensor: boolean; heardBefore?: boolean }) {
  return (
    <div className="rounded-lg border border-dashed border-frost-300 bg-frost-50 px-3 py-3">
      <p className="text-sm font-medium text-frost-800">{heardBefore ? "No readings in the last 24 hours" : "No readings yet"}</p>
      <p className="mt-0.5 text-xs text-frost-600">
        {!hasSensor
          ? "Add a sensor to this house to see its temperature and humidity here."
          : heardBefore
            ? "The sensor has been heard from before but has not sent a reading today. Check its battery and signal."
            : "Temperature and humidity show here once this house’s sensor reports."}
      </p>
    </div>
  );
}
