// The shared route table: every API route × every role, a site role of site A against site B's
// data, and the signed-out. Each route file under src/app/api/v1 must have at least one case.
import { beforeAll, describe, expect, it } from "vitest";
import { roles, type Role } from "@/lib/auth/roles";
import { callRoute } from "../../support/api";
import { createStudyFixture, type StudyFixture } from "../../support/db";
import type { RouteCase, SiteRole } from "./route-case";

const routeModules = import.meta.glob("/src/app/api/v1/**/route.ts");
const caseModules = import.meta.glob<{ cases: RouteCase[] }>("./cases/*.ts", { eager: true });
const cases = Object.values(caseModules).flatMap((m) => m.cases);
const methods = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;

const routeKey = (file: string) => file.replace("/src/app/api/v1/", "").replace(/\/route\.ts$/, "");

async function handlerFor(c: RouteCase) {
  const file = `/src/app/api/v1/${c.route}/route.ts`;
  const load = routeModules[file];
  if (!load) throw new Error(`No route file ${file}`);
  const mod = (await load()) as Record<string, unknown>;
  const handler = mod[c.method];
  if (typeof handler !== "function") throw new Error(`${file} exports no ${c.method}`);
  return handler as Parameters<typeof callRoute>[0];
}

const denied = (status: number) => status === 403 || status === 404;

let fx: StudyFixture;
beforeAll(async () => {
  fx = await createStudyFixture();
});

describe("route table covers every route", () => {
  it("has a case for every exported method of every route file", async () => {
    const missing: string[] = [];
    for (const [file, load] of Object.entries(routeModules)) {
      const mod = (await load()) as Record<string, unknown>;
      for (const m of methods) {
        if (typeof mod[m] === "function" && !cases.some((c) => c.route === routeKey(file) && c.method === m)) missing.push(`${m} ${routeKey(file)}`);
      }
    }
    expect(missing, "routes without an authorisation case").toEqual([]);
  });
});

describe.each(cases)("$method $route — $name", (c) => {
  const call = async (userId: string | null) =>
    callRoute(await handlerFor(c), {
      method: c.method,
      params: c.params?.(fx) ?? {},
      query: c.query?.(fx),
      body: c.body?.(fx),
      userId,
      path: `/api/v1/${c.route}`,
    });

  if (c.allow === "public") {
    it("answers the signed-out with a 4xx for bad input, never 401 or 500", async () => {
      const res = await call(null);
      expect(res.status).toBeGreaterThanOrEqual(400);
      expect(res.status).toBeLessThan(500);
      expect(res.json?.error?.message).toBeTruthy();
    });
    return;
  }

  it("refuses the signed-out with 401", async () => {
    const res = await call(null);
    expect(res.status).toBe(401);
    expect(res.json.error.code).toBe("unauthenticated");
  });

  it("answers malformed input from an allowed person with a clear 4xx, never a 500", async () => {
    const firstAllowed = c.allow === "all" ? "sponsor_admin" : (c.allow as Role[])[0];
    const siteAUser = firstAllowed ? fx.userByRole[firstAllowed] : undefined;
    const siteBUser = c.allowSiteB?.[0] ? fx.siteBPeople[c.allowSiteB[0]] : undefined;
    const user = siteAUser ?? siteBUser;
    if (!user) return; // nobody may use this route in the fixture
    const handler = await handlerFor(c);
    // Some case files resolve their params asynchronously (rows created for the case).
    const goodParams = ((await c.params?.(fx)) ?? {}) as Record<string, string>;
    const params = Object.fromEntries(Object.keys(goodParams).map((k) => [k, "not-an-id"]));
    const attempts = [
      // Ids that are not ids.
      { params, query: c.query?.(fx), body: c.body?.(fx) },
      // A body of the wrong shape, and one that is not JSON at all.
      ...(c.method === "GET" ? [] : [{ params: goodParams, body: { unexpected: ["shape"] } }, { params: goodParams, body: "{not json" }]),
      // Query values of the wrong type.
      { params: goodParams, query: { ...(c.query?.(fx) ?? {}), page: "-1", pageSize: "many", siteId: "x", from: "31/02/2026" }, body: c.body?.(fx) },
    ];
    for (const a of attempts) {
      const res = await callRoute(handler, { method: c.method, params: a.params, query: a.query, body: a.body, userId: user.id, path: `/api/v1/${c.route}` });
      expect(res.status, `${c.method} ${c.route} with ${JSON.stringify(a)} → ${res.status} ${JSON.stringify(res.json)}`).toBeLessThan(500);
      if (res.status >= 400) expect(res.json?.error?.message, "a 4xx carries a message").toBeTruthy();
    }
  });

  it.each(roles.map((r) => [r]))("role %s", async (role: Role) => {
    const res = await call(fx.userByRole[role].id);
    const allowed = c.allow === "all" || c.allow.includes(role);
    if (allowed) {
      expect(denied(res.status) || res.status === 401, `${role} should be allowed, got ${res.status} ${JSON.stringify(res.json)}`).toBe(false);
      expect(res.status).toBeLessThan(500);
    } else {
      expect(denied(res.status), `${role} should be refused, got ${res.status} ${JSON.stringify(res.json)}`).toBe(true);
    }
  });

  it.each((["investigator", "coordinator", "site_finance"] as SiteRole[]).map((r) => [r]))("site B's %s", async (role: SiteRole) => {
    const res = await call(fx.siteBPeople[role].id);
    const allowed = c.allow === "all" || (c.allowSiteB ?? []).includes(role);
    if (allowed) expect(denied(res.status) || res.status >= 500, `site B ${role}: ${res.status}`).toBe(false);
    else expect(denied(res.status), `site B ${role} should be refused, got ${res.status}`).toBe(true);
  });
});
