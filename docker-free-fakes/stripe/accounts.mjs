// Connected accounts and the fake's verification states. The state drives the fields a platform
// reads to decide whether it can pay an account (charges_enabled, payouts_enabled,
// requirements.disabled_reason, capabilities.transfers).

/** The states the control API can set, in the order an onboarding normally moves through them. */
export const VERIFICATION_STATES = ["pending", "verified", "restricted", "rejected"];

const STATE_FIELDS = {
  pending: {
    charges_enabled: false,
    payouts_enabled: false,
    details_submitted: true,
    transfers: "pending",
    requirements: {
      currently_due: [],
      past_due: [],
      eventually_due: [],
      pending_verification: ["individual.verification.document"],
      disabled_reason: "requirements.pending_verification",
    },
  },
  verified: {
    charges_enabled: true,
    payouts_enabled: true,
    details_submitted: true,
    transfers: "active",
    requirements: { currently_due: [], past_due: [], eventually_due: [], pending_verification: [], disabled_reason: null },
  },
  restricted: {
    charges_enabled: false,
    payouts_enabled: false,
    details_submitted: true,
    transfers: "inactive",
    requirements: {
      currently_due: ["external_account", "individual.verification.document"],
      past_due: ["external_account", "individual.verification.document"],
      eventually_due: ["external_account", "individual.verification.document"],
      pending_verification: [],
      disabled_reason: "requirements.past_due",
    },
  },
  rejected: {
    charges_enabled: false,
    payouts_enabled: false,
    details_submitted: true,
    transfers: "inactive",
    requirements: { currently_due: [], past_due: [], eventually_due: [], pending_verification: [], disabled_reason: "rejected.other" },
  },
};

/** Rewrites the state-dependent fields of an account object in place. */
export function applyVerification(account, state) {
  const f = STATE_FIELDS[state];
  if (!f) throw new Error(`unknown verification state ${state}`);
  account.charges_enabled = f.charges_enabled;
  account.payouts_enabled = f.payouts_enabled;
  account.details_submitted = f.details_submitted;
  account.capabilities = { ...account.capabilities, transfers: f.transfers };
  account.requirements = {
    alternatives: [],
    current_deadline: null,
    errors: [],
    ...structuredClone(f.requirements),
  };
  account.future_requirements = {
    alternatives: [],
    current_deadline: null,
    currently_due: [],
    disabled_reason: null,
    errors: [],
    eventually_due: [],
    past_due: [],
    pending_verification: [],
  };
  return account;
}

/** An account can receive transfers only when its transfers capability is active. */
export const canReceiveTransfers = (account) => account.capabilities?.transfers === "active";

export function buildAccount({ id, created, params, state }) {
  const account = {
    id,
    object: "account",
    business_type: params.business_type ?? null,
    business_profile: { name: params.business_profile?.name ?? null, url: params.business_profile?.url ?? null },
    capabilities: {},
    charges_enabled: false,
    controller: { type: "application", is_controller: true },
    country: (params.country ?? "US").toUpperCase(),
    created,
    default_currency: (params.default_currency ?? "usd").toLowerCase(),
    details_submitted: false,
    email: params.email ?? null,
    external_accounts: { object: "list", data: [], has_more: false, total_count: 0, url: `/v1/accounts/${id}/external_accounts` },
    metadata: {},
    payouts_enabled: false,
    requirements: {},
    settings: {},
    tos_acceptance: { date: null, ip: null, user_agent: null },
    type: params.type ?? "custom",
  };
  return applyVerification(account, state);
}
