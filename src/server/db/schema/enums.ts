import { pgEnum } from "drizzle-orm/pg-core";
import { roles } from "../../../lib/auth/roles";
import { siteStatuses } from "../../../lib/sites/site-status";

export const roleEnum = pgEnum("role", roles);
export const siteStatusEnum = pgEnum("site_status", siteStatuses);
