"use client";

import { useRouter } from "next/navigation";
import { ConfirmButton } from "./ConfirmButton";

type RetireDeviceProps = { url: string; kind: "plug" | "sensor"; name: string; slug: string };

export function RetireDevice({ url, kind, name, slug }: RetireDeviceProps) {
  const router = useRouter();
  return (
    <ConfirmButton
      label={`Retire this ${kind}`}
      confirmLabel={`Retire “${name}”`}
      url={url}
      method="DELETE"
      warning={
        <p>
          {kind === "plug" ? "Cloche stops switching it" : "Cloche stops reading it"}, its credential is revoked so it can no longer sign in, and it
          leaves the working devices. Its history stays. Its device id cannot be used again in this site.
        </p>
      }
      onDone={() => {
        router.push(`/sites/${slug}/devices`);
        router.refresh();
      }}
    />
  );
}
