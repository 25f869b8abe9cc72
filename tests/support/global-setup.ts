// API and browser tests need the served app and its database; `npm test` provides both.
export default function setup() {
  if (!process.env.APP_URL || !process.env.DATABASE_URL) {
    throw new Error(
      "API and browser tests run through `npm test`, which starts Postgres and the app (APP_URL, DATABASE_URL).",
    );
  }
}
