import { defineConfig } from "drizzle-kit";

export default defineConfig({
  dialect: "sqlite",
  schema: ["./app/db/schema.ts", "./app/db/schema-care.ts"],
  out: "./drizzle",
  dbCredentials: { url: process.env.DATABASE_URL ?? "data/fernwater.sqlite" },
});
