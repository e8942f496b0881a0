// `npm run bench [name ...]`: runs the benches listed here, all of them when
// no name is given. Benches are plain scripts (not vitest bench) so that each
// can print its own side-by-side table.

import { benchPhysics } from "./physics.bench";
import { benchLedger } from "./ledger.bench";
import { benchPages } from "./pages.bench";
import { benchReadings } from "./readings.bench";
import { benchReports } from "./reports.bench";
import { benchScaling } from "./scaling.bench";
import { benchSupplierFiles } from "./supplier-files.bench";
import { benchUpload } from "./upload.bench";

const BENCHES: Record<string, () => Promise<void>> = {
  physics: benchPhysics,
  readings: benchReadings,
  ledger: benchLedger,
  reports: benchReports,
  scaling: benchScaling,
  pages: benchPages,
  "supplier-files": benchSupplierFiles,
  upload: benchUpload,
};

const asked = process.argv.slice(2);
const unknown = asked.filter((name) => !Object.hasOwn(BENCHES, name));
if (unknown.length > 0) {
  console.error(
    `unknown bench: ${unknown.join(", ")}; known: ${Object.keys(BENCHES).join(", ")}`,
  );
  process.exit(1);
}

const names = asked.length > 0 ? asked : Object.keys(BENCHES);
for (const name of names) {
  console.log(`\n== bench: ${name} ==`);
  await BENCHES[name]();
}
