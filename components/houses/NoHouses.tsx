import { Card } from "@/components/ui/Card";

export function NoHouses({ siteName }: { siteName: string }) {
  return (
    <Card className="px-5 py-10 text-center">
      <p className="text-lg font-semibold text-frost-900">No houses yet</p>
      <p className="mx-auto mt-2 max-w-md text-sm text-frost-600">
        Once houses are added to {siteName}, each appears here with its plugs, sensors and readings.
      </p>
    </Card>
  );
}
