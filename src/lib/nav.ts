import type { Permission } from "@/lib/auth/roles";

// The navigation: each section shows only to people who hold its permission somewhere in the study.
// A capability adds its section here when its pages exist.
export type NavItem = { key: string; label: string; segment: string; permission: Permission; icon: NavIcon };
export type NavIcon = "home" | "protocol" | "sites" | "subjects" | "visits" | "budgets" | "payments" | "documents" | "people" | "audit" | "acknowledgements";

export const navItems: NavItem[] = [
  { key: "home", label: "Home", segment: "", permission: "study.read", icon: "home" },
  { key: "protocol", label: "Protocol", segment: "protocol", permission: "protocol.read", icon: "protocol" },
  { key: "adoption", label: "Adoption", segment: "adoption", permission: "adoption.read", icon: "protocol" },
  { key: "acknowledgements", label: "Acknowledgements", segment: "acknowledgements", permission: "acknowledgement.read", icon: "acknowledgements" },
  { key: "sites", label: "Sites", segment: "sites", permission: "sites.read", icon: "sites" },
  { key: "subjects", label: "Subjects", segment: "subjects", permission: "subjects.read", icon: "subjects" },
  { key: "visits", label: "Visits", segment: "visits", permission: "deviations.read", icon: "visits" },
  { key: "budgets", label: "Budgets", segment: "budgets", permission: "budget.read", icon: "budgets" },
  { key: "ledger", label: "Payments", segment: "ledger", permission: "ledger.read", icon: "payments" },
  { key: "payment-runs", label: "Payment runs", segment: "payment-runs", permission: "payments.read", icon: "payments" },
  { key: "reconciliation", label: "Reconciliation", segment: "reconciliation", permission: "payments.read", icon: "payments" },
  { key: "documents", label: "Documents", segment: "documents", permission: "documents.read", icon: "documents" },
  { key: "people", label: "People", segment: "people", permission: "people.read", icon: "people" },
  { key: "audit", label: "Audit", segment: "audit", permission: "audit.read", icon: "audit" },
];

export const studyPath = (studyId: string, segment = "") => `/studies/${studyId}${segment ? `/${segment}` : ""}`;
