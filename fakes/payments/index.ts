export {
  startPaymentsFake,
  passesLuhn,
  type PaymentsFake,
  type PaymentsFakeOptions,
} from './payments-fake.js';
export { signatureHeader } from './webhook-sender.js';
