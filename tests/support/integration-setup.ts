// Integration tests run inside `npm test`, which starts a throw-away PostgreSQL and the fakes and
// passes their addresses in the environment.
if (!process.env.DATABASE_URL || !process.env.MAILDEV_API_URL) {
  throw new Error("Integration tests need the environment prepared by `npm test` (DATABASE_URL, fakes). Run: npm test -- tests/integration");
}
