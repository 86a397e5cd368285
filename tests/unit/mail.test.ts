import { describe, expect, it } from 'vitest';
import { grantMail, invitationMail, renderMail } from '../../src/server/mail';

describe('e-mail rendering', () => {
  it('escapes names in the HTML part (a crew name is user input) and keeps them readable in the text part', () => {
    const m = invitationMail({ crewName: '<img src=x onerror=alert(1)> & co', inviterName: 'Inés "Ness"', role: 'editor', url: 'http://127.0.0.1:4321/invite/abc?x=1&y=2', expiresAt: new Date('2027-01-08T12:00:00Z') });
    expect(m.html).not.toContain('<img src=x');
    expect(m.html).toContain('&lt;img src=x onerror=alert(1)&gt; &amp; co');
    expect(m.html).toContain('href="http://127.0.0.1:4321/invite/abc?x=1&amp;y=2"');
    expect(m.text).toContain('“<img src=x onerror=alert(1)> & co”');
    expect(m.text).toContain('http://127.0.0.1:4321/invite/abc?x=1&y=2');
    // User-written names stay out of the subject; the body quotes them as the users' own words.
    expect(m.subject).toBe('You are invited to a crew on Sunreckon');
    expect(m.text).toContain('who signs as “Inés "Ness"”');
    expect(m.html).toContain('signs as “Inés &quot;Ness&quot;”');
  });

  it('says what the role allows and when the link expires', () => {
    const viewer = invitationMail({ crewName: 'Dune', inviterName: 'Ada', role: 'viewer', url: 'http://h/invite/t', expiresAt: new Date('2027-01-08T12:00:00Z') });
    expect(viewer.text).toContain('as a viewer: you will be able to see');
    expect(viewer.text).toContain('expires on Fri 8 Jan 2027, 12:00 UTC');
    const owner = invitationMail({ crewName: 'Dune', inviterName: 'Ada', role: 'owner', url: 'http://h/invite/t', expiresAt: new Date('2027-01-08T12:00:00Z') });
    expect(owner.text).toContain('as an owner');
  });

  it('has both parts, the action in each, and no HTML in the text part', () => {
    const m = renderMail({ subject: 'S', greeting: 'Hello,', intro: ['One.', 'Two.'], action: { label: 'Go', url: 'http://h/x' }, outro: ['Bye.'] });
    expect(m.text.split('\n')).toEqual(['Hello,', '', 'One.', '', 'Two.', '', 'Go:', 'http://h/x', '', 'Bye.', '', '— Sunreckon, battery forecasts for dry camping']);
    expect(m.html).toContain('>Go</a>');
    expect(m.html).toMatch(/^<!doctype html>/);
    const g = grantMail({ installerName: 'Wren', crewName: 'Dune', rigName: 'Van', ownerName: 'Ada', url: 'http://h/installer' });
    expect(g.text).toContain('read its power system, loads, trips and saved forecasts');
  });
});
