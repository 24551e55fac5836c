/** A piece of a mail's plain-text body: either text, or a link into this app. */
export interface MailSegment {
  text: string;
  /** Set only for links to this app's own origin, the only ones the outbox makes clickable. */
  href?: string;
}

const URL_PATTERN = /https?:\/\/[^\s<>"')\]]+/g;

/**
 * Splits a plain-text mail body so links back into Specimetry (invitations, password resets) can be
 * followed from the outbox. Links to other origins stay plain text: the outbox shows what the app
 * sent and must not become a way to open arbitrary sites.
 */
export function mailSegments(body: string, origin: string): MailSegment[] {
  const segments: MailSegment[] = [];
  let last = 0;
  for (const match of body.matchAll(URL_PATTERN)) {
    const url = match[0].replace(/[.,;:!?]+$/, '');
    const start = match.index;
    if (start > last) segments.push({ text: body.slice(last, start) });
    segments.push(sameOrigin(url, origin) ? { text: url, href: url } : { text: url });
    last = start + url.length;
  }
  if (last < body.length) segments.push({ text: body.slice(last) });
  return segments;
}

function sameOrigin(url: string, origin: string): boolean {
  try {
    return new URL(url).origin === origin;
  } catch {
    // The pattern can match things URL() rejects (e.g. "http://["); those are shown as text.
    return false;
  }
}
