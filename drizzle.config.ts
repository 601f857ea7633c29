import { defineConfig } from "drizzle-kit";

// Only `drizzle-kit generate` uses this file; migrations are applied by the app's own migrator at start.
export default defineConfig({
  dialect: "mysql",
  schema: "./api/src/db/schema/index.ts",
  out: "./drizzle",
});
