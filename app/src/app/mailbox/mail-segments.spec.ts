import { mailSegments } from './mail-segments';

describe('mailSegments', () => {
  it('cuts web addresses out of the text as links, leaving sentence punctuation as text', () => {
    expect(mailSegments('Join at http://127.0.0.1:4300/invite/x_9?a=1. Or https://kinetwin.test/reset/abc, today')).toEqual([
      { kind: 'text', text: 'Join at ' },
      { kind: 'link', href: 'http://127.0.0.1:4300/invite/x_9?a=1' },
      { kind: 'text', text: '. Or ' },
      { kind: 'link', href: 'https://kinetwin.test/reset/abc' },
      { kind: 'text', text: ', today' },
    ]);
  });

  it('leaves other schemes and plain text as text', () => {
    expect(mailSegments('javascript:alert(1) and file:///etc/passwd')).toEqual([{ kind: 'text', text: 'javascript:alert(1) and file:///etc/passwd' }]);
    expect(mailSegments('')).toEqual([]);
  });
});
