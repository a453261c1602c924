import type { Role } from "@/lib/auth/roles";
import type { SiteStatus } from "@/lib/sites/site-status";

// The checklist a new study starts from; the sponsor edits it per study. Each entry names where
// the requirement comes from. ICH E6(R3) Appendix C marks with * the records needed before the
// trial starts; ISO 14155:2020 Annex E lists essential documents before / during / after the
// investigation (its clause and table numbers here are from memory).

export type DefaultBinderType = {
  code: string;
  name: string;
  holder: "site" | "person";
  appliesToRoles: Role[];
  requiredFrom: SiteStatus | null;
  expires: boolean;
  validityMonths: number | null;
  reference: string;
};

export const defaultBinderTypes: DefaultBinderType[] = [
  {
    code: "investigator_cv",
    name: "Curriculum vitae",
    holder: "person",
    appliesToRoles: ["investigator"],
    requiredFrom: "start_up",
    expires: false,
    validityMonths: null,
    reference: "ICH E6(R3) Appendix C: CVs (* before start); ISO 14155:2020 Annex E, before the investigation (from memory)",
  },
  {
    code: "medical_licence",
    name: "Medical licence",
    holder: "person",
    appliesToRoles: ["investigator"],
    requiredFrom: "start_up",
    expires: true,
    validityMonths: null,
    reference: "ICH E6(R3) Appendix C: evidence of qualifications (from memory); ISO 14155:2020 Annex E (from memory)",
  },
  {
    code: "gcp_training",
    name: "GCP training certificate",
    holder: "person",
    appliesToRoles: ["investigator", "coordinator"],
    requiredFrom: "start_up",
    expires: true,
    validityMonths: 36,
    reference: "ICH E6(R3) Appendix C: trial-specific training (* before start); renewal every 3 years is common practice",
  },
  {
    code: "financial_disclosure",
    name: "Financial disclosure",
    holder: "person",
    appliesToRoles: ["investigator"],
    requiredFrom: "start_up",
    expires: false,
    validityMonths: null,
    reference: "ICH E6(R3) Appendix C: financial arrangements (* before start); ISO 14155:2020 Annex E (from memory)",
  },
  {
    code: "investigator_agreement",
    name: "Signed investigator agreement",
    holder: "site",
    appliesToRoles: [],
    requiredFrom: "start_up",
    expires: false,
    validityMonths: null,
    reference: "ICH E6(R3) Appendix C: signed agreements (* before start); ISO 14155:2020 Annex E (from memory); 21 CFR 812.43(c)",
  },
  {
    code: "ethics_approval",
    name: "Ethics-committee approval of the protocol version in force",
    holder: "site",
    appliesToRoles: [],
    requiredFrom: "start_up",
    expires: false,
    validityMonths: null,
    reference: "ICH E6(R3) §2.4.2 documented, dated approval before starting; ISO 14155:2020 Annex E (from memory)",
  },
  {
    code: "insurance_certificate",
    name: "Insurance certificate",
    holder: "site",
    appliesToRoles: [],
    requiredFrom: "start_up",
    expires: true,
    validityMonths: 12,
    reference: "ICH E6(R3) Appendix C: insurance (* before start); yearly renewal is common practice",
  },
  {
    code: "delegation_log",
    name: "Delegation log and signature sheet",
    holder: "site",
    appliesToRoles: [],
    requiredFrom: "start_up",
    expires: false,
    validityMonths: null,
    reference: "ICH E6(R3) Appendix C: delegation log, signature sheet (* before start); ISO 14155:2020 Annex E (from memory)",
  },
  {
    code: "lab_certification",
    name: "Laboratory certification and normal ranges",
    holder: "site",
    appliesToRoles: [],
    requiredFrom: "start_up",
    expires: true,
    validityMonths: null,
    reference: "ICH E6(R3) Appendix C: laboratory certification, normal ranges (* before start)",
  },
  {
    code: "device_accountability",
    name: "Device receipt and accountability log",
    holder: "site",
    appliesToRoles: [],
    requiredFrom: "open",
    expires: false,
    validityMonths: null,
    reference: "ISO 14155:2020 Annex E: records of investigational device shipment and accountability (from memory)",
  },
  {
    code: "monitoring_report",
    name: "Monitoring visit report",
    holder: "site",
    appliesToRoles: [],
    requiredFrom: null,
    expires: false,
    validityMonths: null,
    reference: "ICH E6(R3) Appendix C: monitoring records (from memory); ISO 14155:2020 Annex E, during the investigation (from memory)",
  },
];
