export * from "./snapshot";
export * from "./result";
export { computePaymentSchedule, type ComputeOptions } from "./compute-payment-schedule";
export { priceFee } from "./pricing";
export { addDays, cyclePeriodOf, dueDateOf, localDate, type CyclePeriod, type PaymentCycle } from "./calendar";
