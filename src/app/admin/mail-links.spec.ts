import { describe, expect, it } from 'vitest';
import { mailSegments } from './mail-links';

// Link formats from the API contract (issue 2): <origin>/accept-invitation?token=… and <origin>/reset-password?token=….
describe('mailSegments', () => {
  const origin = 'http://localhost:3000';

  it('makes links into this app clickable and keeps the surrounding text', () => {
    const body = 'Hello,\nopen http://localhost:3000/accept-invitation?token=abc_DEF-123 to join.\nThanks';
    expect(mailSegments(body, origin)).toEqual([
      { text: 'Hello,\nopen ' },
      { text: 'http://localhost:3000/accept-invitation?token=abc_DEF-123', href: 'http://localhost:3000/accept-invitation?token=abc_DEF-123' },
      { text: ' to join.\nThanks' },
    ]);
  });

  it('leaves sentence punctuation after a link out of the link', () => {
    const segments = mailSegments('Reset here: http://localhost:3000/reset-password?token=t0k.', origin);
    expect(segments[1]).toEqual({ text: 'http://localhost:3000/reset-password?token=t0k', href: 'http://localhost:3000/reset-password?token=t0k' });
    expect(segments[2]).toEqual({ text: '.' });
  });

  it('does not make links to other origins clickable', () => {
    expect(mailSegments('See https://elsewhere.example/x now', origin)).toEqual([
      { text: 'See ' },
      { text: 'https://elsewhere.example/x' },
      { text: ' now' },
    ]);
  });

  it('returns plain text untouched', () => {
    expect(mailSegments('no links here', origin)).toEqual([{ text: 'no links here' }]);
  });
});
