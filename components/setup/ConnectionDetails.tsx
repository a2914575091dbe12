import { deviceTopics } from "@/lib/mqtt/connection";
import type { DeviceKind } from "@/lib/mqtt/topics";

type ConnectionDetailsProps = { broker: string; username: string; siteSlug: string; kind: DeviceKind; deviceId: string };

const ROLE_LABELS = { subscribe: "Subscribes", publish: "Publishes", "last will": "Publishes, and as last will" } as const;

/** What someone configuring real hardware needs: where to connect, as whom, and the topics of the device contract. */
export function ConnectionDetails({ broker, username, siteSlug, kind, deviceId }: ConnectionDetailsProps) {
  const topics = deviceTopics(siteSlug, kind, deviceId);
  return (
    <div className="flex flex-col gap-4 text-sm">
      <dl className="grid gap-3 sm:grid-cols-2">
        <div>
          <dt className="text-xs text-frost-600">Broker</dt>
          <dd className="break-all font-mono text-frost-950">{broker}</dd>
        </div>
        <div>
          <dt className="text-xs text-frost-600">User name</dt>
          <dd className="break-all font-mono text-frost-950">{username}</dd>
        </div>
        <div>
          <dt className="text-xs text-frost-600">Password</dt>
          <dd className="text-frost-900">The secret from “Issue a credential”</dd>
        </div>
        <div>
          <dt className="text-xs text-frost-600">Protocol</dt>
          <dd className="text-frost-900">MQTT 3.1.1 or 5, JSON payloads, times in ISO 8601</dd>
        </div>
      </dl>
      <ul className="flex flex-col gap-3">
        {topics.map((t) => (
          <li key={t.topic} className="rounded-lg border border-frost-200 p-3">
            <p className="break-all font-mono text-frost-950">{t.topic}</p>
            <p className="mt-1 text-frost-700">
              {ROLE_LABELS[t.role]} · QoS {t.qos}
              {t.retained ? " · retained" : ""} — {t.what}
            </p>
            <pre className="mt-2 whitespace-pre-wrap break-all rounded-md bg-frost-100 px-3 py-2 font-mono text-xs text-frost-900">{t.example}</pre>
          </li>
        ))}
      </ul>
      <p className="text-xs text-frost-600">A device may use only these topics; the broker refuses any other.</p>
    </div>
  );
}
