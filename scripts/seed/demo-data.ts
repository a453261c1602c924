// The invented demo scenario "KESTREL-VP" (DESIGN.md "Demo scenario"). Every person, hospital,
// sponsor, device and figure here is made up; e-mail domains are reserved example domains.
import type { Role } from "../../src/lib/auth/roles";
import type { SiteStatus } from "../../src/lib/sites/site-status";

import signIns from "./demo-sign-ins.json";

export const DEMO_PASSWORD: string = signIns.password;

export const demoStudy = {
  code: "KESTREL-VP",
  title: "KESTREL-VP: safety and visual-function outcomes of a 96-electrode cortical visual implant in adults with acquired blindness",
  sponsorName: "Corvid Neuro-Optics (fictional sponsor)",
  reportingCurrency: "EUR",
  ackDeadlineDays: 14,
};

export type DemoSite = {
  code: string;
  name: string;
  country: string;
  timeZone: string;
  currency: string;
  targetEnrolment: number;
  status: SiteStatus;
  /** Dates of each lifecycle step reached, in order from start-up. */
  steps: string[];
};

export const demoSites: DemoSite[] = [
  { code: "DE01", name: "Lindenhain University Eye Clinic", country: "DE", timeZone: "Europe/Berlin", currency: "EUR", targetEnrolment: 12, status: "open", steps: ["2025-01-10", "2025-03-03"] },
  { code: "NL01", name: "Rivierstad Medical Centre", country: "NL", timeZone: "Europe/Amsterdam", currency: "EUR", targetEnrolment: 10, status: "open", steps: ["2025-01-20", "2025-03-17"] },
  { code: "GB01", name: "St Aldwyn's Eye Hospital", country: "GB", timeZone: "Europe/London", currency: "GBP", targetEnrolment: 10, status: "open", steps: ["2025-02-01", "2025-04-07"] },
  { code: "JP01", name: "Minato-Kita Medical University Hospital", country: "JP", timeZone: "Asia/Tokyo", currency: "JPY", targetEnrolment: 8, status: "open", steps: ["2025-02-15", "2025-05-12"] },
  { code: "US01", name: "Bridgewater Falls Vision Institute", country: "US", timeZone: "America/New_York", currency: "USD", targetEnrolment: 12, status: "enrolment_closed", steps: ["2025-01-06", "2025-02-24", "2026-09-30"] },
  { code: "CH01", name: "Clinique du Lac Vert", country: "CH", timeZone: "Europe/Zurich", currency: "CHF", targetEnrolment: 4, status: "closed_out", steps: ["2025-01-15", "2025-03-10", "2026-01-30", "2026-10-15"] },
  { code: "ES01", name: "Hospital Universitario Sierra Alta", country: "ES", timeZone: "Europe/Madrid", currency: "EUR", targetEnrolment: 8, status: "start_up", steps: ["2026-06-01"] },
  { code: "SE01", name: "Norrvik Regional Hospital", country: "SE", timeZone: "Europe/Stockholm", currency: "SEK", targetEnrolment: 6, status: "proposed", steps: [] },
];

export type DemoPerson = { email: string; name: string; roles: { role: Role; site?: string }[] };

export const demoPeople: DemoPerson[] = [
  { email: "admin@kestrel-vp.example", name: "Ines Marlow", roles: [{ role: "sponsor_admin" }] },
  { email: "writer@kestrel-vp.example", name: "Tobias Renner", roles: [{ role: "protocol_writer" }] },
  { email: "reviewer@kestrel-vp.example", name: "Dr. Amara Quist", roles: [{ role: "medical_reviewer" }] },
  { email: "payments@kestrel-vp.example", name: "Jonah Ferreira", roles: [{ role: "sponsor_finance" }] },
  { email: "payments2@kestrel-vp.example", name: "Lotte Brandvold", roles: [{ role: "sponsor_finance" }] },
  { email: "monitor@kestrel-vp.example", name: "Sami Okafor", roles: [{ role: "monitor" }] },
  { email: "auditor@kestrel-vp.example", name: "Helga Storm", roles: [{ role: "auditor" }] },
  { email: "investigator.de01@kestrel-vp.example", name: "Prof. Dr. Carla Wendt", roles: [{ role: "investigator", site: "DE01" }] },
  { email: "subinv.de01@kestrel-vp.example", name: "Dr. Malte Ebers", roles: [{ role: "investigator", site: "DE01" }] },
  { email: "coordinator.de01@kestrel-vp.example", name: "Jana Hollweg", roles: [{ role: "coordinator", site: "DE01" }] },
  { email: "finance.de01@kestrel-vp.example", name: "Uwe Brockmann", roles: [{ role: "site_finance", site: "DE01" }] },
  { email: "investigator.nl01@kestrel-vp.example", name: "Dr. Femke van Aalst", roles: [{ role: "investigator", site: "NL01" }] },
  { email: "coordinator.nl01@kestrel-vp.example", name: "Ruben Dijkhof", roles: [{ role: "coordinator", site: "NL01" }] },
  { email: "investigator.gb01@kestrel-vp.example", name: "Mr. Owen Pritchard", roles: [{ role: "investigator", site: "GB01" }] },
  { email: "coordinator.gb01@kestrel-vp.example", name: "Priya Lansdowne", roles: [{ role: "coordinator", site: "GB01" }] },
  { email: "finance.gb01@kestrel-vp.example", name: "Gareth Moule", roles: [{ role: "site_finance", site: "GB01" }] },
  { email: "investigator.jp01@kestrel-vp.example", name: "Dr. Haruto Kisaragi", roles: [{ role: "investigator", site: "JP01" }] },
  { email: "coordinator.jp01@kestrel-vp.example", name: "Aoi Tsukishima", roles: [{ role: "coordinator", site: "JP01" }] },
  { email: "finance.jp01@kestrel-vp.example", name: "Ren Oshiba", roles: [{ role: "site_finance", site: "JP01" }] },
  { email: "investigator.us01@kestrel-vp.example", name: "Dr. Dana Whitcombe", roles: [{ role: "investigator", site: "US01" }] },
  { email: "coordinator.us01@kestrel-vp.example", name: "Marcus Bellweather", roles: [{ role: "coordinator", site: "US01" }] },
  { email: "investigator.ch01@kestrel-vp.example", name: "Dr. Élodie Chappuis", roles: [{ role: "investigator", site: "CH01" }] },
  { email: "finance.ch01@kestrel-vp.example", name: "Beat Zollinger", roles: [{ role: "site_finance", site: "CH01" }] },
  { email: "coordinator.es01@kestrel-vp.example", name: "Lucía Ortigosa", roles: [{ role: "coordinator", site: "ES01" }] },
];

/** One sign-in per role, printed by `npm start` and used by the browser tests. */
export const demoSignInsByRole = signIns.byRole as Record<Role, string>;
