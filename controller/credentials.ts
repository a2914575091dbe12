// The devices' sign-in secrets (their stored hashes), held in memory so that a device
// signs in without asking the database: real plugs and sensors reconnect whenever
// their Wi-Fi drops, and a database that hangs must not lock them out. Loaded with the
// configuration and replaced site by site when a site is reloaded (a credential issued
// or revoked in the app wakes its site at once). A sign-in that memory cannot accept
// is looked up once more in the database, within its deadline, in case the wake-up
// was missed: a device already known never waits on it.
export type StoredCredential = { siteId: string; username: string; secretHash: string };

export function createCredentials() {
  const byUsername = new Map<string, StoredCredential>();

  return {
    /**
     * Takes in what was loaded for `siteIds`: their earlier entries are replaced.
     * `everySite` (a full reload) also forgets sites no longer served.
     */
    replace(siteIds: string[], loaded: StoredCredential[], everySite: boolean) {
      const reloaded = new Set(siteIds);
      for (const [username, credential] of byUsername) {
        if (everySite || reloaded.has(credential.siteId)) byUsername.delete(username);
      }
      for (const credential of loaded) byUsername.set(credential.username, credential);
    },
    /** One credential looked up on its own (issued since the last reload); null forgets it. */
    learn(username: string, found: StoredCredential | null) {
      if (found) byUsername.set(username, found);
      else byUsername.delete(username);
    },
    secretHash: (username: string): string | null => byUsername.get(username)?.secretHash ?? null,
    size: () => byUsername.size,
  };
}

export type Credentials = ReturnType<typeof createCredentials>;
