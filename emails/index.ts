import { render } from "@react-email/render";
import { createElement, type ComponentType } from "react";
import ResetPassword from "./reset-password";
import StaffInvite from "./staff-invite";
import VerifyEmail from "./verify-email";

type TemplateDef<P> = { component: ComponentType<Partial<P>>; subject: (props: P) => string };

function define<P>(def: TemplateDef<P>): TemplateDef<P> {
  return def;
}

// Every message the app sends, by name; the outbox stores the name and the props.
export const TEMPLATES = {
  "verify-email": define<{ name: string; url: string }>({
    component: VerifyEmail,
    subject: () => "Confirm your e-mail address",
  }),
  "reset-password": define<{ name: string; url: string }>({
    component: ResetPassword,
    subject: () => "Choose a new password",
  }),
  "staff-invite": define<{ name: string; url: string; roleLabel: string; invitedBy: string }>({
    component: StaffInvite,
    subject: () => "You are invited to the Kestrel Lane workshop",
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
