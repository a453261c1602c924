export * from "./poisson-gamma";
export { gammaQuantile, logGamma, regularizedLowerGamma } from "./special-functions";
