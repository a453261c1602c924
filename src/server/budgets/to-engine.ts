import "server-only";
export { toEngineVersion } from "@/lib/ledger/build-snapshot";
