// Runs before each integration test file (vitest setupFiles): a fresh SQLite file per file,
// local mode, and a capture folder for the fake SMTP server. Must run before any app import.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-it-"));
process.env.NODE_ENV = "test";
process.env.FERNWATER_MODE = "local";
process.env.DATABASE_URL = path.join(dir, "test.sqlite");
process.env.MAIL_CAPTURE_DIR = path.join(dir, "mail");
delete process.env.SMTP_URL;
delete process.env.SESSION_SECRET;
