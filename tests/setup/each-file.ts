// Runs before every unit and integration test file: gives the file a database of its own, copied from
// the migrated and seeded template that `npm test` prepared, so files never see each other's rows.
import { randomBytes } from "node:crypto";
import postgres from "postgres";

const adminUrl = process.env.BENDWISE_TEST_ADMIN_URL;
const template = process.env.BENDWISE_TEST_TEMPLATE_DB;
if (!adminUrl || !template) {
  throw new Error("Run the tests through `npm test` (or `npm test -- <file>`): it starts the test database and fakes.");
}

const name = `t_${process.pid}_${randomBytes(4).toString("hex")}`;
const admin = postgres(adminUrl, { max: 1, onnotice: () => {} });
for (let attempt = 1; ; attempt++) {
  try {
    await admin.unsafe(`create database "${name}" template "${template}"`);
    break;
  } catch (error) {
    // Two files copying the template at the same moment: wait and try again.
    if (attempt >= 20 || !String((error as Error).message).includes("being accessed")) throw error;
    await new Promise((r) => setTimeout(r, 100 * attempt));
  }
}
await admin.end();

process.env.DATABASE_URL = adminUrl.replace(/\/[^/]*$/, `/${name}`);
