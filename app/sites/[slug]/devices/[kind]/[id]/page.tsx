import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { DeviceStatus } from "@/components/houses/DeviceStatus";
import { ConnectionDetails } from "@/components/setup/ConnectionDetails";
import { CredentialPanel } from "@/components/setup/CredentialPanel";
import { FollowSensor } from "@/components/setup/FollowSensor";
import { PageTitle } from "@/components/setup/PageTitle";
import { PlugForm } from "@/components/setup/PlugForm";
import { PlugSummary } from "@/components/setup/PlugSummary";
import { RetireDevice } from "@/components/setup/RetireDevice";
import { Section } from "@/components/setup/Section";
import { SensorForm } from "@/components/setup/SensorForm";
import { deviceFormOptions } from "@/components/setup/new-device";
import { Notice } from "@/components/ui/Notice";
import { getCredentialStatus, getDevicesBySite, getPlugsWithoutSensor } from "@/db/queries/devices";
import { getPlug } from "@/db/queries/plugs";
import { getSensor } from "@/db/queries/sensors";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { can } from "@/lib/permissions";
import { plugFormValues } from "@/lib/schemas/plug";
import { env } from "@/lib/server/env";
import { getCurrentSite } from "../../../current-site";

type Props = { params: Promise<{ slug: string; kind: string; id: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

async function loadDevice(props: Props) {
  const { slug, kind, id } = await props.params;
  const { site } = await getCurrentSite(slug);
  if (kind === "plug") {
    const plug = await getPlug({ siteId: site.id, plugId: id });
    if (plug) return { site, kind, device: plug, plug, sensor: null } as const;
  } else if (kind === "sensor") {
    const sensor = await getSensor({ siteId: site.id, sensorId: id });
    if (sensor) return { site, kind, device: sensor, plug: null, sensor } as const;
  }
  notFound();
}

export async function generateMetadata(props: Props): Promise<Metadata> {
  const { device } = await loadDevice(props);
  return { title: device.name };
}

export default async function DevicePage(props: Props) {
  const { site, kind, device, plug, sensor } = await loadDevice(props);
  const added = (await props.searchParams).added === "1";
  const [options, listed, credential] = await Promise.all([
    deviceFormOptions(site.id, device.houseId),
    getDevicesBySite({ siteId: site.id, includeRetired: true }),
    getCredentialStatus({ siteId: site.id, kind, deviceId: device.deviceId }),
  ]);
  const canManage = can(site.role, "devices.manage");
  const retired = Boolean(device.retiredAt);
  const presence = (kind === "plug" ? listed.plugs : listed.sensors).find((d) => d.id === device.id);
  const house = options.houses.find((h) => h.id === device.houseId);
  const houseSensors = listed.sensors.filter((s) => s.houseId === device.houseId && !s.retiredAt);
  const unfollowing = kind === "sensor" ? await getPlugsWithoutSensor({ siteId: site.id, houseId: device.houseId }) : [];
  const url = `/api/sites/${site.id}/devices/${kind}/${device.id}/credential`;

  return (
    <div className="flex flex-col gap-6">
      <PageTitle title={device.name} back={{ href: `/sites/${site.slug}/devices`, label: "Devices" }}>
        {kind === "plug" ? "Plug" : "Sensor"} in{" "}
        {house ? (
          <Link href={`/sites/${site.slug}/houses/${house.id}`} className="font-medium text-leaf-800 underline">
            {house.name}
          </Link>
        ) : (
          "its house"
        )}
        {" · "}
        {retired ? "Retired" : presence ? <DeviceStatus online={presence.online} lastSeenAt={presence.lastSeenAt} now={listed.at} timeZone={site.timeZone} /> : null}
      </PageTitle>

      {added ? (
        <Notice>
          Added. Next, issue its credential below and put it in the device with the connection details.
          {kind === "plug" && houseSensors.length === 0 && canManage ? (
            <>
              {" "}
              This house has no sensor yet:{" "}
              <Link href={`/sites/${site.slug}/devices/sensors/new?house=${device.houseId}`} className="font-semibold underline">
                add its sensor
              </Link>
              .
            </>
          ) : null}{" "}
          <Link href={`/sites/${site.slug}/houses/${device.houseId}`} className="font-semibold underline">
            See the house’s set-up steps
          </Link>
          .
        </Notice>
      ) : null}
      {retired ? <Notice>Retired {device.retiredAt!.toISOString().slice(0, 10)}: no longer switched or read, and its credential is revoked. Its history is kept.</Notice> : null}

      {kind === "sensor" && canManage && !retired && unfollowing.length ? (
        <Section title="Plugs that could follow it">
          <FollowSensor siteId={site.id} sensorId={device.id} plugs={unfollowing} />
        </Section>
      ) : null}

      {kind === "sensor" && can(site.role, "readings.import") ? (
        <Section title="History from a file">
          <p className="text-sm text-frost-700">
            Readings this thermometer kept before Cloche heard it can be imported from the CSV file its own app exports.{" "}
            <Link href={`/sites/${site.slug}/devices/import?sensor=${device.id}`} className="font-semibold text-leaf-800 underline">
              Import readings from a file
            </Link>
          </p>
        </Section>
      ) : null}

      <Section title="Credential">
        <CredentialPanel
          url={url}
          timeZone={site.timeZone}
          status={credential ? { issuedAt: credential.issuedAt.toISOString(), revokedAt: credential.revokedAt?.toISOString() ?? null } : null}
          canManage={canManage}
          retired={retired}
        />
      </Section>

      <Section title="Connection details">
        <ConnectionDetails
          broker={env().CLOCHE_MQTT_URL}
          username={deviceUsername(site.slug, kind, device.deviceId)}
          siteSlug={site.slug}
          kind={kind}
          deviceId={device.deviceId}
        />
      </Section>

      <Section title={canManage && !retired ? "Settings" : "About it"}>
        {kind === "plug" ? (
          canManage && !retired ? (
            <PlugForm siteId={site.id} slug={site.slug} mains={site} houses={options.houses} sensors={options.sensors} plug={plugFormValues(plug!)} />
          ) : (
            <PlugSummary plug={plug!} sensorName={listed.sensors.find((s) => s.id === plug!.sensorId)?.name ?? null} />
          )
        ) : canManage && !retired ? (
          <SensorForm siteId={site.id} slug={site.slug} houses={options.houses} sensor={{ id: device.id, name: device.name, deviceId: device.deviceId, houseId: device.houseId, placement: sensor!.placement }} />
        ) : (
          <p className="text-sm text-frost-900">
            Device id <span className="font-mono">{device.deviceId}</span>
          </p>
        )}
      </Section>

      {canManage && !retired ? (
        <Section title={`Retire the ${kind}`}>
          <RetireDevice url={kind === "plug" ? `/api/sites/${site.id}/plugs/${device.id}` : `/api/sites/${site.id}/sensors/${device.id}`} kind={kind} name={device.name} slug={site.slug} />
        </Section>
      ) : null}

    </div>
  );
}
