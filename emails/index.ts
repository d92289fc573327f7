import { render } from "@react-email/render";
import { createElement, type ComponentType } from "react";
import CertificateIssued, { type CertificateIssuedProps } from "./certificate-issued";
import ClaimDecision, { type ClaimDecisionProps } from "./claim-decision";
import AccountNotice, { type AccountNoticeProps } from "./account-notice";
import BalanceDue, { type BalanceDueProps } from "./balance-due";
import EstimateReady, { type EstimateReadyProps } from "./estimate-ready";
import EstimateRevised from "./estimate-revised";
import { BalanceReceipt, DepositReceipt, type PaymentReceiptProps } from "./payment-receipt";
import OwnerInvite, { type OwnerInviteProps } from "./owner-invite";
import QuoteReceived, { type QuoteReceivedProps } from "./quote-received";
import ResetPassword from "./reset-password";
import SetReturned, { type SetReturnedProps } from "./set-returned";
import ShopMessage, { type ShopMessageProps } from "./shop-message";
import ShopQuestion, { type ShopQuestionProps } from "./shop-question";
import StaffInvite from "./staff-invite";
import StaffNotice, { type StaffNoticeProps } from "./staff-notice";
import VerifyEmail from "./verify-email";

type TemplateDef<P> = { component: ComponentType<Partial<P>>; subject: (props: P) => string };

function define<P>(def: TemplateDef<P>): TemplateDef<P> {
  return def;
}

// Every message the app sends, by name; the outbox stores the name and the props.
export const TEMPLATES = {
  "certificate-issued": define<CertificateIssuedProps>({
    component: CertificateIssued,
    subject: (p) =>
      p.corrected ? `Corrected warranty certificate for your ${p.maker} ${p.model}` : `Warranty certificate for your ${p.maker} ${p.model}`,
  }),
  "claim-decision": define<ClaimDecisionProps>({
    component: ClaimDecision,
    subject: (p) =>
      p.decision === "accepted"
        ? `Warranty claim accepted: ${p.maker} ${p.model}`
        : p.decision === "rejected"
          ? `Warranty claim not covered: ${p.maker} ${p.model}`
          : `Warranty claim: we would like to inspect your ${p.maker} ${p.model}`,
  }),
  "verify-email": define<{ name: string; url: string }>({
    component: VerifyEmail,
    subject: () => "Confirm your e-mail address",
  }),
  "reset-password": define<{ name: string; url: string }>({
    component: ResetPassword,
    subject: () => "Choose a new password",
  }),
  "account-notice": define<AccountNoticeProps>({
    component: AccountNotice,
    subject: (p) => p.subject,
  }),
  "staff-invite": define<{ name: string; url: string; roleLabel: string; invitedBy: string }>({
    component: StaffInvite,
    subject: () => "You are invited to the Kestrel Lane workshop",
  }),
  "staff-notice": define<StaffNoticeProps>({
    component: StaffNotice,
    subject: (p) => p.title,
  }),
  "owner-invite": define<OwnerInviteProps>({
    component: OwnerInvite,
    subject: (p) => `Follow your ${p.setName} online (${p.jobNumber})`,
  }),
  "quote-received": define<QuoteReceivedProps>({
    component: QuoteReceived,
    subject: (p) => `We received your quote request ${p.jobNumber}`,
  }),
  "shop-question": define<ShopQuestionProps>({
    component: ShopQuestion,
    subject: (p) => `A question about your ${p.setName} (${p.jobNumber})`,
  }),
  "shop-message": define<ShopMessageProps>({
    component: ShopMessage,
    subject: (p) => `A message about your ${p.setName} (${p.jobNumber})`,
  }),
  "estimate-ready": define<EstimateReadyProps>({
    component: EstimateReady,
    subject: (p) => `Your estimate for ${p.setName} is ready (${p.jobNumber})`,
  }),
  "estimate-revised": define<EstimateReadyProps>({
    component: EstimateRevised,
    subject: (p) => `Revised estimate for ${p.setName} (${p.jobNumber})`,
  }),
  "deposit-receipt": define<PaymentReceiptProps>({
    component: DepositReceipt,
    subject: (p) => `Deposit received for ${p.jobNumber}`,
  }),
  "balance-receipt": define<PaymentReceiptProps>({
    component: BalanceReceipt,
    subject: (p) => `Payment in full received for ${p.jobNumber}`,
  }),
  "balance-due": define<BalanceDueProps>({
    component: BalanceDue,
    subject: (p) =>
      p.settled ? `Your ${p.setName} is finished (${p.jobNumber})` : `Your ${p.setName} is finished: balance due (${p.jobNumber})`,
  }),
  "set-returned": define<SetReturnedProps>({
    component: SetReturned,
    subject: (p) =>
      p.method === "shipped"
        ? `Your ${p.setName} is on its way (${p.jobNumber})`
        : `Your ${p.setName} is ready for pick-up (${p.jobNumber})`,
  }),
};

export type TemplateName = keyof typeof TEMPLATES;
export type TemplateProps<T extends TemplateName> = Parameters<(typeof TEMPLATES)[T]["subject"]>[0];

export function isTemplateName(name: string): name is TemplateName {
  return Object.prototype.hasOwnProperty.call(TEMPLATES, name);
}

export async function renderEmail(name: TemplateName, props: Record<string, unknown>) {
  const def = TEMPLATES[name] as TemplateDef<Record<string, unknown>>;
  const element = createElement(def.component, props);
  const [html, text] = await Promise.all([render(element), render(element, { plainText: true })]);
  return { subject: def.subject(props), html, text };
}
