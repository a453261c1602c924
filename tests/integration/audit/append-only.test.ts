import { sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { recordAudit } from "@/server/audit/record-audit";
import { db } from "../../support/db";

/** The PostgreSQL error drizzle wraps (its own message names only the query). */
async function databaseError(p: Promise<unknown>): Promise<string> {
  try {
    await p;
  } catch (err) {
    const e = err as { cause?: { message?: string }; message: string };
    return e.cause?.message ?? e.message;
  }
  return "no error";
}

// 21 CFR Part 11 §11.10(e): audit records may be added, never changed or removed.
describe("audit trail is append-only at the database", () => {
  it("allows INSERT", async () => {
    await recordAudit(db, null, { action: "test.append", entityType: "test", entityId: "1", after: { amount: 12n } });
    const rows = await db.execute<{ after: { amount: string } }>(sql`select after from audit_events where action = 'test.append' order by id desc limit 1`);
    expect(rows.rows[0]?.after.amount).toBe("12");
  });

  it("rejects UPDATE", async () => {
    expect(await databaseError(db.execute(sql`update audit_events set action = 'tampered' where action = 'test.append'`))).toMatch(/append-only: UPDATE/);
    const rows = await db.execute(sql`select 1 from audit_events where action = 'tampered'`);
    expect(rows.rows).toHaveLength(0);
  });

  it("rejects DELETE", async () => {
    expect(await databaseError(db.execute(sql`delete from audit_events where action = 'test.append'`))).toMatch(/append-only: DELETE/);
  });

  it("rejects TRUNCATE", async () => {
    expect(await databaseError(db.execute(sql`truncate audit_events`))).toMatch(/append-only: TRUNCATE/);
  });
});
