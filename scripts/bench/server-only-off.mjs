// For benchmarks that call route handlers outside Next.js: "server-only" becomes an empty module
// (as Next.js does for server code), for both ESM imports and CommonJS requires, without React's
// server build. Use: tsx --import ./scripts/bench/server-only-off.mjs <script>
import Module, { register } from "node:module";
import path from "node:path";
import { fileURLToPath } from "node:url";

const stub = path.join(path.dirname(fileURLToPath(import.meta.url)), "..", "..", "tests", "support", "server-only-stub.ts");
register(
  `data:text/javascript,${encodeURIComponent(`export async function resolve(specifier, context, next) {
    if (specifier === "server-only") return { url: "data:text/javascript,export%20%7B%7D", shortCircuit: true };
    return next(specifier, context);
  }`)}`,
);
const resolveFilename = Module._resolveFilename;
Module._resolveFilename = function (request, ...rest) {
  return request === "server-only" ? stub : resolveFilename.call(this, request, ...rest);
};
