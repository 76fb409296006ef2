/** Plain, short messages: people read these on a phone at the eyepiece. */

const footer =
  "\n\n— Heliotally\nYou received this because someone asked for it at this address. If it was not you, ignore this message.";

export function signInLinkMessage({ url, host }: { url: string; host: string }) {
  return {
    subject: "Your Heliotally sign-in link",
    text: `Open this link to sign in to Heliotally at ${host}:\n\n${url}\n\nThe link works once and expires in 24 hours.${footer}`,
    html: `<p>Open this link to sign in to Heliotally at ${escapeHtml(host)}:</p><p><a href="${escapeHtml(url)}">Sign in to Heliotally</a></p><p>The link works once and expires in 24 hours.</p>`,
  };
}

export function passwordResetMessage({ url }: { url: string }) {
  return {
    subject: "Choose a new Heliotally password",
    text: `Open this link to choose a new password:\n\n${url}\n\nThe link works once and expires in one hour.${footer}`,
    html: `<p>Open this link to choose a new password:</p><p><a href="${escapeHtml(url)}">Choose a new password</a></p><p>The link works once and expires in one hour.</p>`,
  };
}

export function escapeHtml(text: string): string {
  return text.replace(
    /[&<>"']/g,
    (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] ?? c,
  );
}
