import type { Role } from "@/lib/auth/roles";
import type { StudyFixture } from "../../support/db";

export type SiteRole = "investigator" | "coordinator" | "site_finance";

/**
 * One row of the shared route table: a route, a method, how to address it in a fixture, and who may
 * use it. Site roles in `allow` are held at site A; `allowSiteB` lists site B's people who may too.
 * Every capability adds a file of cases under ./cases; the table test fails for a route without one.
 */
export type RouteCase = {
  name: string;
  /** Folder under src/app/api/v1, e.g. "studies/[studyId]/people". */
  route: string;
  method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  params?: (fx: StudyFixture) => Record<string, string>;
  query?: (fx: StudyFixture) => Record<string, string>;
  body?: (fx: StudyFixture) => unknown;
  allow: Role[] | "all" | "public";
  allowSiteB?: SiteRole[];
};
