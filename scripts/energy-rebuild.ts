// Makes the energy roll-up (energy_days) again from the switch log and meter samples.
//
//   npm run energy:rebuild                  every site
//   npm run energy:rebuild -- --site SLUG   one site
//
// Uses DATABASE_URL, or the private database of a running `npm start`. Safe while the
// controller runs: each plug's days are rebuilt under the same lock its upkeep takes.
import { inArray } from "drizzle-orm";
import { connect } from "../db/client";
import { rebuildEnergyDays } from "../db/energy-days";
import { sites } from "../db/schema";
import { runningDevDatabaseUrl } from "./local-server";

function siteSlugs(argv: string[]): string[] {
  const slugs: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    if (argv[i] === "--site" && argv[i + 1]) slugs.push(argv[++i]!);
    else if (argv[i]?.startsWith("--site=")) slugs.push(argv[i]!.slice("--site=".length));
    else throw new Error(`unknown argument ${JSON.stringify(argv[i])}; use --site SLUG`);
  }
  return slugs;
}

async function main() {
  const slugs = siteSlugs(process.argv.slice(2));
  const url = process.env.DATABASE_URL ?? runningDevDatabaseUrl();
  if (!url) throw new Error("No database: start Cloche first (npm start), or set DATABASE_URL.");
  const { db, pool } = connect(url, { timeoutMs: Infinity });
  try {
    let siteIds: string[] | undefined;
    if (slugs.length) {
      const found = await db.select({ id: sites.id, slug: sites.slug }).from(sites).where(inArray(sites.slug, slugs));
      const missing = slugs.filter((s) => !found.some((f) => f.slug === s));
      if (missing.length) throw new Error(`no site with slug ${missing.join(", ")}`);
      siteIds = found.map((f) => f.id);
    }
    const began = Date.now();
    let shown = 0;
    const done = await rebuildEnergyDays(db, {
      siteIds,
      onProgress: (p) => {
        if (Date.now() - shown > 2000 || p.plugs === p.of) {
          shown = Date.now();
          console.log(`  ${p.plugs}/${p.of} plugs, ${p.switches.toLocaleString("en")} switches read, ${p.cells.toLocaleString("en")} rows written`);
        }
      },
    });
    console.log(`energy roll-up rebuilt: ${done.plugs} plugs, ${done.switches.toLocaleString("en")} switches, ${done.cells.toLocaleString("en")} rows in ${((Date.now() - began) / 1000).toFixed(1)} s`);
  } finally {
    await pool.end();
  }
}

main().catch((error: unknown) => {
  console.error(`energy:rebuild failed: ${(error as Error).message}`);
  process.exit(1);
});
