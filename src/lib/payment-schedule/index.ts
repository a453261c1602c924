export * from "./snapshot";
export * from "./result";
export { computePaymentSchedule } from "./compute-payment-schedule";
export { priceFee } from "./pricing";
export { addDays, cyclePeriodOf, dueDateOf, localDate, type CyclePeriod, type PaymentCycle } from "./calendar";
